/**
 * Calendar helpers shared by the date-based modules (inspection schedule, trip statistics, billing).
 *
 * Conventions: a local date is an ISO string 'YYYY-MM-DD' with no time and no zone; a month is 'YYYY-MM'.
 * Both sort in time order as plain strings (four-digit years), so `a < b` compares them directly.
 * Every function throws a RangeError on malformed input rather than guessing.
 *
 *   isLocalDate(value)                     → value is a real 'YYYY-MM-DD' date
 *   isYearMonth(value)                     → value is a real 'YYYY-MM' month
 *   localDate(instant, timeZone)           → the calendar date of an instant (a Date, or an ISO string with
 *                                            'Z' or an offset) in that IANA zone
 *   addDays(date, days)                    → date shifted by whole calendar days
 *   addMonthsToMonth(yyyyMm, months)       → month shifted by whole months
 *   addMonthsToDate(date, months)          → date shifted by months, day clamped to the month's end
 *                                            (31 Jan + 1 month = 28/29 Feb)
 *   monthOf(date)                          → 'YYYY-MM' of a date
 *   endOfMonth(yyyyMm)                     → last day of that month
 *   daysBetween(fromDate, toDate)          → calendar days from → to (negative when `to` is earlier)
 *   dayOfWeek(date)                        → 0 = Sunday … 6 = Saturday (as Date.getDay numbers them)
 *   formatRelative(date, today)            → "today" | "in 3 days" | "1 day ago"
 *   formatLongDate(date)                   → "14 Mar 2027"
 */
import { DateTime, IANAZone } from 'luxon';

export type LocalDate = string;
export type YearMonth = string;

const LOCAL_DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;
const YEAR_MONTH_PATTERN = /^(\d{4})-(\d{2})$/;
// An instant must say where it is: 'Z' or a numeric offset. A bare '2026-03-29T02:30' would be read in
// whatever zone the caller happened to assume, which is exactly the ambiguity day counts must not have.
const INSTANT_WITH_OFFSET_PATTERN = /^\d{4}-\d{2}-\d{2}T[\d:.,]+(Z|[+-]\d{2}(:?\d{2})?)$/i;
// The ECMAScript date-time format, which Date.parse must read exactly; anything else goes through luxon.
const ECMASCRIPT_INSTANT_PATTERN = /^(\d{4}-\d{2}-\d{2})T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:\d{2})$/;

const MS_PER_DAY = 86_400_000;
// Fixed English abbreviations: locale data changes between ICU versions (en-GB now prints "Sept").
const MONTH_ABBREVIATIONS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

interface DateParts {
  year: number;
  month: number; // 1–12
  day: number;
}

function pad(value: number, width: number): string {
  return String(value).padStart(width, '0');
}

/** Days since 1970-01-01 for a proleptic Gregorian date. setUTCFullYear avoids Date.UTC's 0–99 → 1900s quirk. */
function dayNumberOf({ year, month, day }: DateParts): number {
  const utc = new Date(0);
  utc.setUTCFullYear(year, month - 1, day);
  return Math.round(utc.getTime() / MS_PER_DAY);
}

function partsOfDayNumber(dayNumber: number): DateParts {
  const utc = new Date(dayNumber * MS_PER_DAY);
  return { year: utc.getUTCFullYear(), month: utc.getUTCMonth() + 1, day: utc.getUTCDate() };
}

function formatParts({ year, month, day }: DateParts): LocalDate {
  if (year < 0 || year > 9999) throw new RangeError(`Date out of range (years 0000–9999): year ${year}`);
  return `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`;
}

function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function daysInMonth(year: number, month: number): number {
  return month === 2 && isLeapYear(year) ? 29 : DAYS_IN_MONTH[month - 1]!;
}

