// Recording a scan: the one path by which a bin's state changes.
//
// Inside one transaction: claim the client event id (idempotency), read the
// bin, let the pure rule table decide (src/lib/scans/lifecycle.ts), write any
// inferred steps and the event itself to the append-only log, update the trip
// and the bin's current-state columns (optimistic locking on `version`), and
// store the answer under the client event id so a replay returns it again.
// A refusal rolls everything back: it leaves no trace.
import { reachableBins, siteLimited } from '@/lib/customer-scope.server';
import { OptimisticLockError, QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { decide, checkLinerLot, type Action, type Decision, type InspectionResult, type Leg, type SiteKind, type Status } from './lifecycle';
import {
  assetAfter,
  binState,
  logRows,
  scheduleColumns,
  tripChanges,
  tripOpening,
  type AssetSnapshot,
  type FillRecord,
  type ScanFacts,
  type ScanSite,
} from '@/lib/scans/scan-effects';
import { localDate } from '@/lib/calendar';
import { getSettings, type OperatorSettings } from '@/lib/settings/settings.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { countsAsDemand, type OrderStatus } from '@/lib/planning/order-status';
import { syncOrderStatus } from '@/lib/planning/orders.server';
import { afterRunReceive, checkRunReceive } from '@/lib/planning/truck-runs.server';
import { claimRepositioning, syncRepositioningOrder } from '@/lib/planning/repositioning-execution.server';
import { movesForScan } from '@/lib/liners/liner-moves';
import { insertMoves, takeFromLot, lockLot } from '@/lib/liners/liner-ledger.server';
import { specFitFor } from '@/lib/liners/liner-specs.server';
import { FIT_FROM_STOPPED_LOT, fitBeforeStopKnown } from '@/lib/liners/liner-recall';
import { dispatchLapseCheck } from '@/lib/inspections/dispatch-check.server';
import { overrideAccepted } from '@/lib/inspections/dispatch-check';
import { repairEffectsOfScan } from '@/lib/inspections/repair-hooks.server';
import { serviceLifeEnd } from '@/lib/inspections/service-life';

export type { FillRecord };

export interface ScanInput {
  clientEventId: string;
  assetId: number;
  action: Action;
  /** When it happened on the device (offline scans arrive later); defaults to now. */
  occurredAt?: Date;
  /** Where it happened; yard scans default to the user's home depot. */
  siteId?: number | null;
  /** The version of the bin the user was looking at; a mismatch is "changed meanwhile". */
  expectedVersion?: number;
  prepResult?: 'pass' | 'fail';
  checklist?: Record<string, boolean>;
  faults?: string;
  photoIds?: number[];
  linerLotId?: number;
  /**
   * fit_liner from a phone's queue: when the phone last learned the lot list (its depot snapshot). A fit from a
   * lot stopped after that, sent late, already happened: it is recorded and flagged (liner-recall.ts).
   */
  lotsAsOf?: Date;
  purpose?: 'hire' | 'transfer';
  hireOrderId?: number;
  /** The load (truck) a dispatched bin goes out on. */
  loadId?: number;
  /** receive only: the confirmed truck run that brought the bin back (planning/truck-runs.server.ts). */
  runId?: number;
  fill?: FillRecord;
  sealsVerified?: string[];
  note?: string;
  /** inspect only: the record in brief, kept in the log's payload. */
  inspection?: ScanFacts['inspection'];
  /** inspect only: the outcome and the schedule it sets, for the rule table (src/lib/inspections/inspection-records.server.ts). */
  inspectionResult?: InspectionResult;
  /**
   * dispatch on hire only: a planner's reason to send a bin whose test would run out while it is likely still
   * out (the operator's margin). Never releases a bin whose test runs out before the order's wanted date.
   */
  overrideReason?: string;
}

export interface ScanOutcome {
  clientEventId: string;
  replayed: boolean;
  eventId: number;
  assetId: number;
  grai: string;
  action: Action;
  statusFrom: string | null;
  statusTo: string;
  inferred: Action[];
  flags: string[];
  tripId: number | null;
  version: number;
}

/** Who is scanning (a SessionUser, or the demo generator acting as one). */
export type Actor = Omit<Pick<SessionUser, 'id' | 'role' | 'organisationId' | 'homeSiteId' | 'siteIds'>, 'id'> & {
  /** null when nobody signed in: the receiving end confirming a delivery through its link. */
  id: number | null;
};

interface Options {
  now?: Date;
  transaction?: Transaction;
}

const MAX_FUTURE_MS = 5 * 60_000;

export async function recordScan(actor: Actor, input: ScanInput, opts: Options = {}): Promise<ScanOutcome> {
  const now = opts.now ?? new Date();
  const occurredAt = input.occurredAt ?? now;
  if (occurredAt.getTime() > now.getTime() + MAX_FUTURE_MS) {
    throw new AppError('validation_failed', 'The scan time is in the future; check the phone clock.');
  }
  // Settings are read before the transaction: a read inside it would wait for a second pool
  // connection while holding one, and with every connection held that way no scan ever finishes.
  const settings = await getSettings();
  const run = (t: Transaction) => recordInTransaction(actor, input, occurredAt, settings, t, now);
  try {
    return await (opts.transaction ? sequelize.transaction({ transaction: opts.transaction }, run) : sequelize.transaction(run));
  } catch (err) {
    if (err instanceof OptimisticLockError) throw changedMeanwhile();
    throw err;
  }
}

function changedMeanwhile() {
  return new AppError('changed_meanwhile', 'Someone recorded something on this bin meanwhile. Look at its page again, then repeat the action if it still applies.');
}

// The hot path (yard scans, offline batches, the demo generator) is plain SQL:
// a handful of statements per scan, no model instances to build.
interface AssetRow {
  id: number;
  grai: string;
  bin_type_id: number;
  status: Status;
  site_id: number | null;
  site_kind: SiteKind | null;
  customer_id: number | null;
  current_trip_id: number | null;
  leg: Leg | null;
  prep_checked: boolean;
  liner_lot_id: number | null;
  filled: boolean;
  trip_count: number;
  next_due: string | null;
  last_scan_at: Date | null;
  version: number;
  next_intermediate_due: string | null;
  next_full_due: string | null;
  intermediate_months: number;
  full_months: number;
  service_life_applies: boolean;
  service_life_years: number;
  inner_made_month: string | null;
}
interface SiteRow {
  id: number;
  kind: SiteKind;
  organisation_id: number;
  active: boolean;
}
interface TripRow {
  id: number;
  customer_id: number;
  seals_applied: string[];
  delivered_at: Date | null;
}

async function one<T extends object>(sql: string, bind: unknown[], t: Transaction): Promise<T | undefined> {
  const rows = await sequelize.query<T>(sql, { bind, transaction: t, type: QueryTypes.SELECT });
  return rows[0];
}

async function recordInTransaction(actor: Actor, input: ScanInput, occurredAt: Date, settings: OperatorSettings, t: Transaction, now: Date): Promise<ScanOutcome> {
  // 1. Claim the client event id first: a concurrent replay waits here and then sees the claim.
  const claimed = await one(
    `INSERT INTO scan_event_keys (client_event_id, user_id, outcome) VALUES ($1, $2, '{}'::jsonb)
     ON CONFLICT (client_event_id) DO NOTHING RETURNING client_event_id`,
    [input.clientEventId, actor.id],
    t,
  );
  if (!claimed) return replay(actor, input.clientEventId, t);

  // 2. The bin and where the scan happens.
  const asset = await one<AssetRow>(
    `SELECT a.id, a.grai, a.bin_type_id, a.status, a.site_id, s.kind AS site_kind, a.customer_id, a.current_trip_id, a.leg,
            a.prep_checked, a.liner_lot_id, a.filled, a.trip_count, a.next_due, a.last_scan_at, a.version,
            a.next_intermediate_due, a.next_full_due, bt.intermediate_months, bt.full_months,
            bt.service_life_applies, bt.service_life_years, a.inner_made_month::text
       FROM assets a JOIN bin_types bt ON bt.id = a.bin_type_id LEFT JOIN sites s ON s.id = a.site_id WHERE a.id = $1`,
    [input.assetId],
    t,
  );
  if (!asset) throw new AppError('not_found', 'No bin with that identity is registered.');
  if (actor.role === 'customer' && asset.customer_id !== actor.organisationId) {
    throw new AppError('not_found', 'No bin with that identity is on hire to your organisation.');
  }
  if (siteLimited(actor) && !(await reachableBins(actor, [asset.id])).has(asset.id)) {
    throw new AppError('not_found', 'No bin with that identity is at one of your sites.');
  }
  if (input.expectedVersion !== undefined && input.expectedVersion !== asset.version) throw changedMeanwhile();
  const site = await scanSite(actor, input, t);
  const today = localDate(occurredAt, settings.timeZone);

  // 3. The rule table decides.
  const snapshot = snapshotOf(asset);
  const state = {
    ...binState(snapshot, asset.site_kind, asset.next_due),
    // Which test is due, so a lapse refusal names the right one.
    inspection:
      asset.next_intermediate_due && asset.next_full_due
        ? { intermediateDue: asset.next_intermediate_due, fullDue: asset.next_full_due, intermediateMonths: asset.intermediate_months, fullMonths: asset.full_months }
        : null,
  };
  const decision = decide(state, input.action, {
    role: actor.role,
    today,
    siteId: site ? String(site.id) : null,
    siteKind: site ? site.kind : null,
    prepResult: input.prepResult,
    linerLotId: input.linerLotId === undefined ? undefined : String(input.linerLotId),
    purpose: input.purpose,
    inspection: input.inspectionResult,
  });
  if (!decision.ok) throw refusal(decision);
  refuseAfterServiceLife(asset, input.action, today);
  const { order, lotNumber, flags: inputFlags } = await checkActionInputs(actor, asset, input, site, today, t, { occurredAt, receivedAt: now });
  const runFacts = input.runId !== undefined ? await checkRunReceive(input.runId, input.action, site?.id ?? null, asset, t) : null;
  // A transfer dispatch on a load between two depots carries out the oldest open repositioning order of its lane.
  const repositioning = input.action === 'dispatch' && input.purpose === 'transfer' && input.loadId ? await claimRepositioning(input.loadId, asset.id, t) : null;
  const override =
    order && input.action === 'dispatch' && (input.purpose ?? 'hire') === 'hire'
      ? await checkLapseBeforeDispatch(actor, asset.id, order, input, today, settings.timeZone, t)
      : null;

  // 4. Trip, then the log: inferred steps first (flagged for a planner), then the scan itself.
  const flags = [...decision.flags, ...inputFlags, ...(override ? ['lapse_margin_overridden'] : [])];
  const trip = await applyTrip(asset, decision, input, site, order, occurredAt, t, flags);
  // The order follows its bins: the first one loaded makes it loading, the last one dispatched makes it dispatched.
  if (input.action === 'dispatch' && order) await syncOrderStatus(order.id, t);
  const opened = typeof trip === 'object' ? trip : null;
  const eventTripId = (opened ? opened.tripId : (trip as number | null)) ?? asset.current_trip_id;
  const named = {
    ...(lotNumber ? { lotNumber } : {}),
    ...(order ? { orderRef: order.reference } : {}),
    ...(override ? { override } : {}),
    ...(runFacts ?? {}),
    ...(repositioning ?? {}),
  };
  const rows = logRows(input, occurredAt, asset.status, decision, flags, named).map((r) => [
    r.action,
    r.occurredAt,
    r.clientEventId,
    r.statusFrom,
    r.statusTo,
    r.inferred,
    r.flagged,
    JSON.stringify(r.payload),
  ]);
  const bind: unknown[] = [asset.id, site?.id ?? null, actor.id, eventTripId];
  const values = rows.map((r) => {
    const base = bind.length;
    bind.push(...r);
    return `($1, $${base + 1}, $${base + 2}, $2, $3, $${base + 3}, $${base + 4}, $${base + 5}, $4, $${base + 6}, $${base + 7}, $${base + 8}::jsonb)`;
  });
  const inserted = await sequelize.query<{ id: number }>(
    `INSERT INTO scan_events (asset_id, action, occurred_at, site_id, user_id, client_event_id, status_from, status_to, trip_id, inferred, flagged, payload)
     VALUES ${values.join(', ')} RETURNING id`,
    { bind, transaction: t, type: QueryTypes.SELECT },
  );
  const eventId = inserted[inserted.length - 1]!.id;
  // A run received in full is done (its requests collected).
  if (runFacts) await afterRunReceive(input.runId!, t);
  if (repositioning) await syncRepositioningOrder(repositioning.repositioningOrderId, t);

  // 5. The bin's current state follows the log, guarded by its version.
  const { version, next } = await applyPatch(asset, decision, opened, occurredAt, t);

  // 6. The liner ledger: a fit takes its liner off the shelf; a fitted liner taken out unused is recorded.
  const moves = movesForScan({ action: input.action, before: snapshotOf(asset), after: next, assetId: asset.id, siteId: site?.id ?? null, userId: actor.id, occurredAt });
  await insertMoves(
    moves.map((m) => ({ ...m, scan_event_id: eventId })),
    t,
  );

  // 7. The bin's repair order: a failed prep check opens one; repair shop, retirement and release follow it.
  await repairEffectsOfScan(
    {
      action: input.action,
      assetId: asset.id,
      eventId,
      siteId: site?.id ?? null,
      siteKind: site?.kind ?? null,
      actorId: actor.id,
      prepResult: input.prepResult,
      faults: input.faults,
      note: input.note,
    },
    t,
  );

  const outcome: ScanOutcome = {
    clientEventId: input.clientEventId,
    replayed: false,
    eventId,
    assetId: asset.id,
    grai: asset.grai,
    action: input.action,
    statusFrom: decision.from,
    statusTo: decision.to,
    inferred: decision.inferred,
    flags,
    tripId: eventTripId,
    version,
  };
  await sequelize.query('UPDATE scan_event_keys SET outcome = $2, scan_event_id = $3 WHERE client_event_id = $1', {
    bind: [input.clientEventId, JSON.stringify(outcome), eventId],
    transaction: t,
  });
  return outcome;
}

async function replay(actor: Actor, clientEventId: string, t: Transaction): Promise<ScanOutcome> {
  const row = await one<{ user_id: number | null; outcome: ScanOutcome }>('SELECT user_id, outcome FROM scan_event_keys WHERE client_event_id = $1', [clientEventId], t);
  if (!row || row.user_id !== actor.id) {
    throw new AppError('duplicate', 'This event id was already used by another scan.');
  }
  return { ...row.outcome, replayed: true };
}

function refusal(decision: Extract<Decision, { ok: false }>): AppError {
  return new AppError('transition_refused', decision.reason, { reason: decision.code, action: decision.action });
}

async function scanSite(actor: Actor, input: ScanInput, t: Transaction): Promise<SiteRow | null> {
  const siteId = input.siteId === undefined ? (actor.role === 'yard' ? actor.homeSiteId : null) : input.siteId;
  if (siteId === null || siteId === undefined) return null;
  const site = await one<SiteRow>('SELECT id, kind, organisation_id, active FROM sites WHERE id = $1', [siteId], t);
  if (!site || !site.active) throw new AppError('unprocessable', 'That site does not exist or is closed.');
  if (actor.role === 'customer' && (site.organisation_id !== actor.organisationId || (actor.siteIds && !actor.siteIds.includes(site.id)))) {
    throw new AppError('forbidden', 'You can record scans only at your own sites.');
  }
  return site;
}

interface OrderRow {
  id: number;
  reference: string;
  status: string;
  customer_id: number;
  depot_site_id: number;
  delivery_site_id: number;
  bin_type_id: number;
  needed_by: string;
}

/**
 * A hire dispatch is refused for a bin whose test (or period of use) runs out before the order's wanted date
 * — never overridable — or, by the operator's margin, while it is likely still out; a planner may override
 * the margin only, with a reason, which the dispatch's log entry keeps (and flags for review).
 */
async function checkLapseBeforeDispatch(actor: Actor, assetId: number, order: OrderRow, input: ScanInput, today: string, timeZone: string, t: Transaction) {
  const check = await dispatchLapseCheck(assetId, order, today, timeZone, t);
  if (check.ok) return null;
  const details = { reason: check.code, action: 'dispatch', lastDay: check.lastDay, because: check.because, overridable: check.overridable, expectedBackOn: check.expectedBackOn };
  if (!check.overridable || !input.overrideReason) throw new AppError('transition_refused', check.reason, details);
  if (actor.role !== 'planner' && actor.role !== 'admin') {
    throw new AppError('transition_refused', `${check.reason} Only a planner may override it.`, details);
  }
  if (!overrideAccepted(check, input.overrideReason))
    throw new AppError('validation_failed', 'Say why the bin may go anyway (at least a few words).', [{ path: 'overrideReason', message: 'Give the reason for the override.' }]);
  return { code: check.code, lastDay: check.lastDay, expectedBackOn: check.expectedBackOn, reason: input.overrideReason.trim(), by: actor.id };
}

/**
 * ADR 4.1.1.15, enforced like the tests: once the inner receptacle's period of use has ended the bin is not lined
 * or filled any more (a hire dispatch is refused by the lapse check, which takes the earlier of test and period).
 */
function refuseAfterServiceLife(asset: AssetRow, action: Action, today: string) {
  if (action !== 'fit_liner' && action !== 'fill_seal') return;
  if (!asset.service_life_applies || !asset.inner_made_month) return;
  const ends = serviceLifeEnd({ applies: true, years: asset.service_life_years }, asset.inner_made_month.slice(0, 7));
  if (ends !== null && ends < today) {
    throw new AppError(
      'transition_refused',
      `Its inner receptacle's period of use ended on ${ends} (ADR 4.1.1.15): it may not be ${action === 'fit_liner' ? 'lined' : 'filled'} any more. Replace the inner receptacle or retire the bin.`,
      { reason: 'service_life_ended', action, lastDay: ends },
    );
  }
}

/** Inputs some actions need beyond the rule table: a usable liner lot, a hire order, a fill record. */
async function checkActionInputs(
  actor: Actor,
  asset: AssetRow,
  input: ScanInput,
  site: SiteRow | null,
  today: string,
  t: Transaction,
  when: { occurredAt: Date; receivedAt: Date },
): Promise<{ order: OrderRow | null; lotNumber: string | null; flags: string[] }> {
  let lotNumber: string | null = null;
  const flags: string[] = [];
  if (input.action === 'fit_liner') {
    // The lot's row stays locked until the scan commits: concurrent fits from it queue here, and each
    // reads the stock the one before it left (liner-ledger.server.ts). A hold or recall takes the same
    // lock, so no fit reads the lot as released once the stop has committed.
    const lot = await lockLot(input.linerLotId!, t);
    if (!lot) throw new AppError('unprocessable', 'That liner lot does not exist.');
    let ok = checkLinerLot({ status: lot.status, expiryDate: lot.expiryDate, lotNumber: lot.lotNumber }, today);
    if (!ok.ok && (ok.code === 'lot_recalled' || ok.code === 'lot_on_hold') && fitBeforeStopKnown({ statusChangedAt: lot.statusChangedAt, ...when, lotsAsOf: input.lotsAsOf })) {
      // Made on a phone that could not know yet: it happened, so it is kept — flagged, and in the lot's trace.
      flags.push(FIT_FROM_STOPPED_LOT);
      ok = checkLinerLot({ status: 'released', expiryDate: lot.expiryDate, lotNumber: lot.lotNumber }, today);
    }
    if (!ok.ok) throw new AppError('transition_refused', ok.reason, { reason: ok.code, action: 'fit_liner' });
    const fit = await specFitFor(lot.linerSpecId, asset.bin_type_id, t);
    if (!fit.ok) throw new AppError('transition_refused', fit.reason, { reason: fit.code, action: 'fit_liner' });
    await takeFromLot(lot.id, (site?.id ?? asset.site_id)!, 1, t);
    lotNumber = lot.lotNumber;
  }
  if (input.action === 'dispatch' && (input.purpose ?? 'hire') === 'hire' && asset.liner_lot_id) {
    const [lined] = await sequelize.query<{ lot_number: string; status: string }>('SELECT lot_number, status FROM liner_lots WHERE id = $1', {
      bind: [asset.liner_lot_id],
      transaction: t,
      type: QueryTypes.SELECT,
    });
    if (lined && lined.status !== 'released') {
      const word = lined.status === 'recalled' ? 'recalled' : 'on hold';
      throw new AppError(
        'transition_refused',
        `This bin is lined from lot ${lined.lot_number}, which is ${word}. Fold it to take the liner out, then prep-check it and fit a liner from another lot.`,
        { reason: 'lined_from_stopped_lot', action: 'dispatch' },
      );
    }
  }
  if (input.photoIds?.length) {
    // A scan's photos are its organisation's own uploads, and belong to this
    // bin: the first scan that names a photo claims it for its bin. One answer
    // for every failure, so nobody learns which ids exist or whose they are.
    const ids = [...new Set(input.photoIds)];
    const claimed = await one<{ n: number }>(
      `WITH c AS (
         UPDATE attachments SET asset_id = $2
          WHERE id = ANY($1::int[]) AND purpose = 'photo' AND organisation_id = $3 AND (asset_id IS NULL OR asset_id = $2)
         RETURNING id)
       SELECT count(*)::int AS n FROM c`,
      [ids, asset.id, actor.organisationId],
      t,
    );
    if (claimed?.n !== ids.length) {
      throw new AppError('unprocessable', 'A photo named with this scan is not one your organisation uploaded for this bin. Take the photo again.', { field: 'photoIds' });
    }
  }
  if (input.action === 'fill_seal' && !input.fill) {
    throw new AppError('validation_failed', 'Record the product, the quantity and the seal numbers.');
  }
  if (!input.hireOrderId) {
    if (input.action === 'dispatch' && (input.purpose ?? 'hire') === 'hire') {
      throw new AppError('transition_refused', 'Choose the hire order this bin goes out on.', { reason: 'no_hire_order', action: 'dispatch' });
    }
    return { order: null, lotNumber, flags };
  }
  const order = await one<OrderRow>(
    'SELECT id, reference, status, customer_id, depot_site_id, delivery_site_id, bin_type_id, needed_by::text FROM hire_orders WHERE id = $1',
    [input.hireOrderId],
    t,
  );
  if (!order || !countsAsDemand(order.status as OrderStatus)) {
    const why = order?.status === 'draft' ? ' it is still a draft; a planner confirms it first' : order ? ` it is ${order.status}` : '';
    throw new AppError('transition_refused', `That hire order is not open for loading${why ? `:${why}` : ''}.`, { reason: 'order_not_open', action: input.action });
  }
  if (order.bin_type_id !== asset.bin_type_id) {
    const type = await one<{ name: string }>('SELECT name FROM bin_types WHERE id = $1', [order.bin_type_id], t);
    throw new AppError('transition_refused', `Hire order ${order.reference} asks for ${type?.name ?? 'another bin type'}; this bin is a different type.`, {
      reason: 'wrong_bin_type',
      action: input.action,
    });
  }
  return { order, lotNumber, flags };
}

function snapshotOf(a: AssetRow): AssetSnapshot {
  return {
    status: a.status,
    siteId: a.site_id,
    siteSince: null,
    customerId: a.customer_id,
    currentTripId: a.current_trip_id,
    leg: a.leg,
    prepChecked: a.prep_checked,
    linerLotId: a.liner_lot_id,
    filled: a.filled,
    tripCount: a.trip_count,
    lastScanAt: a.last_scan_at,
  };
}

const siteOf = (s: SiteRow | null): ScanSite | null => (s ? { id: s.id, kind: s.kind, organisationId: s.organisation_id } : null);

/** Opens, updates or closes the bin's trip (columns from src/lib/scan/scan-effects.ts); returns the id of the trip the event belongs to. */
async function applyTrip(
  asset: AssetRow,
  d: Extract<Decision, { ok: true }>,
  input: ScanInput,
  site: SiteRow | null,
  order: OrderRow | null,
  at: Date,
  t: Transaction,
  flags: string[],
): Promise<{ tripId: number; customerId: number } | number | null> {
  if (d.trip === 'none') return null;
  if (d.trip === 'open') {
    const o = tripOpening(
      { siteId: asset.site_id, linerLotId: asset.liner_lot_id },
      input,
      siteOf(site),
      order ? { id: order.id, customerId: order.customer_id, depotSiteId: order.depot_site_id, deliverySiteId: order.delivery_site_id } : null,
      at,
    );
    if (!o.customerId) throw new AppError('transition_refused', 'Choose the hire order this bin goes out on.', { reason: 'no_hire_order', action: input.action });
    const created = await one<{ id: number }>(
      `INSERT INTO trips (asset_id, hire_order_id, customer_id, depot_site_id, customer_site_id, liner_lot_id, dispatched_at, delivered_at, load_id)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING id`,
      [asset.id, o.hireOrderId, o.customerId, o.depotSiteId, o.customerSiteId, o.linerLotId, o.dispatchedAt, o.deliveredAt, o.loadId],
      t,
    );
    return { tripId: created!.id, customerId: o.customerId };
  }
  if (!asset.current_trip_id) return null;
  let sealsApplied: string[] = [];
  if (input.action === 'discharge') {
    const trip = await one<TripRow>('SELECT id, customer_id, seals_applied, delivered_at FROM trips WHERE id = $1', [asset.current_trip_id], t);
    sealsApplied = trip?.seals_applied ?? [];
  }
  const change = tripChanges(input, d, siteOf(site), sealsApplied, at);
  flags.push(...change.flags);
  const bind: unknown[] = [asset.current_trip_id];
  const set = Object.entries(change.set).map(([col, value]) => {
    bind.push(value);
    return `${col} = $${bind.length}`;
  });
  if (change.close) set.push(`status = 'closed'`);
  if (set.length) {
    await sequelize.query(`UPDATE trips SET ${set.join(', ')}, version = version + 1, updated_at = now() WHERE id = $1`, { bind, transaction: t });
  }
  return asset.current_trip_id;
}

/** Writes the decision's patch onto the bin; refuses when someone else changed it first. */
async function applyPatch(
  asset: AssetRow,
  d: Extract<Decision, { ok: true }>,
  opened: { tripId: number; customerId: number } | null,
  at: Date,
  t: Transaction,
): Promise<{ version: number; next: AssetSnapshot }> {
  const next = assetAfter(snapshotOf(asset), d, opened, at);
  const updated = await one<{ version: number }>(
    `UPDATE assets SET status = $3, site_id = $4, site_since = CASE WHEN site_id IS DISTINCT FROM $4 OR site_since IS NULL THEN $5 ELSE site_since END,
            leg = $6, prep_checked = $7, liner_lot_id = $8, filled = $9, current_trip_id = $10, customer_id = $11, trip_count = $12,
            last_scan_at = $13, version = version + 1, updated_at = now()
      WHERE id = $1 AND version = $2 RETURNING version`,
    [
      asset.id,
      asset.version,
      next.status,
      next.siteId,
      at,
      next.leg,
      next.prepChecked,
      next.linerLotId,
      next.filled,
      next.currentTripId,
      next.customerId,
      next.tripCount,
      next.lastScanAt,
    ],
    t,
  );
  if (!updated) throw changedMeanwhile();
  const schedule = scheduleColumns(d);
  if (schedule) {
    const cols = Object.keys(schedule);
    await sequelize.query(`UPDATE assets SET ${cols.map((c, i) => `${c} = $${i + 2}`).join(', ')} WHERE id = $1`, { bind: [asset.id, ...Object.values(schedule)], transaction: t });
  }
  return { version: updated.version, next };
}
