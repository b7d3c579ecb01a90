/**
 * Before a bin leaves on a hire order: will its periodic test (or its period of use) run out before it is
 * filled, or while it is out?
 *
 *   daysOnHireFromCurve(curve, q = 0.9)          → smallest t with P(still out after t days) ≤ 1 − q, or null
 *   daysOnHireFromTrips(days, q = 0.9)           → the nearest-rank q-quantile of returned trips' days, or null
 *   checkDispatch(input)                         → { ok: true } | a refusal, hard or overridable
 *   overrideAccepted(check, reason)              → may a planner's reason release this refusal?
 *
 * The rules:
 * - ADR/RID 4.1.2.2 and 49 CFR 180.352 [published]: no filling after the last periodic test or inspection has
 *   expired (ADR 4.1.1.15 adds the end of a rigid plastics inner receptacle's period of use). A bin whose limit
 *   falls before the order's wanted fill date cannot be filled there: refused, and no one may override it.
 * - The operator's margin (policy, not a rule): the customer keeps bins for a while and may refill them; a bin
 *   whose limit falls before the wanted date plus the customer's usual days on hire (the 90th percentile) would
 *   run out while out. Refused too, but a planner may override this one with a reason, which is recorded.
 * - The regime only changes the words: under ADR a bin filled before expiry may be carried for 3 months after
 *   it; under 49 CFR 180.352 with no limit.
 */
import { addDays, addMonthsToDate, isLocalDate, type LocalDate } from '@/lib/calendar';
import { survivalAt, type SurvivalCurve } from '@/lib/planning/returns-forecast';
import type { InspectionPolicy } from './inspection-due';
import type { LimitReason } from './service-life';

export const USUAL_DAYS_QUANTILE = 0.9;

/** The days on hire by which a share q of bins is back, read from the returns forecast's Kaplan–Meier curve. */
export function daysOnHireFromCurve(curve: SurvivalCurve, q = USUAL_DAYS_QUANTILE): number | null {
  if (!(q > 0 && q < 1)) throw new RangeError(`q must be between 0 and 1, got ${q}`);
  for (const row of curve.rows) {
    if (survivalAt(curve, row.day) <= 1 - q + 1e-12) return row.day;
  }
  return null; // the curve never drops that far: too many trips still out to say
}

/**
 * Nearest-rank quantile of the days on hire of returned trips: sorted ascending, the value at rank ⌈q·n⌉.
 * The fallback when there is no forecast curve; null without a single returned trip.
 */
export function daysOnHireFromTrips(days: readonly number[], q = USUAL_DAYS_QUANTILE): number | null {
  if (!(q > 0 && q <= 1)) throw new RangeError(`q must be in (0, 1], got ${q}`);
  for (const d of days) if (!Number.isInteger(d) || d < 0) throw new RangeError(`days on hire must be whole numbers ≥ 0, got ${d}`);
  if (days.length === 0) return null;
  const sorted = [...days].sort((a, b) => a - b);
  return sorted[Math.ceil(q * sorted.length) - 1]!;
}

export interface DispatchCheckInput {
  /** The last day the bin may be filled (fillLimit()), or null when it has no periodic regime. */
  limit: { lastDay: LocalDate; because: LimitReason } | null;
  /** The dispatch day (today in the operator's zone). */
  today: LocalDate;
  /** The hire order's wanted date: the bins are wanted there, for filling, by then. */
  wantedOn: LocalDate;
  /** The customer's usual days on hire (90th percentile), or null when there is no history to go on. */
  usualDaysOnHire: number | null;
  policy: Pick<InspectionPolicy, 'carriageAllowanceMonths'>;
}

export type DispatchRefusalCode = 'inspection_lapsed' | 'lapses_before_fill' | 'lapses_while_out';

export type DispatchCheck =
  | { ok: true; marginChecked: boolean }
  | { ok: false; code: DispatchRefusalCode; overridable: boolean; lastDay: LocalDate; because: LimitReason; expectedBackOn: LocalDate | null; reason: string };

const WHAT: Record<LimitReason, string> = { test: 'periodic test', service_life: 'period of use (ADR 4.1.1.15)' };

function carriageWords(lastDay: LocalDate, policy: DispatchCheckInput['policy']): string {
  const a = policy.carriageAllowanceMonths;
  if (a === 'unlimited') return 'a bin filled before then may still be carried (49 CFR 180.352)';
  if (a === 0) return 'a filled bin may not travel after it';
  return `a bin filled before then may be carried until ${addMonthsToDate(lastDay, a)} (ADR 4.1.2.2)`;
}

export function checkDispatch(input: DispatchCheckInput): DispatchCheck {
  const { limit, today, wantedOn, usualDaysOnHire, policy } = input;
  if (!isLocalDate(today) || !isLocalDate(wantedOn)) throw new RangeError('today and wantedOn must be dates (YYYY-MM-DD)');
  if (usualDaysOnHire !== null && !(Number.isInteger(usualDaysOnHire) && usualDaysOnHire >= 0)) {
    throw new RangeError(`usual days on hire must be a whole number ≥ 0, got ${usualDaysOnHire}`);
  }
  if (limit === null) return { ok: true, marginChecked: false };
  const { lastDay, because } = limit;
  const what = WHAT[because];
  const base = { lastDay, because };
  if (lastDay < today) {
    return {
      ok: false,
      code: 'inspection_lapsed',
      overridable: false,
      ...base,
      expectedBackOn: null,
      reason: `Its ${what} ran out on ${lastDay}; it may not be dispatched for hire.`,
    };
  }
  // Filled on the wanted date at the earliest: allowed only up to and including the last day.
  const fillOn = wantedOn < today ? today : wantedOn;
  if (lastDay < fillOn) {
    return {
      ok: false,
      code: 'lapses_before_fill',
      overridable: false,
      ...base,
      expectedBackOn: null,
      reason: `Its ${what} runs out on ${lastDay}, before the order's wanted date ${fillOn}: it could not be filled there. Choose another bin.`,
    };
  }
  if (usualDaysOnHire === null) return { ok: true, marginChecked: false };
  const expectedBackOn = addDays(fillOn, usualDaysOnHire);
  if (lastDay < expectedBackOn) {
    return {
      ok: false,
      code: 'lapses_while_out',
      overridable: true,
      ...base,
      expectedBackOn,
      reason: `Its ${what} runs out on ${lastDay}, while it is likely still out (this customer's bins are usually back within ${usualDaysOnHire} days, by ${expectedBackOn}); ${carriageWords(lastDay, policy)}. A planner may override this with a reason.`,
    };
  }
  return { ok: true, marginChecked: true };
}

/** Only the margin may be overridden, and only with a reason someone can read later. */
export function overrideAccepted(check: DispatchCheck, reason: string | null | undefined): boolean {
  return !check.ok && check.overridable && typeof reason === 'string' && reason.trim().length >= 5;
}
