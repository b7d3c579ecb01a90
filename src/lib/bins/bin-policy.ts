import { DEFAULT_UN_POLICY, type InspectionPolicy } from '@/lib/inspections/inspection-due';

/** The inspection policy a bin type carries (UN regime or the operator's own interval). */
export function policyForBinType(t: { policyKind: 'un' | 'own'; intermediateMonths: number; fullMonths: number }): InspectionPolicy {
  return {
    ...DEFAULT_UN_POLICY,
    kind: t.policyKind,
    intermediateMonths: t.intermediateMonths,
    fullMonths: t.fullMonths,
  };
}
