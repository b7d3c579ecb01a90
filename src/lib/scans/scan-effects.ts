// What an allowed scan writes, once the rule table (decide() in src/lib/lifecycle.ts) has said yes:
// the log rows (inferred steps first, then the scan), the trip it opens or the trip columns it
// changes, and the bin's new current-state columns. Pure: the scan service applies these with SQL
// inside its transaction; the demo generator applies them to its in-memory pool and writes the
// result in bulk. One place, so both write the same thing.
import { INFERRED_STATUS, type Action, type BinState, type Decision, type Leg, type Schedule, type SiteKind, type Status } from './lifecycle';
import { sealsMatch } from '@/lib/trips/seal-check';

export type Allowed = Extract<Decision, { ok: true }>;

export interface FillRecord {
  product: string;
  volumeL?: number | null;
  massKg?: number | null;
  temperatureC?: number | null;
  seals: string[];
}

/** The inputs of a scan that reach the log's payload (a subset of the scan service's ScanInput). */
export interface ScanFacts {
  action: Action;
  prepResult?: 'pass' | 'fail';
  checklist?: Record<string, boolean>;
  faults?: string;
  photoIds?: number[];
  linerLotId?: number;
  purpose?: 'hire' | 'transfer';
  hireOrderId?: number;
  loadId?: number;
  runId?: number;
  fill?: FillRecord;
  sealsVerified?: string[];
  note?: string;
  /** inspect only: what the record says, in brief (the full record is in `inspections`). */
  inspection?: { kind: string; outcome: string; leakTest: { pressureKpa: number; minutes: number; passed: boolean } | null };
}

/** The bin's current-state columns the scan service reads and writes. */
export interface AssetSnapshot {
  status: Status;
  siteId: number | null;
  siteSince: Date | null;
  customerId: number | null;
  currentTripId: number | null;
  leg: Leg | null;
  prepChecked: boolean;
  linerLotId: number | null;
  filled: boolean;
  tripCount: number;
  lastScanAt: Date | null;
}

export interface ScanSite {
  id: number;
  kind: SiteKind;
  organisationId: number;
}

const PAYLOAD_KEYS = [
  'prepResult',
  'checklist',
  'faults',
  'photoIds',
  'linerLotId',
  'purpose',
  'hireOrderId',
  'loadId',
  'runId',
  'fill',
  'sealsVerified',
  'note',
  'inspection',
] as const;

/** The scan's own log entry payload: the decided patch and trip effect (what replayState() folds), and the inputs. */
function eventPayload(input: ScanFacts, d: Allowed, flags: string[]): Record<string, unknown> {
  const payload: Record<string, unknown> = { patch: d.patch, trip: d.trip };
  if (d.inferred.length) payload.inferred = d.inferred;
  if (flags.length) payload.flags = flags;
  for (const key of PAYLOAD_KEYS) {
    if (input[key] !== undefined) payload[key] = input[key];
  }
  return payload;
}

export interface LogRow {
  action: Action;
  occurredAt: Date;
  clientEventId: string | null;
  statusFrom: Status | null;
  statusTo: Status;
  inferred: boolean;
  flagged: boolean;
  payload: Record<string, unknown>;
}

/**
 * The log rows of one scan: each inferred step a millisecond apart just before the scan (so the
 * timeline reads in order), flagged for a planner, then the scan itself.
 */
export function logRows(
  input: ScanFacts & { clientEventId: string },
  occurredAt: Date,
  from: Status | null,
  d: Allowed,
  flags: string[],
  named: Record<string, unknown>,
): LogRow[] {
  const rows: LogRow[] = d.inferred.map((step, i) => ({
    action: step,
    occurredAt: new Date(occurredAt.getTime() - d.inferred.length + i),
    clientEventId: null,
    statusFrom: null,
    statusTo: INFERRED_STATUS[step],
    inferred: true,
    flagged: true,
    payload: { inferredBy: input.clientEventId },
  }));
  rows.push({
    action: input.action,
    occurredAt,
    clientEventId: input.clientEventId,
    statusFrom: from,
    statusTo: d.to,
    inferred: false,
    flagged: flags.length > 0,
    payload: { ...eventPayload(input, d, flags), ...named },
  });
  return rows;
}

export interface TripOpening {
  customerId: number | null; // null: no hire order and not at a customer site, which the service refuses
  depotSiteId: number;
  customerSiteId: number | null;
  linerLotId: number | null;
  dispatchedAt: Date;
  deliveredAt: Date | null;
  hireOrderId: number | null;
  loadId: number | null;
}

