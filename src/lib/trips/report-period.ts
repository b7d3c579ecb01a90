/**
 * The period a report covers, as chosen on the page: two local dates, both included, ending no later than
 * today (statistics count an open trip as on hire up to the end of the period, so a period reaching into the
 * future would invent hire days).
 *
 *   parseReportPeriod({ from, to }, today)   → { ok: true, period } | { ok: false, issues, period: default }
 *   periodPresets(today)                     → the quick choices shown as links
 *
 * Not given: the last 365 days up to today.
 */
import { addDays, daysBetween, isLocalDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import type { QueryIssue } from './trip-list-query';

export interface ReportPeriod {
  from: LocalDate;
  to: LocalDate;
}

const DEFAULT_PERIOD_DAYS = 365;
/** Ten years: longer periods are a typo more often than a wish. */
const MAX_PERIOD_DAYS = 3660;

export type PeriodParse = { ok: true; period: ReportPeriod } | { ok: false; issues: QueryIssue[]; period: ReportPeriod };

export function lastDays(today: LocalDate, days: number): ReportPeriod {
  return { from: addDays(today, -(days - 1)), to: today };
}

export function parseReportPeriod(input: { from?: string | null; to?: string | null }, today: LocalDate): PeriodParse {
  const fallback = lastDays(today, DEFAULT_PERIOD_DAYS);
  const issues: QueryIssue[] = [];
  const fromText = input.from?.trim() || null;
  const toText = input.to?.trim() || null;
  if (fromText !== null && !isLocalDate(fromText)) issues.push({ field: 'from', message: 'The start must be a date like 2026-01-31.' });
  if (toText !== null && !isLocalDate(toText)) issues.push({ field: 'to', message: 'The end must be a date like 2026-12-31.' });
  if (issues.length) return { ok: false, issues, period: fallback };
  const to = toText ?? today;
  const from = fromText ?? addDays(to, -(DEFAULT_PERIOD_DAYS - 1));
  if (to > today) issues.push({ field: 'to', message: `The period must end by today (${today}): the future has no trips yet.` });
  else if (from > to) issues.push({ field: 'from', message: 'The start is after the end.' });
  else if (daysBetween(from, to) + 1 > MAX_PERIOD_DAYS) issues.push({ field: 'from', message: `A period covers at most ${MAX_PERIOD_DAYS} days.` });
  return issues.length ? { ok: false, issues, period: fallback } : { ok: true, period: { from, to } };
}

export interface PeriodPreset extends ReportPeriod {
  label: string;
}

export function periodPresets(today: LocalDate): PeriodPreset[] {
  const year = Number(today.slice(0, 4));
  return [
    { label: 'Last 90 days', ...lastDays(today, 90) },
    { label: 'Last 365 days', ...lastDays(today, 365) },
    { label: `${year} so far`, from: `${year}-01-01`, to: today },
    { label: String(year - 1), from: `${year - 1}-01-01`, to: `${year - 1}-12-31` },
  ];
}
