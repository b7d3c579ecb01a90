/**
 * Customer tariffs with effective dates: the one place hire terms are read
 * from (orders point at the tariff in force at their wanted date; billing reads
 * the same rows). Pure.
 *
 * A tariff is valid from `validFrom` to `validTo`, both local dates and both
 * included; `validTo = null` means "until further notice". A customer's
 * tariffs never overlap (the database enforces it too).
 */
import { z } from 'zod';
import { formatLongDate, isLocalDate, type LocalDate } from '@/lib/calendar';
import type { HireStartEvent, HireStopEvent } from '@/lib/billing/hire-billing';

export interface TariffTerms {
  freeDays: number;
  /** Money as decimal strings, as PostgreSQL NUMERIC returns them. */
  dailyRate: string;
  perTripFee: string;
  lostBinFee: string;
  currency: string;
  /** Per liner fitted on a trip, and per stop of a finished collection run at one of the customer's sites. */
  linerFee: string;
  stopFee: string;
  /** The billing day count (src/lib/billing/hire-days.ts): which ends of a hire count, what starts and stops it. */
  firstDayCounts: boolean;
  lastDayCounts: boolean;
  hireStartsAt: HireStartEvent;
  hireStopsAt: HireStopEvent;
}

/** The terms a tariff gets when they are not given: no liner or stop charges, the overdue rule's day count. */
export const DEFAULT_TARIFF_TERMS = Object.freeze({
  linerFee: '0.00',
  stopFee: '0.00',
  firstDayCounts: false,
  lastDayCounts: true,
  hireStartsAt: 'delivery',
  hireStopsAt: 'collection',
} as const satisfies Partial<TariffTerms>);

export const HIRE_START_LABELS: Readonly<Record<HireStartEvent, string>> = Object.freeze({ delivery: 'at delivery', dispatch: 'at dispatch' });
export const HIRE_STOP_LABELS: Readonly<Record<HireStopEvent, string>> = Object.freeze({
  ready_notice: 'at the ready-for-collection notice',
  collection: 'at collection',
  depot_receipt: 'at depot receipt',
});

/** The day-count terms in words: "from delivery to collection; the last day counts". */
export function dayCountWords(t: Pick<TariffTerms, 'firstDayCounts' | 'lastDayCounts' | 'hireStartsAt' | 'hireStopsAt'>): string {
  const ends =
    t.firstDayCounts && t.lastDayCounts ? 'both end days count' : t.firstDayCounts ? 'the first day counts' : t.lastDayCounts ? 'the last day counts' : 'neither end day counts';
  return `starts ${HIRE_START_LABELS[t.hireStartsAt]}, stops ${HIRE_STOP_LABELS[t.hireStopsAt]}; ${ends}`;
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

/** "from 1 Jan 2026, until further notice" style words for a period, in the app's one date format. */
export function periodWords(t: Pick<Tariff, 'validFrom' | 'validTo'>): string {
  return t.validTo === null ? `from ${formatLongDate(t.validFrom)}, until further notice` : `${formatLongDate(t.validFrom)} to ${formatLongDate(t.validTo)}`;
}

export type NewTariffPlan =
  | { ok: true /** The open-ended tariff that the new one succeeds, ended the day before it starts. */; endPrevious: { id: number; validTo: LocalDate } | null }
  | { ok: false; message: string };

/**
 * Where a new tariff fits among a customer's tariffs: an open-ended tariff that
 * began before it is ended the day before the new one starts (the usual price
 * change); any other overlap is refused, naming the period in the way.
 * `dayBefore` is passed in so this stays free of date arithmetic of its own.
 */
export function planNewTariff(
  existing: readonly Pick<Tariff, 'id' | 'validFrom' | 'validTo'>[],
  next: Pick<Tariff, 'validFrom' | 'validTo'>,
  dayBefore: (day: LocalDate) => LocalDate,
): NewTariffPlan {
  if (next.validTo !== null && next.validTo < next.validFrom) return { ok: false, message: 'The tariff ends before it begins.' };
  let endPrevious: { id: number; validTo: LocalDate } | null = null;
  for (const t of existing) {
    if (!periodsOverlap(t, next)) continue;
    if (t.validTo === null && t.validFrom < next.validFrom) {
      endPrevious = { id: t.id, validTo: dayBefore(next.validFrom) };
      continue;
    }
    return { ok: false, message: `It overlaps the tariff in force ${periodWords(t)}; choose dates outside it.` };
  }
  return { ok: true, endPrevious };
}

const money = z
  .string()
  .trim()
  .regex(/^\d{1,8}(\.\d{1,2})?$/, 'must be an amount like 1.60 (at most two decimals)');
const day = z.string().refine(isLocalDate, 'must be a date like 2027-01-01');

/** A new tariff as an admin enters it. */
export const tariffInputSchema = z
  .object({
    customerId: z.number().int().positive(),
    freeDays: z.number({ invalid_type_error: 'must be a number' }).int('must be whole days').min(0, 'must be 0 or more').max(365, 'must be at most 365'),
    dailyRate: money,
    perTripFee: money,
    lostBinFee: money,
    currency: z.string().regex(/^[A-Z]{3}$/, 'must be a three-letter ISO 4217 code such as EUR'),
    // Left out (an older form): the defaults, which are the overdue rule's count.
    linerFee: money.default(DEFAULT_TARIFF_TERMS.linerFee),
    stopFee: money.default(DEFAULT_TARIFF_TERMS.stopFee),
    firstDayCounts: z.boolean().default(DEFAULT_TARIFF_TERMS.firstDayCounts),
    lastDayCounts: z.boolean().default(DEFAULT_TARIFF_TERMS.lastDayCounts),
    hireStartsAt: z.enum(['delivery', 'dispatch']).default(DEFAULT_TARIFF_TERMS.hireStartsAt),
    hireStopsAt: z.enum(['ready_notice', 'collection', 'depot_receipt']).default(DEFAULT_TARIFF_TERMS.hireStopsAt),
    validFrom: day,
    validTo: day.nullish().transform((v) => v ?? null),
  })
  .strict();
export type TariffInput = z.infer<typeof tariffInputSchema>;