function parseLocalDate(value: string): DateParts {
  const match = LOCAL_DATE_PATTERN.exec(value);
  if (match) {
    const parts = { year: Number(match[1]), month: Number(match[2]), day: Number(match[3]) };
    if (parts.month >= 1 && parts.month <= 12 && parts.day >= 1 && parts.day <= daysInMonth(parts.year, parts.month)) {
      return parts;
    }
  }
  throw new RangeError(`Not a local date (YYYY-MM-DD): ${JSON.stringify(value)}`);
}

function parseYearMonth(value: string): { year: number; month: number } {
  const match = YEAR_MONTH_PATTERN.exec(value);
  if (match) {
    const parts = { year: Number(match[1]), month: Number(match[2]) };
    if (parts.month >= 1 && parts.month <= 12) return parts;
  }
  throw new RangeError(`Not a month (YYYY-MM): ${JSON.stringify(value)}`);
}

function requireWholeNumber(value: number, name: string): void {
  if (!Number.isInteger(value)) throw new RangeError(`${name} must be a whole number, got ${value}`);
}

export function isLocalDate(value: unknown): value is LocalDate {
  if (typeof value !== 'string') return false;
  try {
    parseLocalDate(value);
    return true;
  } catch {
    return false;
  }
}

export function isYearMonth(value: unknown): value is YearMonth {
  if (typeof value !== 'string') return false;
  try {
    parseYearMonth(value);
    return true;
  } catch {
    return false;
  }
}

function instantToEpochMs(instant: Date | string): number {
  if (typeof instant !== 'string') {
    const ms = instant.getTime();
    if (!Number.isFinite(ms)) throw new RangeError('Not a valid instant: Invalid Date');
    return ms;
  }
  // Fast path: Date.parse reads this format exactly, but rolls 30 Feb over into March, so check the date.
  const plain = ECMASCRIPT_INSTANT_PATTERN.exec(instant);
  if (plain && isLocalDate(plain[1])) {
    const ms = Date.parse(instant);
    if (Number.isFinite(ms)) return ms;
  }
  if (!INSTANT_WITH_OFFSET_PATTERN.test(instant)) {
    throw new RangeError(`Instant needs a 'Z' or ±HH:MM offset: ${JSON.stringify(instant)}`);
  }
  const parsed = DateTime.fromISO(instant, { setZone: true });
  if (!parsed.isValid) throw new RangeError(`Not a valid instant: ${JSON.stringify(instant)}`);
  return parsed.toMillis();
}

const MS_PER_HOUR = 3_600_000;
const MS_PER_MINUTE = 60_000;
const MAX_REMEMBERED_HOURS = 200_000;

interface ZoneOffsets {
  zone: IANAZone;
  /** UTC hour → the zone's offset in minutes through that whole hour, or null when it changes inside it. */
  byHour: Map<number, number | null>;
}

const zoneOffsets = new Map<string, ZoneOffsets>();

function offsetsOf(timeZone: string): ZoneOffsets {
  let entry = zoneOffsets.get(timeZone);
  if (entry === undefined) {
    const zone = IANAZone.create(timeZone);
    if (!zone.isValid) throw new RangeError(`Unknown time zone: ${JSON.stringify(timeZone)}`);
    entry = { zone, byHour: new Map() };
    zoneOffsets.set(timeZone, entry);
  }
  return entry;
}

/**
 * The zone's UTC offset in minutes at an instant. Asking the zone database costs microseconds, and a
 * statistics run converts hundreds of thousands of instants, so offsets are remembered per UTC hour — only
 * for hours whose first and last millisecond agree, i.e. no offset change inside them (zones change offset
 * at most once in an hour). Hours with a change in them are computed exactly every time. The memo never
 * changes a result, so the functions stay pure.
 */
