/**
 * Which calendar days of a hire count: the one day-count rule of the product. Billing (hire-billing.ts) and the
 * overdue-back rule (src/lib/fleet/overdue-return.ts) both count days through these functions, so a customer is never
 * told "2 days left" on a day the statement already charges.
 *
 *   DEFAULT_DAY_COUNT                              → the terms used when a tariff says nothing: the start day is
 *                                                    not counted, the stop day is (delivered 1 Mar, collected
 *                                                    3 Mar → 2 days: 2 and 3 Mar)
 *   firstHireDay(startOn, terms)                   → the first counted date
 *   hireDayRange(startOn, stopOn, throughOn, terms) → the counted dates, first..last inclusive, and how many
 *   hireDaysThrough(startOn, asOfOn, terms)        → days counted so far on a hire that has not stopped
 *   lastFreeDay(startOn, freeDays, terms)          → the date of the last free day
 *   hireDayNumber(startOn, date, terms)            → 1 for the first counted date, 2 for the next, …
 *
 * Dates are local dates in the operator's time zone (calendar.ts turns instants into them). The rule:
 *   - a stopped hire counts the dates from the start date to the stop date, leaving out the start date unless
 *     `firstDayCounts` and the stop date unless `lastDayCounts`. A hire that starts and stops on the same date
 *     counts that date once when both ends count, otherwise not at all;
 *   - a running hire (no stop yet) counts every date from its first counted date up to and including the date
 *     it is looked at (today, or a billing period's last day): the bin is with the customer all of that day,
 *     and whether the stop day will count is not known before the hire stops;
 *   - a stop before the start (a phone clock off) counts zero days, never negative ones.
 * Which end counts is a term of the customer's tariff (common practice in equipment hire; no single published
 * source). The default reproduces the overdue rule as it stood: delivered 1 Mar with 14 free days, 15 Mar is
 * day 14 and still free, 16 Mar is day 15.
 */
import { addDays, daysBetween, type LocalDate } from '@/lib/calendar';

export interface DayCountTerms {
  /** The date the hire starts on (delivery, or dispatch) is itself a hire day. */
  firstDayCounts: boolean;
  /** The date the hire stops on (ready notice, collection or depot receipt, per tariff) is itself a hire day. */
  lastDayCounts: boolean;
}

export const DEFAULT_DAY_COUNT: Readonly<DayCountTerms> = Object.freeze({ firstDayCounts: false, lastDayCounts: true });

export interface HireDayRange {
  /** First counted date; null when no day counts. */
  first: LocalDate | null;
  /** Last counted date (inclusive); null when no day counts. */
  last: LocalDate | null;
  days: number;
}

const NO_DAYS: HireDayRange = Object.freeze({ first: null, last: null, days: 0 });

export function firstHireDay(startOn: LocalDate, terms: DayCountTerms = DEFAULT_DAY_COUNT): LocalDate {
  return terms.firstDayCounts ? addDays(startOn, 0) : addDays(startOn, 1);
}

function rangeOf(first: LocalDate, last: LocalDate): HireDayRange {
  const days = daysBetween(first, last) + 1;
  return days > 0 ? { first, last, days } : NO_DAYS;
}

/**
 * The counted dates of one hire. `stopOn` null means the hire is still running; it is then counted through
 * `throughOn` inclusive. A stopped hire ignores `throughOn` (clip to a period with `clipRange`).
 */
export function hireDayRange(startOn: LocalDate, stopOn: LocalDate | null, throughOn: LocalDate, terms: DayCountTerms = DEFAULT_DAY_COUNT): HireDayRange {
  if (stopOn === null) return rangeOf(firstHireDay(startOn, terms), addDays(throughOn, 0));
  if (startOn === stopOn) return terms.firstDayCounts && terms.lastDayCounts ? rangeOf(startOn, startOn) : NO_DAYS;
  const last = terms.lastDayCounts ? addDays(stopOn, 0) : addDays(stopOn, -1);
  return rangeOf(firstHireDay(startOn, terms), last);
}

/** Days counted so far on a hire that has not stopped, as of `asOfOn` (0 when `asOfOn` is before the start). */
export function hireDaysThrough(startOn: LocalDate, asOfOn: LocalDate, terms: DayCountTerms = DEFAULT_DAY_COUNT): number {
  return hireDayRange(startOn, null, asOfOn, terms).days;
}

/** 1 for the first counted date of the hire, 2 for the next, …; 0 or less for dates before it. */
export function hireDayNumber(startOn: LocalDate, date: LocalDate, terms: DayCountTerms = DEFAULT_DAY_COUNT): number {
  return daysBetween(firstHireDay(startOn, terms), date) + 1;
}

/** The date of the last free day: the `freeDays`-th counted date (the day before the first one when 0). */
export function lastFreeDay(startOn: LocalDate, freeDays: number, terms: DayCountTerms = DEFAULT_DAY_COUNT): LocalDate {
  if (!Number.isInteger(freeDays) || freeDays < 0) throw new RangeError(`Free days must be a whole number ≥ 0, got ${freeDays}`);
  return addDays(firstHireDay(startOn, terms), freeDays - 1);
}

/** The part of a range inside [from, to] (both inclusive). */
export function clipRange(range: HireDayRange, from: LocalDate, to: LocalDate): HireDayRange {
  if (range.first === null || range.last === null) return NO_DAYS;
  const first = range.first > from ? range.first : from;
  const last = range.last < to ? range.last : to;
  return first <= last ? rangeOf(first, last) : NO_DAYS;
}

/**
 * The same count as `hireDaysThrough` as a PostgreSQL expression, for queries that filter on it (the planners'
 * digest): `GREATEST(0, asOf − start + k)`, k = 1 when the first day counts. Both arguments are SQL expressions of
 * type date written by the caller (constants and bind placeholders only — never user text).
 */
export function hireDaysThroughSql(startDateSql: string, asOfDateSql: string, terms: DayCountTerms = DEFAULT_DAY_COUNT): string {
  return `GREATEST(0, (${asOfDateSql}) - (${startDateSql})${terms.firstDayCounts ? ' + 1' : ''})`;
}
