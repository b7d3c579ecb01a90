// Hold and recall of a liner lot (pure): which status change is allowed, whether a fit from a stopped lot
// is one the phone made before it could know, who a recall notice goes to, and the trace's rows as CSV.

export type LotStatus = 'released' | 'on_hold' | 'recalled';
export const LOT_STATUS_ACTIONS = ['hold', 'recall', 'release'] as const;
export type LotStatusAction = (typeof LOT_STATUS_ACTIONS)[number];

export const LOT_STATUS_WORDS: Record<LotStatus, string> = { released: 'released', on_hold: 'on hold', recalled: 'recalled' };

/**
 * The status a lot takes. A hold is a pause while something is checked: it may be released again or turned into a
 * recall. A recall is final — the lot's liners stay off the bins for good (what is left is scrapped by a count or a
 * scrap move).
 */
export function nextLotStatus(current: LotStatus, action: LotStatusAction): { ok: true; status: LotStatus } | { ok: false; reason: string } {
  if (action === 'hold') {
    return current === 'released' ? { ok: true, status: 'on_hold' } : { ok: false, reason: `The lot is already ${LOT_STATUS_WORDS[current]}.` };
  }
  if (action === 'recall') {
    return current === 'recalled' ? { ok: false, reason: 'The lot is already recalled.' } : { ok: true, status: 'recalled' };
  }
  if (current === 'on_hold') return { ok: true, status: 'released' };
  return { ok: false, reason: current === 'recalled' ? 'A recalled lot is not released again.' : 'The lot is not on hold.' };
}

/** A scan that reaches the server more than this after it happened waited on the phone (offline). */
export const QUEUED_AFTER_MS = 60_000;

/**
 * A fit from a lot on hold or recalled that already happened before the phone could know: it is recorded and
 * flagged, not refused (refusing would lose the only record of that liner). The phone knew the lot list as of
 * the fit itself, or — for a scan that waited in its queue — as of the depot snapshot it was working from
 * (`lotsAsOf`), when that is earlier. A lot stopped with no date known refuses every fit.
 */
export function fitBeforeStopKnown(i: { statusChangedAt: Date | null; occurredAt: Date; receivedAt: Date; lotsAsOf?: Date | null }): boolean {
  if (!i.statusChangedAt) return false;
  const waited = i.receivedAt.getTime() - i.occurredAt.getTime() > QUEUED_AFTER_MS;
  const knownAt = waited && i.lotsAsOf && i.lotsAsOf.getTime() < i.occurredAt.getTime() ? i.lotsAsOf : i.occurredAt;
  return knownAt.getTime() < i.statusChangedAt.getTime();
}

/** The flag a fit from a stopped lot carries, for the planner's review. */
export const FIT_FROM_STOPPED_LOT = 'fit_from_stopped_lot';

export interface NoticeContact {
  organisationId: number;
  organisationName: string;
  /** The organisation's contact address and its people's (portal admins first), any may be null. */
  addresses: Array<string | null>;
  uses: number;
}

/** Who a notice goes to: each customer's distinct addresses (lower case), customers without one listed apart. */
export function noticeRecipients(contacts: NoticeContact[]): {
  to: Array<{ organisationId: number; organisationName: string; email: string; uses: number }>;
  unreachable: Array<{ organisationId: number; organisationName: string }>;
} {
  const to: Array<{ organisationId: number; organisationName: string; email: string; uses: number }> = [];
  const unreachable: Array<{ organisationId: number; organisationName: string }> = [];
  const seen = new Set<string>();
  for (const c of contacts) {
    const mine = [...new Set(c.addresses.filter((a): a is string => !!a && a.includes('@')).map((a) => a.trim().toLowerCase()))].filter((a) => !seen.has(a));
    if (!mine.length) unreachable.push({ organisationId: c.organisationId, organisationName: c.organisationName });
    for (const email of mine) {
      seen.add(email);
      to.push({ organisationId: c.organisationId, organisationName: c.organisationName, email, uses: c.uses });
    }
  }
  return { to, unreachable };
}

export type TraceUseKind = 'trip' | 'lined' | 'kit';
export const TRACE_USE_WORDS: Record<TraceUseKind, string> = { trip: 'trip', lined: 'lined, not dispatched', kit: 'kit sent' };
