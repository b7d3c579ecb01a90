/**
 * "Not scanned for N days": bins nobody has seen for a while are the first to look for before they go missing.
 *
 *   parseStaleDays(text)              → { ok, days } — the N chosen on the page (1–3650, default 30)
 *   firstRecentDay(today, days)       → the earliest last-scan date that still counts as recent
 *   isNotScannedFor(lastScanOn, today, days) → true when the last scan was N or more calendar days ago
 *   notScannedForSql(firstRecent, timeZone)  → the same test as SQL on `a.last_scan_at`, for bins in service
 *
 * Days are calendar days in the operator's zone: with N = 30 on 1 Dec, a bin last scanned on 1 Nov (30 days
 * ago) counts, one scanned on 2 Nov (29 days ago) does not. A bin never scanned at all always counts.
 */
import { addDays, daysBetween } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import { STATUSES, type Status } from '@/lib/scans/lifecycle';

/** In service: registered and neither retired nor missing (a missing bin's last scan says nothing of where it is). */
export const IN_SERVICE_STATUSES: readonly Status[] = STATUSES.filter((s) => s !== 'retired' && s !== 'missing');

const DEFAULT_STALE_DAYS = 30;
const MAX_STALE_DAYS = 3650;

export type StaleDaysParse = { ok: true; days: number } | { ok: false; days: number; message: string };

export function parseStaleDays(text: string | null | undefined): StaleDaysParse {
  const value = text?.trim() ?? '';
  if (value === '') return { ok: true, days: DEFAULT_STALE_DAYS };
  if (!/^\d{1,4}$/.test(value) || Number(value) < 1 || Number(value) > MAX_STALE_DAYS) {
    return { ok: false, days: DEFAULT_STALE_DAYS, message: `Choose a whole number of days from 1 to ${MAX_STALE_DAYS}; showing ${DEFAULT_STALE_DAYS}.` };
  }
  return { ok: true, days: Number(value) };
}

export function firstRecentDay(today: LocalDate, days: number): LocalDate {
  if (!Number.isInteger(days) || days < 1) throw new RangeError(`Days must be a whole number ≥ 1, got ${days}`);
  return addDays(today, -(days - 1));
}

export function isNotScannedFor(lastScanOn: LocalDate | null, today: LocalDate, days: number): boolean {
  if (lastScanOn === null) return true;
  return daysBetween(lastScanOn, today) >= days;
}

/**
 * isNotScannedFor(...) as SQL for the pool overview, on bins still in service (not retired, not missing):
 * never scanned, or last scanned before the first moment of local day `firstRecent` (= firstRecentDay(today, N)).
 * `firstRecent` and `timeZone` are SQL expressions (bind parameters). Checked against isNotScannedFor() in
 * tests/integration/fleet/silent-drift.test.ts.
 */
export function notScannedForSql(firstRecent: string, timeZone: string): string {
  const outOfService = STATUSES.filter((s) => !IN_SERVICE_STATUSES.includes(s))
    .map((s) => `'${s}'`)
    .join(', ');
  return `a.status NOT IN (${outOfService}) AND (a.last_scan_at IS NULL OR a.last_scan_at < (${firstRecent}::date::timestamp AT TIME ZONE ${timeZone}))`;
}
