/**
 * Month-by-month series for charts: every month of a range present, in order, with zeros where the database
 * had no rows (a GROUP BY never returns the empty months).
 *
 *   monthsFrom(from, to)               → ['2026-01', '2026-02', …] both ends included
 *   fillMonths(from, to, rows, keys)   → one point per month, missing counts as 0
 *   monthLabel('2026-03')              → 'Mar 2026'
 */
import { addMonthsToMonth, formatLongDate, isYearMonth } from '@/lib/calendar';
import type { YearMonth } from '@/lib/calendar';

const MAX_MONTHS = 600;

export function monthsFrom(from: YearMonth, to: YearMonth): YearMonth[] {
  if (!isYearMonth(from) || !isYearMonth(to)) throw new RangeError(`Not months: ${from} – ${to}`);
  const months: YearMonth[] = [];
  for (let m = from; m <= to; m = addMonthsToMonth(m, 1)) {
    months.push(m);
    if (months.length > MAX_MONTHS) throw new RangeError(`More than ${MAX_MONTHS} months: ${from} – ${to}`);
  }
  return months;
}

export type MonthPoint<K extends string> = { month: YearMonth; label: string } & Record<K, number>;

export function monthLabel(month: YearMonth): string {
  return formatLongDate(`${month}-01`).replace(/^1 /, '');
}

/** Rows may carry months outside the range (ignored) or a month twice (added up). */
export function fillMonths<K extends string>(
  from: YearMonth,
  to: YearMonth,
  rows: ReadonlyArray<{ month: YearMonth } & Partial<Record<K, number>>>,
  keys: readonly K[],
): MonthPoint<K>[] {
  const byMonth = new Map<YearMonth, Record<K, number>>();
  for (const month of monthsFrom(from, to)) {
    byMonth.set(month, Object.fromEntries(keys.map((k) => [k, 0])) as Record<K, number>);
  }
  for (const row of rows) {
    const counts = byMonth.get(row.month);
    if (!counts) continue;
    for (const k of keys) counts[k] += Number(row[k] ?? 0);
  }
  return [...byMonth].map(([month, counts]) => ({ month, label: monthLabel(month), ...counts }) as MonthPoint<K>);
}
