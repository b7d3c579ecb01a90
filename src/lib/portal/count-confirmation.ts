// The monthly count: each calendar month a customer confirms, site by site, the bins they hold (ticked from the list
// of what the pool believes is there, or scanned). A difference becomes a dispute the planner resolves bin by bin.
// Pure: the month a count belongs to, when it is due, the comparison and the state of a dispute.
//
//   countMonthFor(today)                         → the month to count (the current calendar month)
//   countStanding(today, lastCountedMonth, grace)  → 'counted' | 'due' | 'overdue'
//   compareCount(expected, confirmed)            → what matched, what is missing, what was found unexpected
//   disputeStanding(lines)                       → 'open' while any bin is unresolved, else 'resolved'
import { monthOf, type LocalDate, type YearMonth } from '@/lib/calendar';

/** Days into the month by which the count should be in (common practice: the first week). */
export const DEFAULT_COUNT_GRACE_DAYS = 7;

export function countMonthFor(today: LocalDate): YearMonth {
  return monthOf(today);
}

export type CountStanding = 'counted' | 'due' | 'overdue';

/**
 * A site's count for this month: counted once a confirmation for the month exists; due from the 1st; overdue once
 * `graceDays` days of the month have passed (day graceDays + 1 onwards).
 */
export function countStanding(today: LocalDate, lastCountedMonth: YearMonth | null, graceDays = DEFAULT_COUNT_GRACE_DAYS): CountStanding {
  const month = countMonthFor(today);
  if (lastCountedMonth !== null && lastCountedMonth >= month) return 'counted';
  const day = Number(today.slice(8, 10));
  return day > graceDays ? 'overdue' : 'due';
}

export interface CountComparison {
  /** In the pool's list and confirmed by the customer. */
  matched: string[];
  /** In the pool's list, not confirmed: the customer does not see it at the site. */
  missing: string[];
  /** Confirmed (scanned) at the site, not in the pool's list there. */
  unexpected: string[];
  /** True when anything differs: the count becomes a dispute. */
  disputed: boolean;
}

/** Compares the pool's list for a site with what the customer confirmed (GRAIs; duplicates count once). */
export function compareCount(expected: readonly string[], confirmed: readonly string[]): CountComparison {
  const want = new Set(expected);
  const got = new Set(confirmed);
  const matched = [...want].filter((g) => got.has(g)).sort();
  const missing = [...want].filter((g) => !got.has(g)).sort();
  const unexpected = [...got].filter((g) => !want.has(g)).sort();
  return { matched, missing, unexpected, disputed: missing.length > 0 || unexpected.length > 0 };
}

/**
 * How the planner resolves one bin of a dispute:
 *   found — it is at the site after all (or was found there): the count stands as the pool had it;
 *   moved — it is somewhere else (another site of theirs, on the road, back at a depot): recorded where;
 *   lost  — nobody can find it: it is marked missing, and the lost-bin terms of the hire apply.
 */
export const RESOLUTIONS = ['found', 'moved', 'lost'] as const;
export type Resolution = (typeof RESOLUTIONS)[number];

export interface DisputeLine {
  grai: string;
  kind: 'missing' | 'unexpected';
  resolution: Resolution | null;
  movedTo?: string | null;
}

export type ResolutionCheck = { ok: true } | { ok: false; reason: string };

/** A resolution must fit the line: "moved" says where to; an unexpected bin cannot be "lost" (it was seen). */
export function checkResolution(line: Pick<DisputeLine, 'kind'>, resolution: Resolution, movedTo: string | null): ResolutionCheck {
  if (resolution === 'moved' && !movedTo) return { ok: false, reason: 'Say where the bin was moved to.' };
  if (resolution !== 'moved' && movedTo) return { ok: false, reason: 'Only a moved bin has a place it went to.' };
  if (line.kind === 'unexpected' && resolution === 'lost') return { ok: false, reason: 'The customer saw this bin at the site: it is not lost.' };
  return { ok: true };
}

export function disputeStanding(lines: readonly DisputeLine[]): 'open' | 'resolved' {
  return lines.some((l) => l.resolution === null) ? 'open' : 'resolved';
}

/** The dispute's outcome for the loss-control figures: how many bins were found, moved and lost. */
export function disputeOutcome(lines: readonly DisputeLine[]): Record<Resolution, number> & { open: number } {
  const out = { found: 0, moved: 0, lost: 0, open: 0 };
  for (const l of lines) {
    if (l.resolution === null) out.open += 1;
    else out[l.resolution] += 1;
  }
  return out;
}
