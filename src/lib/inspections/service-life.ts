/**
 * Period of use of a rigid plastics inner receptacle (ADR 4.1.1.15), per bin type.
 *
 *   serviceLifePolicyProblems(policy)            → string[] (empty when usable)
 *   serviceLifeEnd(policy, innerMadeMonth)       → last day of use, or null when the rule does not apply
 *   fillLimit(nextDue, serviceLifeEnds)          → { lastDay, because } the earlier of the two limits
 *
 * Published (ADR 4.1.1.15): rigid plastics IBCs and composite IBCs with a rigid plastics inner receptacle may
 * be used for dangerous goods for five years from the date of manufacture of the inner receptacle, unless a
 * shorter period is prescribed for the substance (or the competent authority allows otherwise). It does not
 * concern bins lined with a single-use flexible liner, so a bin type says whether it applies.
 * Policy (this module's reading, the same as the test schedule's): the inner receptacle carries its month and
 * year of manufacture, so the period ends on the last day of the month `years × 12` months after that month.
 */
import { addMonthsToMonth, endOfMonth, isYearMonth, type LocalDate, type YearMonth } from '@/lib/calendar';

export interface ServiceLifePolicy {
  /** True for rigid plastics IBCs and composites with a rigid plastics inner receptacle used for dangerous goods. */
  applies: boolean;
  /** Years of use from the inner receptacle's manufacture: 5 under ADR 4.1.1.15, fewer where the substance needs. */
  years: number;
}

/** ADR 4.1.1.15's five years. */
export const ADR_SERVICE_LIFE_YEARS = 5;

/** A liner-based folding bin: the rule does not apply (its liner is replaced every trip). */
export const NO_SERVICE_LIMIT: Readonly<ServiceLifePolicy> = Object.freeze({ applies: false, years: ADR_SERVICE_LIFE_YEARS });

export function serviceLifePolicyProblems(policy: ServiceLifePolicy): string[] {
  if (!policy.applies) return [];
  if (!Number.isInteger(policy.years) || policy.years < 1) return ['the period of use must be a whole number of years above 0'];
  if (policy.years > ADR_SERVICE_LIFE_YEARS) return [`ADR 4.1.1.15 allows at most ${ADR_SERVICE_LIFE_YEARS} years of use for a rigid plastics inner receptacle`];
  return [];
}

/** The last day the bin may be used (filled) under 4.1.1.15; null when its type is not under the rule. */
export function serviceLifeEnd(policy: ServiceLifePolicy, innerMadeMonth: YearMonth | null): LocalDate | null {
  if (!policy.applies) return null;
  const problems = serviceLifePolicyProblems(policy);
  if (problems.length) throw new RangeError(`Unusable service-life policy: ${problems.join('; ')}`);
  if (innerMadeMonth === null || !isYearMonth(innerMadeMonth)) {
    throw new RangeError(`The inner receptacle's manufacture month is needed (YYYY-MM): ${JSON.stringify(innerMadeMonth)}`);
  }
  return endOfMonth(addMonthsToMonth(innerMadeMonth, policy.years * 12));
}

export type LimitReason = 'test' | 'service_life';

/** The last day a bin may be filled: its periodic test's due date, or the end of its period of use if earlier. */
export function fillLimit(nextDue: LocalDate | null, serviceLifeEnds: LocalDate | null): { lastDay: LocalDate; because: LimitReason } | null {
  if (nextDue === null && serviceLifeEnds === null) return null;
  if (serviceLifeEnds !== null && (nextDue === null || serviceLifeEnds < nextDue)) return { lastDay: serviceLifeEnds, because: 'service_life' };
  return { lastDay: nextDue!, because: 'test' };
}
