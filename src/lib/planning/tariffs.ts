/**
 * Customer tariffs with effective dates: the one place hire terms are read
 * from (orders point at the tariff in force at their wanted date; billing reads
 * the same rows). Pure.
 *
 * A tariff is valid from `validFrom` to `validTo`, both local dates and both
 * included; `validTo = null` means "until further notice". A customer's
 * tariffs never overlap (the database enforces it too).
 */
import type { LocalDate } from '@/lib/calendar';

export interface TariffTerms {
  freeDays: number;
  /** Money as decimal strings, as PostgreSQL NUMERIC returns them. */
  dailyRate: string;
  perTripFee: string;
  lostBinFee: string;
  currency: string;
}

export interface Tariff extends TariffTerms {
  id: number;
  customerId: number;
  validFrom: LocalDate;
  validTo: LocalDate | null;
}

/** ISO dates compare as strings. */
export function inForce(t: Pick<Tariff, 'validFrom' | 'validTo'>, day: LocalDate): boolean {
  return t.validFrom <= day && (t.validTo === null || day <= t.validTo);
}

/** The customer's tariff in force on a day, or null when none is. */
export function tariffInForce<T extends Pick<Tariff, 'validFrom' | 'validTo'>>(tariffs: readonly T[], day: LocalDate): T | null {
  return tariffs.find((t) => inForce(t, day)) ?? null;
}

export function periodsOverlap(a: Pick<Tariff, 'validFrom' | 'validTo'>, b: Pick<Tariff, 'validFrom' | 'validTo'>): boolean {
  const aEndsBeforeB = a.validTo !== null && a.validTo < b.validFrom;
  const bEndsBeforeA = b.validTo !== null && b.validTo < a.validFrom;
  return !aEndsBeforeB && !bEndsBeforeA;
}

/** "from 1 Jan 2026 until further notice" style words for a period (ISO dates kept as written). */
export function periodWords(t: Pick<Tariff, 'validFrom' | 'validTo'>): string {
  return t.validTo === null ? `from ${t.validFrom}, until further notice` : `${t.validFrom} to ${t.validTo}`;
}