/** The trip a scan opens (a dispatch on hire, or a delivery nobody saw leave). */
export function tripOpening(
  asset: Pick<AssetSnapshot, 'siteId' | 'linerLotId'>,
  input: ScanFacts,
  site: ScanSite | null,
  order: { id: number; customerId: number; depotSiteId: number; deliverySiteId: number } | null,
  at: Date,
): TripOpening {
  return {
    customerId: order?.customerId ?? (site?.kind === 'customer' ? site.organisationId : null),
    depotSiteId: asset.siteId ?? order?.depotSiteId ?? site!.id,
    customerSiteId: site?.kind === 'customer' ? site.id : (order?.deliverySiteId ?? null),
    linerLotId: asset.linerLotId,
    dispatchedAt: at,
    deliveredAt: input.action === 'deliver' ? at : null,
    hireOrderId: order?.id ?? null,
    loadId: input.loadId ?? null,
  };
}

/** Trip columns (SQL names) a scan on an open trip sets, and any flag it raises (a seal mismatch). */
export function tripChanges(
  input: ScanFacts,
  d: Allowed,
  site: ScanSite | null,
  sealsApplied: readonly string[],
  at: Date,
): { set: Record<string, unknown>; close: boolean; flags: string[] } {
  const set: Record<string, unknown> = {};
  const flags: string[] = [];
  switch (input.action) {
    case 'deliver':
      set.delivered_at = at;
      if (site) set.customer_site_id = site.id;
      break;
    case 'fill_seal': {
      const f = input.fill!;
      if (d.inferred.includes('deliver') && site) set.customer_site_id = site.id;
      set.filled_at = at;
      set.fill_product = f.product;
      set.fill_volume_l = f.volumeL ?? null;
      set.fill_mass_kg = f.massKg ?? null;
      set.fill_temperature_c = f.temperatureC ?? null;
      set.seals_applied = f.seals;
      break;
    }
    case 'discharge': {
      const verified = input.sealsVerified ?? [];
      set.discharged_at = at;
      if (site) set.discharge_site_id = site.id;
      set.seals_verified = verified;
      if (verified.length > 0 && !sealsMatch(sealsApplied, verified)) {
        set.seal_mismatch = true;
        flags.push('seal_mismatch');
      }
      break;
    }
    case 'collect':
      set.collected_at = at;
      break;
    default:
      break;
  }
  const close = d.trip === 'close';
  if (close) {
    set.returned_at = at;
    set.closing_site_id = site?.id ?? null;
  }
  return { set, close, flags };
}

/**
 * The bin's columns after the scan: the decided patch, the trip it now belongs to, the trip count,
 * and the later of the last scan and this one (offline scans arrive out of order).
 */
export function assetAfter(asset: AssetSnapshot, d: Allowed, opened: { tripId: number; customerId: number } | null, at: Date): AssetSnapshot {
  const p: Partial<BinState> = d.patch;
  const siteId = 'siteId' in p ? (p.siteId == null ? null : Number(p.siteId)) : asset.siteId;
  let { currentTripId, customerId, tripCount } = asset;
  if (d.trip === 'open' && opened) {
    currentTripId = opened.tripId;
    customerId = opened.customerId;
  }
  if (d.trip === 'close') {
    currentTripId = null;
    customerId = null;
    tripCount += 1;
  }
  return {
    status: p.status ?? asset.status,
    siteId,
    siteSince: siteId !== asset.siteId || asset.siteSince === null ? at : asset.siteSince,
    leg: 'leg' in p ? (p.leg ?? null) : asset.leg,
    prepChecked: 'prepChecked' in p ? Boolean(p.prepChecked) : asset.prepChecked,
    linerLotId: 'linerLotId' in p ? (p.linerLotId == null ? null : Number(p.linerLotId)) : asset.linerLotId,
    filled: 'filled' in p ? Boolean(p.filled) : asset.filled,
    currentTripId,
    customerId,
    tripCount,
    lastScanAt: asset.lastScanAt && asset.lastScanAt > at ? asset.lastScanAt : at,
  };
}

/** The test columns a passed inspection sets (SQL names), or null when the scan leaves them alone. */
export function scheduleColumns(d: Allowed): Record<string, string | null> | null {
  const s: Schedule | null | undefined = d.patch.schedule;
  if (!s) return null;
  return {
    last_inspection_on: s.lastInspectionOn,
    last_leak_test_on: s.lastLeakTestOn,
    last_full_inspection_on: s.lastFullInspectionOn,
    next_intermediate_due: s.nextIntermediateDue,
    next_full_due: s.nextFullDue,
    next_due: s.nextDue,
  };
}

/** The rule table's view of a bin (decide()'s first argument). */
export function binState(asset: AssetSnapshot, siteKind: SiteKind | null, nextDue: string | null): BinState {
  return {
    status: asset.status,
    siteId: asset.siteId === null ? null : String(asset.siteId),
    siteKind,
    leg: asset.leg,
    prepChecked: asset.prepChecked,
    linerLotId: asset.linerLotId === null ? null : String(asset.linerLotId),
    filled: asset.filled,
    tripOpen: asset.currentTripId !== null,
    nextDue,
  };
}
