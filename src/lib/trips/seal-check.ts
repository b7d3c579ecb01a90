/**
 * The seal check: do the tamper-evident seal numbers found at discharge match those applied at filling?
 *
 *   repeatedSeals(list)                    → numbers written more than once in one list ([] when none)
 *   sealDifference(applied, verified)      → { missing, unexpected } — each number as often as it is short or extra
 *   sealsMatch(applied, verified)          → true when the two lists are equal as multisets (order does not matter)
 *   sealState(applied, verified, flagged)  → 'not_sealed' | 'awaiting_check' | 'match' | 'mismatch'
 *   sealCheck(applied, verified, flagged)  → { state, label, icon, tone } — always a word and an icon
 *   sealMismatchSql(trip)                  → the same "mismatch" as an SQL predicate on a trips row (trip list filter)
 *
 * The rule (common practice for sealed bulk loads; no single published source): the numbers are compared
 * exactly (a seal missing, added, replaced or typed differently is reason to look at the load before anything
 * else), in any order, each number counted as often as it appears. A number repeated within one list is refused
 * at input (scan-schema.ts), so stored lists are sets; the multiset rule still answers correctly for a row
 * written before that check ([TE1, TE2] applied, [TE1, TE1] found is a mismatch). The discharge scan, the trip
 * list and page, and the planners' alert all use these functions; the SQL form is checked against sealState()
 * row by row in tests/integration/trips/seal-state-drift.test.ts.
 */
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';

export type SealState = 'not_sealed' | 'awaiting_check' | 'match' | 'mismatch';

export interface SealCheck {
  state: SealState;
  label: string;
  icon: IconName;
  tone: Tone;
}

const SEAL_DISPLAY: Record<SealState, Omit<SealCheck, 'state'>> = {
  not_sealed: { label: 'Not sealed yet', icon: 'waiting', tone: 'neutral' },
  awaiting_check: { label: 'Sealed, not checked yet', icon: 'waiting', tone: 'info' },
  match: { label: 'Checked: seals match', icon: 'check', tone: 'good' },
  mismatch: { label: 'Seal mismatch', icon: 'alert', tone: 'fault' },
};

function counts(list: readonly string[]): Map<string, number> {
  const m = new Map<string, number>();
  for (const s of list) m.set(s, (m.get(s) ?? 0) + 1);
  return m;
}

/** Numbers that appear more than once in one list, each named once, in first-seen order. */
export function repeatedSeals(list: readonly string[]): string[] {
  return [...counts(list)].filter(([, n]) => n > 1).map(([s]) => s);
}

/** What differs: applied numbers not found (as often as they are short) and found numbers never applied. */
export function sealDifference(applied: readonly string[], verified: readonly string[]): { missing: string[]; unexpected: string[] } {
  const left = counts(verified);
  const missing: string[] = [];
  for (const s of applied) {
    const n = left.get(s) ?? 0;
    if (n > 0) left.set(s, n - 1);
    else missing.push(s);
  }
  const unexpected = verified.filter((s) => {
    const n = left.get(s) ?? 0;
    if (n === 0) return false;
    left.set(s, n - 1);
    return true;
  });
  return { missing, unexpected };
}

/** Equal as multisets: same numbers, each as often, in any order. */
export function sealsMatch(applied: readonly string[], verified: readonly string[]): boolean {
  const d = sealDifference(applied, verified);
  return d.missing.length === 0 && d.unexpected.length === 0;
}

export function sealState(applied: readonly string[], verified: readonly string[], flagged: boolean): SealState {
  if (flagged) return 'mismatch';
  if (verified.length > 0) return sealsMatch(applied, verified) ? 'match' : 'mismatch';
  return applied.length > 0 ? 'awaiting_check' : 'not_sealed';
}

export function sealCheck(applied: readonly string[], verified: readonly string[], flagged: boolean): SealCheck {
  const state = sealState(applied, verified, flagged);
  return { state, ...SEAL_DISPLAY[state] };
}

/**
 * sealState(...) = 'mismatch' as SQL on a trips row aliased `trip`: flagged, or numbers checked that are not the
 * applied ones as a multiset (both lists sorted byte-wise and compared; NULL lists count as empty).
 */
export function sealMismatchSql(trip = 't'): string {
  const sorted = (col: string) => `ARRAY(SELECT x FROM unnest(COALESCE(${trip}.${col}, '{}')) x ORDER BY x COLLATE "C")`;
  return `(${trip}.seal_mismatch OR (cardinality(${trip}.seals_verified) > 0 AND ${sorted('seals_applied')} <> ${sorted('seals_verified')}))`;
}
