/**
 * From the database's words to the billing rule's: the month a statement covers, decimal amounts as minor units,
 * a customer's tariff rows as the versions `statementFor` reads, and the liner and truck-stop charges priced by
 * the version in force on their day. Pure: the service (`statements.server.ts`) runs the queries and hands the
 * rows in.
 *
 *   billingMonth('2027-03')                 → { from: '2027-03-01', to: '2027-03-31' } or null
 *   monthOf(period)                         → '2027-03'
 *   decimalToMinor('12.50', 'EUR')          → 1250 (refuses more decimals than the currency has)
 *   tariffVersions(rows)                    → TariffVersion[] in date order
 *   versionInForce(versions, date)          → the version in force that day, or null
 *   lastClosedMonth(today)                  → the latest month that has ended
 */
import { addDays, isLocalDate, type LocalDate } from '@/lib/calendar';
import type { BillingPeriod, HireStartEvent, HireStopEvent, TariffVersion } from './hire-billing';
import { decimalToMinorUnits, minorDigits } from './money';

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** A calendar month as a billing period, both ends included; null for anything that is not YYYY-MM. */
export function billingMonth(month: string): BillingPeriod | null {
  const m = MONTH.exec(month);
  if (!m) return null;
  const year = Number(m[1]);
  const monthNumber = Number(m[2]);
  if (year < 2000 || year > 9999) return null;
  const from = `${m[1]}-${m[2]}-01` as LocalDate;
  const next = monthNumber === 12 ? `${year + 1}-01-01` : `${m[1]}-${String(monthNumber + 1).padStart(2, '0')}-01`;
  return { from, to: addDays(next as LocalDate, -1) };
}

export function monthOf(period: BillingPeriod): string {
  return period.from.slice(0, 7);
}

/** The month before the one `today` is in: the latest one a statement may be issued for. */
export function lastClosedMonth(today: LocalDate): string {
  const [y, m] = today.split('-').map(Number) as [number, number];
  return m === 1 ? `${y - 1}-12` : `${y}-${String(m - 1).padStart(2, '0')}`;
}

/** "12.50" (as PostgreSQL NUMERIC arrives) → 1250 minor units, by money.ts's rule; a non-amount is a bug: thrown. */
export function decimalToMinor(value: string | number, currency: string): number {
  const digits = minorDigits(currency);
  const minor = decimalToMinorUnits(value, digits);
  if (minor === null) throw new RangeError(`Not an amount of ${currency} (at most ${digits} decimals): ${JSON.stringify(value)}`);
  return minor;
}

/** A tariff row as the service reads it (snake-case columns, NUMERIC as text). */
export interface TariffRow {
  valid_from: string;
  currency: string;
  free_days: number;
  daily_rate: string;
  per_trip_fee: string;
  lost_bin_fee: string;
  liner_fee: string;
  stop_fee: string;
  first_day_counts: boolean;
  last_day_counts: boolean;
  hire_starts_at: HireStartEvent;
  hire_stops_at: HireStopEvent;
}

export interface PricedVersion extends TariffVersion {
  linerFeeMinor: number;
  stopFeeMinor: number;
}

/**
 * The rows in date order as versions. A version applies from its first day until the next one starts; an end date
 * on the last one is not a gap the rule knows about (the operator keeps tariffs contiguous), so it is not read.
 */
export function tariffVersions(rows: readonly TariffRow[]): PricedVersion[] {
  return [...rows]
    .sort((a, b) => (a.valid_from < b.valid_from ? -1 : 1))
    .map((r) => {
      if (!isLocalDate(r.valid_from)) throw new RangeError(`A tariff's first day is not a date: ${r.valid_from}`);
      return {
        effectiveFrom: r.valid_from,
        currency: r.currency,
        freeDaysPerTrip: r.free_days,
        dailyRateMinor: decimalToMinor(r.daily_rate, r.currency),
        tripFeeMinor: decimalToMinor(r.per_trip_fee, r.currency),
        lostBinFeeMinor: decimalToMinor(r.lost_bin_fee, r.currency),
        linerFeeMinor: decimalToMinor(r.liner_fee, r.currency),
        stopFeeMinor: decimalToMinor(r.stop_fee, r.currency),
        firstDayCounts: r.first_day_counts,
        lastDayCounts: r.last_day_counts,
        hireStartsAt: r.hire_starts_at,
        hireStopsAt: r.hire_stops_at,
      };
    });
}

/** The version in force on `date` (the latest that has started), or null before the first. */
export function versionInForce<T extends TariffVersion>(versions: readonly T[], date: LocalDate): T | null {
  let found: T | null = null;
  for (const v of versions) if (v.effectiveFrom <= date) found = v;
  return found;
}

/** The first day a month's statement can be issued: the day after the month ends. */
export function issuableFrom(period: BillingPeriod): LocalDate {
  return addDays(period.to, 1);
}
