/**
 * The liner stock ledger's rules: pure, no I/O. Every change of a depot's liner stock is a move; on hand
 * per lot and depot is the sum of its moves (see migrations/20261223000100-liner-ledger.cjs for the
 * table and its checks). The scan service and the demo generator both take a scan's moves from
 * `movesForScan()`, so the live pool and the demo history write the same ledger.
 */
import type { AssetSnapshot } from '@/lib/scans/scan-effects';
import type { Action } from '@/lib/scans/lifecycle';

export const MOVE_KINDS = ['receipt', 'sent', 'arrived', 'fitted', 'kit_sent', 'scrapped', 'counted', 'fitted_discarded', 'reversal'] as const;
export type MoveKind = (typeof MOVE_KINDS)[number];

export const MOVE_LABEL: Record<MoveKind, string> = {
  receipt: 'Received',
  sent: 'Sent to another depot',
  arrived: 'Arrived from another depot',
  fitted: 'Fitted in a bin',
  kit_sent: 'Kit sent with folded bins',
  scrapped: 'Scrapped from the shelf',
  counted: 'Stock count',
  fitted_discarded: 'Fitted liner discarded unused',
  reversal: 'Reversed (scan voided)',
};

/** A move as the services and the demo generator write it (SQL column names less id and created_at). */
export interface MoveDraft {
  lot_id: number;
  site_id: number;
  kind: MoveKind;
  quantity: number;
  occurred_at: Date;
  user_id?: number | null;
  asset_id?: number | null;
  scan_event_id?: number | null;
  hire_order_id?: number | null;
  folded_bins?: number | null;
  to_site_id?: number | null;
  sent_move_id?: number | null;
  reverses_move_id?: number | null;
  counted?: number | null;
  expected?: number | null;
  reason?: string | null;
}

/** Why a fitted liner came out unused, by the scan that took it out (the bin had no trip: it never left). */
const DISCARD_REASON: Partial<Record<Action, string>> = {
  fold: 'Taken out when the lined bin was folded at the depot; an opened liner does not go back on the shelf.',
  quarantine: 'The lined bin went to quarantine; its liner is discarded.',
  prep_check: 'The bin failed a check with the liner fitted; its liner is discarded.',
  receive: 'The bin arrived lined from elsewhere; bins are relined on arrival.',
  retire: 'The bin was retired with a liner fitted.',
  mark_missing: 'The bin went missing with a liner fitted.',
};

/**
 * The moves one allowed scan writes, from the bin before and after it: a fit takes one liner of the lot
 * off the depot's shelf; a scan that takes a fitted liner out of a bin that never left on a trip (folded
 * at the depot, quarantined, a failed check) records it as discarded — by rule it is not put back: an
 * opened single-use liner is not restocked (common practice for food-contact liners; the same rule is
 * kept for all grades so the ledger has one rule). A liner that left on a trip was used there, filled or
 * not; its fit already counted it. A voided fit is the other way a fitted liner ends: its fit is
 * reversed (`reversalOf`), which puts the liner back — the fit never happened.
 */
export function movesForScan(a: {
  action: Action;
  before: Pick<AssetSnapshot, 'linerLotId' | 'currentTripId' | 'siteId' | 'filled'>;
  after: Pick<AssetSnapshot, 'linerLotId'>;
  assetId: number;
  siteId: number | null;
  userId: number | null;
  occurredAt: Date;
}): MoveDraft[] {
  const common = { asset_id: a.assetId, user_id: a.userId, occurred_at: a.occurredAt };
  if (a.action === 'fit_liner' && a.after.linerLotId !== null && a.before.linerLotId === null) {
    const site = a.siteId ?? a.before.siteId;
    if (site === null) throw new RangeError('a fit happens at a depot');
    return [{ ...common, lot_id: a.after.linerLotId, site_id: site, kind: 'fitted', quantity: -1 }];
  }
  if (a.before.linerLotId !== null && a.after.linerLotId === null && a.before.currentTripId === null && !a.before.filled) {
    const site = a.before.siteId ?? a.siteId;
    if (site === null) return [];
    const reason = DISCARD_REASON[a.action] ?? 'The liner came out of the bin unused.';
    return [{ ...common, lot_id: a.before.linerLotId, site_id: site, kind: 'fitted_discarded', quantity: 0, reason }];
  }
  return [];
}

/** The move that undoes another (a voided scan's): same lot and depot, the opposite quantity. */
export function reversalOf(
  m: { id: number; lot_id: number; site_id: number; quantity: number; asset_id: number | null },
  at: Date,
  userId: number | null,
  reason: string,
): MoveDraft {
  return { lot_id: m.lot_id, site_id: m.site_id, kind: 'reversal', quantity: -m.quantity, occurred_at: at, user_id: userId, asset_id: m.asset_id, reverses_move_id: m.id, reason };
}

/** Why taking `wanted` liners of a lot from a depot holding `onHand` is refused, or null when it is not. */
export function shortOfStock(lotNumber: string, onHand: number, wanted: number): string | null {
  if (!Number.isInteger(wanted) || wanted < 1) return 'Give a whole number of liners, at least 1.';
  if (onHand >= wanted) return null;
  if (onHand <= 0) return `No liners of lot ${lotNumber} are left at this depot; take a liner from another lot.`;
  return `Only ${onHand} liner${onHand === 1 ? '' : 's'} of lot ${lotNumber} ${onHand === 1 ? 'is' : 'are'} left at this depot; ${wanted} asked for.`;
}

/** A stock count of one lot: the adjustment that brings the ledger to what was counted. */
export function countAdjustment(counted: number, expected: number): { quantity: number; counted: number; expected: number } {
  if (!Number.isInteger(counted) || counted < 0) throw new RangeError('A count is a whole number of liners, 0 or more.');
  return { quantity: counted - expected, counted, expected };
}

/** On hand per `lot:site` after applying moves to a running balance (the demo generator's ledger). */
export class LedgerBalance {
  private readonly sums = new Map<string, number>();
  onHand(lotId: number, siteId: number): number {
    return this.sums.get(`${lotId}:${siteId}`) ?? 0;
  }
  apply(m: Pick<MoveDraft, 'lot_id' | 'site_id' | 'quantity'>): void {
    const key = `${m.lot_id}:${m.site_id}`;
    const next = (this.sums.get(key) ?? 0) + m.quantity;
    if (next < 0) throw new RangeError(`liner stock of lot ${m.lot_id} at site ${m.site_id} would be ${next}`);
    this.sums.set(key, next);
  }
}