function offsetMinutesAt(timeZone: string, epochMs: number): number {
  const { zone, byHour } = offsetsOf(timeZone);
  const hour = Math.floor(epochMs / MS_PER_HOUR);
  let steady = byHour.get(hour);
  if (steady === undefined) {
    const atStart = zone.offset(hour * MS_PER_HOUR);
    const atEnd = zone.offset((hour + 1) * MS_PER_HOUR - 1);
    steady = atStart === atEnd ? atStart : null;
    if (byHour.size >= MAX_REMEMBERED_HOURS) byHour.clear();
    byHour.set(hour, steady);
  }
  return steady ?? zone.offset(epochMs);
}

/** The calendar date an instant falls on in `timeZone` (IANA name, e.g. 'Europe/Berlin'). */
export function localDate(instant: Date | string, timeZone: string): LocalDate {
  const epochMs = instantToEpochMs(instant);
  const wallClock = new Date(epochMs + offsetMinutesAt(timeZone, epochMs) * MS_PER_MINUTE);
  return formatParts({ year: wallClock.getUTCFullYear(), month: wallClock.getUTCMonth() + 1, day: wallClock.getUTCDate() });
}

export function addDays(date: LocalDate, days: number): LocalDate {
  requireWholeNumber(days, 'days');
  return formatParts(partsOfDayNumber(dayNumberOf(parseLocalDate(date)) + days));
}

export function addMonthsToMonth(yyyyMm: YearMonth, months: number): YearMonth {
  requireWholeNumber(months, 'months');
  const { year, month } = parseYearMonth(yyyyMm);
  const monthIndex = year * 12 + (month - 1) + months;
  const shifted = { year: Math.floor(monthIndex / 12), month: (((monthIndex % 12) + 12) % 12) + 1, day: 1 };
  return formatParts(shifted).slice(0, 7);
}

/** Shift by whole months; a day that does not exist in the target month becomes that month's last day. */
export function addMonthsToDate(date: LocalDate, months: number): LocalDate {
  const { day } = parseLocalDate(date);
  const targetMonth = addMonthsToMonth(monthOf(date), months);
  const { year, month } = parseYearMonth(targetMonth);
  return formatParts({ year, month, day: Math.min(day, daysInMonth(year, month)) });
}

export function monthOf(date: LocalDate): YearMonth {
  parseLocalDate(date);
  return date.slice(0, 7);
}

export function endOfMonth(yyyyMm: YearMonth): LocalDate {
  const { year, month } = parseYearMonth(yyyyMm);
  return formatParts({ year, month, day: daysInMonth(year, month) });
}

/** Calendar days from `fromDate` to `toDate`: 0 for the same day, negative when `toDate` is earlier. */
export function daysBetween(fromDate: LocalDate, toDate: LocalDate): number {
  return dayNumberOf(parseLocalDate(toDate)) - dayNumberOf(parseLocalDate(fromDate));
}

/** 0 = Sunday … 6 = Saturday. Day 0 of the count, 1970-01-01, was a Thursday (4). */
export function dayOfWeek(date: LocalDate): number {
  return (((dayNumberOf(parseLocalDate(date)) + 4) % 7) + 7) % 7;
}

/**
 * A count of days in words: 1 → '1 day', 3 → '3 days', and a count already written out ('14.3', '1,204') keeps
 * its text: '1' is the only singular. The one place the day/days wording is decided.
 */
export function formatDayCount(days: number | string): string {
  const text = String(days);
  return `${text} ${text === '1' ? 'day' : 'days'}`;
}
const dayCount = formatDayCount;

/** The relative hint shown after an absolute date: "today", "in 103 days", "3 days ago". */
export function formatRelative(date: LocalDate, today: LocalDate): string {
  const days = daysBetween(today, date);
  if (days === 0) return 'today';
  return days > 0 ? `in ${dayCount(days)}` : `${dayCount(-days)} ago`;
}

/** '2027-03-14' → '14 Mar 2027' (day without a leading zero, English month abbreviation). */
export function formatLongDate(date: LocalDate): string {
  const { year, month, day } = parseLocalDate(date);
  return `${day} ${MONTH_ABBREVIATIONS[month - 1]} ${pad(year, 4)}`;
}
