// Re-deriving a bin's current state from its scan log. Each recorded scan
// carries the patch the rule table decided and its trip effect, so folding the
// non-voided scans in order gives back the state; inferred entries carry no
// patch of their own (their effect is part of the scan that implied them).
import type { BinState, Leg, Schedule, Status, TripEffect } from './lifecycle';

export interface LoggedEvent {
  occurredAt: string | Date;
  inferred: boolean;
  voided: boolean;
  payload: { patch?: Partial<BinState>; trip?: TripEffect } | null;
}

export interface DerivedState {
  status: Status | null;
  siteId: number | null;
  leg: Leg | null;
  prepChecked: boolean;
  linerLotId: number | null;
  filled: boolean;
  tripOpen: boolean;
  tripCount: number;
  siteSince: Date | null;
  /** The test months and due dates the last passed inspection in the log set; null: as registered. */
  schedule: Schedule | null;
}

const toId = (v: string | null | undefined) => (v == null ? null : Number(v));

export function replayState(events: readonly LoggedEvent[]): DerivedState {
  const s: DerivedState = {
    status: null,
    siteId: null,
    leg: null,
    prepChecked: false,
    linerLotId: null,
    filled: false,
    tripOpen: false,
    tripCount: 0,
    siteSince: null,
    schedule: null,
  };
  for (const e of events) {
    if (e.voided || e.inferred || !e.payload?.patch) continue;
    const p = e.payload.patch;
    const siteBefore = s.siteId;
    if (p.status) s.status = p.status;
    if ('siteId' in p) s.siteId = toId(p.siteId);
    if ('leg' in p) s.leg = p.leg ?? null;
    if ('prepChecked' in p) s.prepChecked = Boolean(p.prepChecked);
    if ('linerLotId' in p) s.linerLotId = toId(p.linerLotId);
    if ('filled' in p) s.filled = Boolean(p.filled);
    if (p.schedule) s.schedule = p.schedule;
    if (s.siteId !== siteBefore || s.siteSince === null) s.siteSince = new Date(e.occurredAt);
    if (e.payload.trip === 'open') s.tripOpen = true;
    if (e.payload.trip === 'close') {
      s.tripOpen = false;
      s.tripCount += 1;
    }
  }
  return s;
}
