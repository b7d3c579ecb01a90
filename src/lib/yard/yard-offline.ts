// The yard's offline picture: the depot snapshot a phone keeps (bins here and
// bins expected here, usable liner lots, open orders), and what the bins will
// look like once the scans waiting on the phone are recorded. The same rule
// table the server uses (lifecycle.ts) decides which actions to offer, so an
// offline screen offers what the server will accept, as far as the phone
// knows. Pure: no I/O, no clock (callers pass `today`).
import { allowedActions, decide, type Action, type BinState, type Leg, type SiteKind, type Status } from '@/lib/scans/lifecycle';
import type { Role } from '@/lib/permissions';
import type { ScanEventBody } from '@/lib/scans/scan-schema';
import type { Identified } from '@/lib/bins/bin-identify';

export interface SnapshotBin {
  id: number;
  grai: string;
  serial: string;
  binTypeId: number;
  binType: string;
  status: Status;
  siteId: number | null;
  siteKind: SiteKind | null;
  leg: Leg | null;
  prepChecked: boolean;
  linerLotId: number | null;
  filled: boolean;
  tripOpen: boolean;
  nextDue: string | null;
  version: number;
  /** At the depot now, or on its way back to it (on hire, waiting for collection, on the road home). */
  where: 'here' | 'expected';
}

export interface SnapshotLot {
  id: number;
  lotNumber: string;
  supplier: string;
  expiryDate: string;
  onHand: number;
}
export interface SnapshotOrder {
  id: number;
  reference: string;
  customer: string;
  neededBy: string;
  quantity: number;
  loaded: number;
  binTypeId: number;
}

export interface DepotSnapshot {
  depot: { id: number; name: string; kind: SiteKind };
  generatedAt: string;
  today: string;
  timeZone: string;
  bins: SnapshotBin[];
  lots: SnapshotLot[];
  orders: SnapshotOrder[];
}

/** The parts of a queued scan that say what it does to which bin. */
export type PendingScan = Pick<ScanEventBody, 'assetId' | 'grai' | 'action' | 'prepResult' | 'linerLotId' | 'purpose' | 'siteId'>;

export interface ActingContext {
  role: Role;
  today: string;
  site: { id: number; kind: SiteKind } | null;
}

export function findInSnapshot(snapshot: DepotSnapshot, id: Identified): SnapshotBin | null {
  if (id.grai) return snapshot.bins.find((b) => b.grai === id.grai) ?? null;
  const serial = id.serial?.trim().toUpperCase();
  if (!serial) return null;
  const matches = snapshot.bins.filter((b) => b.serial.toUpperCase() === serial);
  return matches.length === 1 ? matches[0]! : null;
}

export function binStateOf(b: SnapshotBin): BinState {
  return {
    status: b.status,
    siteId: b.siteId === null ? null : String(b.siteId),
    siteKind: b.siteKind,
    leg: b.leg,
    prepChecked: b.prepChecked,
    linerLotId: b.linerLotId === null ? null : String(b.linerLotId),
    filled: b.filled,
    tripOpen: b.tripOpen,
    nextDue: b.nextDue,
  };
}

function withState(b: SnapshotBin, s: BinState): SnapshotBin {
  return {
    ...b,
    status: s.status ?? b.status,
    siteId: s.siteId === null ? null : Number(s.siteId),
    siteKind: s.siteKind,
    leg: s.leg,
    prepChecked: s.prepChecked,
    linerLotId: s.linerLotId === null ? null : Number(s.linerLotId),
    filled: s.filled,
    tripOpen: s.tripOpen,
  };
}

export function targets(scan: PendingScan, b: SnapshotBin): boolean {
  return scan.assetId !== undefined ? scan.assetId === b.id : scan.grai === b.grai;
}

export interface Projection {
  bin: SnapshotBin;
  /** Waiting scans on this bin that the phone could replay through the rule table. */
  applied: number;
  /** The first waiting scan the rule table would refuse from the predicted state (the server will likely refuse it too). */
  blocked: { action: Action; reason: string } | null;
}

/** The bin as it will be once the waiting scans (in queue order) are recorded. */
export function projectBin(bin: SnapshotBin, pending: readonly PendingScan[], ctx: ActingContext): Projection {
  let state = binStateOf(bin);
  let applied = 0;
  for (const scan of pending) {
    if (!targets(scan, bin)) continue;
    const site = scan.siteId === undefined ? ctx.site : scan.siteId === ctx.site?.id ? ctx.site : null;
    const d = decide(state, scan.action, {
      role: ctx.role,
      today: ctx.today,
      siteId: site ? String(site.id) : null,
      siteKind: site?.kind ?? null,
      prepResult: scan.prepResult,
      linerLotId: scan.linerLotId === undefined ? undefined : String(scan.linerLotId),
      purpose: scan.purpose,
    });
    if (!d.ok) return { bin: withState(bin, state), applied, blocked: { action: scan.action, reason: d.reason } };
    state = { ...state, ...d.patch };
    applied += 1;
  }
  return { bin: withState(bin, state), applied, blocked: null };
}

/** The buttons an offline bin card shows: exactly what the rule table allows from the predicted state. */
export function offlineActions(bin: SnapshotBin, ctx: ActingContext): Action[] {
  return allowedActions(binStateOf(bin), {
    role: ctx.role,
    today: ctx.today,
    siteId: ctx.site ? String(ctx.site.id) : null,
    siteKind: ctx.site?.kind ?? null,
  });
}

/**
 * Today's date (YYYY-MM-DD) in the operator's time zone, through Intl only: calendar.ts's localDate() gives the
 * same answer (unit-tested against luxon) but would bring luxon into every yard page's JavaScript.
 */
export function todayIn(timeZone: string, at: Date): string {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')}`;
}
