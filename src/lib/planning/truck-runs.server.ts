/**
 * Truck runs as records: suggested from the open collection requests through `suggestRuns()` (./truck-runs), saved,
 * edited and confirmed by the planner, received against at the depot by the yard's receive scans (the scan service
 * calls `checkRunReceive()` and `afterRunReceive()` inside its transaction), and done when every expected bin is in
 * or the planner closes the run. A stop serves every open request of its site that no other run serves; the
 * requests follow the run: scheduled (with the run's day) when it is confirmed, collected when it is done, open
 * again when it is cancelled.
 */
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate, type LocalDate } from '@/lib/calendar';
import { canMove } from '@/lib/requests/request-status';
import { TruckRun } from '@/models';
import { nextReference } from '@/lib/reference-numbers.server';
import { loadCapacity, STANDARD_TRAILER, type Trailer } from './load-plan';
import { binTypesForLoading } from './bin-types-for-loading.server';
import { DEFAULT_ROAD_FACTOR, roadKm, type Point } from './lane-costs';
import { driveOrder, routeKm, suggestRuns, type SuggestedRun } from './truck-runs';
import { decideRunCommand, editableParts, overCapacity, runCommands, runProgress, type RunCommand, type RunProgress, type RunStatus } from './run-status';
import type { RunCreate, RunPatch, RunSuggestQuery } from './run-forms';

const q = <T extends object>(sql: string, bind: unknown[] = [], t?: Transaction) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });

// ---------------------------------------------------------------------------
// Capacity: the trailer's inside size and payload through the load plan
// ---------------------------------------------------------------------------

export interface TrailerRow {
  id: number;
  name: string;
  insideLengthMm: number;
  insideWidthMm: number;
  insideHeightMm: number;
  payloadKg: number;
  active: boolean;
}

export interface RunCapacity {
  bins: number;
  explanation: string;
  trailer: string;
  binType: string;
}

const TRAILER_COLUMNS = `id, name, inside_length_mm AS "insideLengthMm", inside_width_mm AS "insideWidthMm", inside_height_mm AS "insideHeightMm", payload_kg AS "payloadKg", active`;

export async function trailerById(id: number, t?: Transaction): Promise<TrailerRow | null> {
  const [row] = await q<TrailerRow>(`SELECT ${TRAILER_COLUMNS} FROM trailers WHERE id = $1`, [id], t);
  return row ?? null;
}

/** The trailers in use, with their inside size and payload (the planner picks one per run or load). */
export async function activeTrailers(): Promise<TrailerRow[]> {
  return q<TrailerRow>(`SELECT ${TRAILER_COLUMNS} FROM trailers WHERE active ORDER BY name`);
}

/**
 * Folded empties of one bin type on one trailer (the standard trailer of common practice when none is chosen; the
 * first active bin type by name when none is chosen), by `loadCapacity()`.
 */
export async function runCapacity(trailerId: number | null, binTypeId: number | null, t?: Transaction): Promise<RunCapacity | null> {
  const trailer: Trailer & { name?: string } = (trailerId !== null ? await trailerById(trailerId, t) : null) ?? STANDARD_TRAILER;
  const [type] = await binTypesForLoading(binTypeId, t);
  if (!type) return null;
  const cap = loadCapacity(trailer, type.bin, { kind: 'folded' });
  if (!cap.ok) return null;
  return { bins: cap.bins, explanation: cap.explanation, trailer: trailer.name ?? 'Trailer', binType: type.name };
}

// ---------------------------------------------------------------------------
// Suggesting runs from the open requests
// ---------------------------------------------------------------------------

interface PlacedSite {
  id: number;
  name: string;
  code: string;
  lat: number;
  lon: number;
}

async function depots(t?: Transaction): Promise<PlacedSite[]> {
  return q<PlacedSite>(
    `SELECT id, name, code, latitude::float8 AS lat, longitude::float8 AS lon FROM sites WHERE kind = 'depot' AND active AND latitude IS NOT NULL ORDER BY name`,
    [],
    t,
  );
}

interface OpenSiteRow {
  site_id: number;
  name: string;
  code: string;
  lat: number | null;
  lon: number | null;
  minimum: number;
  /** The latest request's count and ready day stand for the site. */
  bins: number;
  ready_on: string;
  request_ids: number[];
}

/** Customer sites with open collection requests no run serves yet: one row per site. */
async function openCollectionSites(timeZone: string, t?: Transaction): Promise<OpenSiteRow[]> {
  return q<OpenSiteRow>(
    `SELECT s.id AS site_id, s.name, s.code, s.latitude::float8 AS lat, s.longitude::float8 AS lon, s.min_collection_qty AS minimum,
            (array_agg(r.quantity ORDER BY r.created_at DESC, r.id DESC))[1] AS bins,
            to_char((array_agg(COALESCE(r.ready_on, (r.created_at AT TIME ZONE $1)::date) ORDER BY r.created_at DESC, r.id DESC))[1], 'YYYY-MM-DD') AS ready_on,
            array_agg(r.id ORDER BY r.id) AS request_ids
       FROM collection_requests r JOIN sites s ON s.id = r.site_id
      WHERE r.status = 'open' AND r.truck_run_id IS NULL AND s.kind = 'customer' AND s.active
      GROUP BY s.id ORDER BY s.name`,
    [timeZone],
    t,
  );
}

const pointOf = (s: { lat: number; lon: number }): Point => ({ lat: s.lat, lon: s.lon });

export interface RunSuggestionView {
  depot: PlacedSite;
  capacity: RunCapacity | null;
  runs: Array<Omit<SuggestedRun, 'stops'> & { stops: Array<SuggestedRun['stops'][number] & { siteId: number; requestIds: number[] }> }>;
  waiting: Array<{ siteId: number; name: string; bins: number; short: number }>;
  /** Sites with open requests but no coordinates: the planner adds them to a run by hand. */
  unplaced: Array<{ siteId: number; name: string; bins: number }>;
  /** Open requests whose nearest depot is another one. */
  elsewhere: number;
  settings: RunSuggestQuery;
}

/**
 * Runs suggested for one depot: the customer sites with open requests whose nearest depot (great-circle) it is,
 * grouped by `suggestRuns()` with the truck capacity of the chosen trailer and bin type.
 */
export async function suggestCollectionRuns(settings: RunSuggestQuery): Promise<RunSuggestionView> {
  const { timeZone } = await getSettings();
  const all = await depots();
  const depot = all.find((d) => d.id === settings.depot);
  if (!depot) throw new AppError('not_found', 'There is no active depot with coordinates by that number.');
  const capacity = await runCapacity(settings.trailer ?? null, settings.type ?? null);
  if (!capacity) throw new AppError('unprocessable', 'No bin type to plan the truck with; add one on the bin types page.');
  const open = await openCollectionSites(timeZone);
  const unplaced = open.filter((s) => s.lat === null || s.lon === null).map((s) => ({ siteId: s.site_id, name: s.name, bins: s.bins }));
  const nearest = (s: { lat: number; lon: number }) => all.reduce((best, d) => (roadKm(pointOf(s), pointOf(d), 1) < roadKm(pointOf(s), pointOf(best), 1) ? d : best), all[0]!);
  const mine = open.filter((s): s is OpenSiteRow & { lat: number; lon: number } => s.lat !== null && s.lon !== null && nearest(s as { lat: number; lon: number }).id === depot.id);
  const bySite = new Map(mine.map((s) => [String(s.site_id), s]));
  const suggestion = suggestRuns(
    mine.map((s) => ({ key: String(s.site_id), name: s.name, point: pointOf(s), readyOn: s.ready_on, bins: s.bins, minimum: s.minimum })),
    { depot: pointOf(depot), truckCapacity: capacity.bins, windowDays: settings.window, maxDetourKm: settings.detour, roadFactor: settings.road },
  );
  return {
    depot,
    capacity,
    runs: suggestion.runs.map((r) => ({
      ...r,
      stops: r.stops.map((s) => ({ ...s, siteId: Number(s.key), requestIds: bySite.get(s.key)!.request_ids })),
    })),
    waiting: suggestion.waiting.map((w) => ({ siteId: Number(w.key), name: w.name, bins: w.bins, short: w.short })),
    unplaced,
    elsewhere: open.length - unplaced.length - mine.length,
    settings,
  };
}

// ---------------------------------------------------------------------------
// Saving and editing
// ---------------------------------------------------------------------------

interface StopSite {
  id: number;
  kind: string;
  name: string;
  lat: number | null;
  lon: number | null;
}

async function checkStops(stops: RunCreate['stops'], t: Transaction): Promise<StopSite[]> {
  const ids = stops.map((s) => s.siteId);
  const rows = await q<StopSite>(`SELECT id, kind, name, latitude::float8 AS lat, longitude::float8 AS lon FROM sites WHERE id = ANY($1::int[]) AND active`, [ids], t);
  const byId = new Map(rows.map((r) => [r.id, r]));
  const problems = stops.flatMap((s, i) => {
    const site = byId.get(s.siteId);
    if (!site) return [{ path: `stops.${i}.siteId`, message: 'There is no open site by that number.' }];
    if (site.kind !== 'customer') return [{ path: `stops.${i}.siteId`, message: `${site.name} is not a customer site; runs collect from customers.` }];
    return [];
  });
  if (problems.length) throw new AppError('validation_failed', problems[0]!.message, problems);
  return ids.map((id) => byId.get(id)!);
}

async function checkDepot(depotId: number, t: Transaction) {
  const [d] = await q<{ kind: string; active: boolean; code: string; lat: number | null; lon: number | null }>(
    'SELECT kind, active, code, latitude::float8 AS lat, longitude::float8 AS lon FROM sites WHERE id = $1',
    [depotId],
    t,
  );
  if (!d || d.kind !== 'depot' || !d.active) throw new AppError('validation_failed', 'A run returns to an open depot.', [{ path: 'depotId', message: 'Choose a depot.' }]);
  return d;
}

async function checkTrailer(trailerId: number | null | undefined, t: Transaction) {
  if (trailerId === null || trailerId === undefined) return;
  const [row] = await q<{ active: boolean }>('SELECT active FROM trailers WHERE id = $1', [trailerId], t);
  if (!row?.active) throw new AppError('validation_failed', 'There is no trailer in use by that number.', [{ path: 'trailerId', message: 'Choose a trailer.' }]);
}

/** Road km depot → stops in their order → depot (sites without coordinates are left out of the sum). */
function kmOf(depot: { lat: number | null; lon: number | null }, sites: StopSite[]): number | null {
  if (depot.lat === null || depot.lon === null) return null;
  const placed = sites.filter((s) => s.lat !== null && s.lon !== null).map((s) => ({ lat: s.lat!, lon: s.lon! }));
  return Math.round(routeKm({ lat: depot.lat, lon: depot.lon }, placed, DEFAULT_ROAD_FACTOR));
}

/** The given stops, or the same in driving order (sites without coordinates last, as given). */
function ordered(depot: { lat: number | null; lon: number | null }, stops: RunCreate['stops'], sites: StopSite[], reorder: boolean) {
  if (!reorder || depot.lat === null || depot.lon === null) return { stops, sites };
  const placed = sites.map((s, i) => ({ s, i })).filter((x) => x.s.lat !== null && x.s.lon !== null);
  const rest = sites.map((s, i) => ({ s, i })).filter((x) => x.s.lat === null || x.s.lon === null);
  const order = driveOrder(
    { lat: depot.lat, lon: depot.lon },
    placed.map((x) => ({ lat: x.s.lat!, lon: x.s.lon! })),
    DEFAULT_ROAD_FACTOR,
  );
  const idx = [...order.map((o) => placed[o]!.i), ...rest.map((x) => x.i)];
  return { stops: idx.map((i) => stops[i]!), sites: idx.map((i) => sites[i]!) };
}

/** Writes the stops (replacing any) and links the open requests of their sites that no other run serves. */
async function writeStops(runId: number, stops: RunCreate['stops'], t: Transaction) {
  await sequelize.query('DELETE FROM truck_run_stops WHERE run_id = $1', { bind: [runId], transaction: t });
  if (stops.length) {
    const bind: unknown[] = [runId];
    const values = stops.map((s, i) => `($1, ${i + 1}, $${bind.push(s.siteId)}, $${bind.push(s.expectedBins)})`);
    await sequelize.query(`INSERT INTO truck_run_stops (run_id, position, site_id, expected_bins) VALUES ${values.join(', ')}`, { bind, transaction: t });
  }
  const sites = stops.map((s) => s.siteId);
  await sequelize.query(
    `UPDATE collection_requests SET truck_run_id = NULL, version = version + 1, updated_at = now()
      WHERE truck_run_id = $1 AND NOT (site_id = ANY($2::int[]))`,
    { bind: [runId, sites], transaction: t },
  );
  await sequelize.query(
    `UPDATE collection_requests SET truck_run_id = $1, version = version + 1, updated_at = now()
      WHERE truck_run_id IS NULL AND status = 'open' AND site_id = ANY($2::int[])`,
    { bind: [runId, sites], transaction: t },
  );
}

/** Numbered per depot and day: RUN-261224-T1-02 is the T1 depot's second run planned for 24 Dec 2026. */
function runReference(depotCode: string, plannedOn: LocalDate, t: Transaction): Promise<string> {
  return nextReference('truck_runs', `RUN-${plannedOn.replaceAll('-', '').slice(2)}-${depotCode.replace(/^DEP-/, '')}-`, 2, t);
}

/** Saves a planned run; inside the caller's transaction when given one (an approved repositioning plan's collection lanes). */
export async function createRun(input: RunCreate, actor: AuditActor, opts: { transaction?: Transaction; planId?: number } = {}): Promise<{ id: number; reference: string }> {
  const go = async (t: Transaction) => {
    const depot = await checkDepot(input.depotId, t);
    await checkTrailer(input.trailerId, t);
    const sites = await checkStops(input.stops, t);
    const reference = await runReference(depot.code, input.plannedOn, t);
    const row = await TruckRun.create(
      {
        reference,
        depotSiteId: input.depotId,
        trailerId: input.trailerId ?? null,
        binTypeId: input.binTypeId ?? null,
        carrier: input.carrier ?? null,
        plannedOn: input.plannedOn,
        roadKm: kmOf(depot, sites),
        createdBy: actor.userId,
        confirmedAt: null,
        finishedAt: null,
      },
      { transaction: t },
    );
    await writeStops(row.id, input.stops, t);
    if (opts.planId !== undefined) {
      await sequelize.query('UPDATE truck_runs SET repositioning_plan_id = $2 WHERE id = $1', { bind: [row.id, opts.planId], transaction: t });
    }
    await recordAudit(
      { actor, action: 'truck_run.create', entityType: 'truck_run', entityId: row.id, after: { reference, plannedOn: input.plannedOn, stops: input.stops } },
      { transaction: t },
    );
    return { id: row.id, reference };
  };
  return opts.transaction ? go(opts.transaction) : sequelize.transaction(go);
}

async function lockRun(id: number, version: number | null, t: Transaction): Promise<TruckRun> {
  const row = await TruckRun.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
  if (!row) throw new AppError('not_found', 'There is no such truck run.');
  if (version !== null && row.version !== version) {
    throw new AppError('changed_meanwhile', `Someone changed run ${row.reference} meanwhile (it is now ${row.status}). Reload the page to see it.`, {
      status: row.status,
      version: row.version,
    });
  }
  return row;
}

async function stopsOf(runId: number, t?: Transaction) {
  return q<{ siteId: number; expected: number }>('SELECT site_id AS "siteId", expected_bins AS expected FROM truck_run_stops WHERE run_id = $1 ORDER BY position', [runId], t);
}

export async function updateRun(id: number, patch: RunPatch, actor: AuditActor): Promise<{ id: number; version: number }> {
  return sequelize.transaction(async (t) => {
    const row = await lockRun(id, patch.version, t);
    const may = editableParts(row.status);
    const touchesStops = patch.stops !== undefined || patch.reorder || patch.plannedOn !== undefined || patch.binTypeId !== undefined;
    if (touchesStops && !may.stops) throw new AppError('unprocessable', `Run ${row.reference} is ${row.status}: its day and stops are fixed.`);
    if ((patch.carrier !== undefined || patch.trailerId !== undefined) && !may.carrier)
      throw new AppError('unprocessable', `Run ${row.reference} is ${row.status} and cannot change.`);
    await checkTrailer(patch.trailerId, t);
    const before = { plannedOn: row.plannedOn, carrier: row.carrier, trailerId: row.trailerId, binTypeId: row.binTypeId, stops: await stopsOf(row.id, t) };
    if (patch.stops !== undefined || patch.reorder) {
      const given = patch.stops ?? before.stops.map((s) => ({ siteId: s.siteId, expectedBins: s.expected }));
      if (given.length === 0) throw new AppError('validation_failed', 'A run has at least one stop; cancel the run instead.', [{ path: 'stops', message: 'No stops left.' }]);
      const depot = await checkDepot(row.depotSiteId, t);
      const sites = await checkStops(given, t);
      const next = ordered(depot, given, sites, patch.reorder ?? false);
      await writeStops(row.id, next.stops, t);
      row.roadKm = kmOf(depot, next.sites);
    }
    if (patch.plannedOn !== undefined) row.plannedOn = patch.plannedOn;
    if (patch.carrier !== undefined) row.carrier = patch.carrier;
    if (patch.trailerId !== undefined) row.trailerId = patch.trailerId;
    if (patch.binTypeId !== undefined) row.binTypeId = patch.binTypeId;
    if (row.status === 'confirmed' && patch.trailerId !== undefined) {
      const capacity = await runCapacity(row.trailerId, row.binTypeId, t);
      const expected = before.stops.reduce((n, s) => n + s.expected, 0);
      const over = overCapacity({ expected, capacity: capacity?.bins ?? null });
      if (over) throw new AppError('unprocessable', over);
    }
    row.set('updatedAt', new Date());
    await row.save({ transaction: t });
    const after = { plannedOn: row.plannedOn, carrier: row.carrier, trailerId: row.trailerId, binTypeId: row.binTypeId, stops: await stopsOf(row.id, t) };
    await recordAudit({ actor, action: 'truck_run.update', entityType: 'truck_run', entityId: row.id, before, after }, { transaction: t });
    return { id: row.id, version: row.version };
  });
}

// ---------------------------------------------------------------------------
// Commands, and the requests that follow the run
// ---------------------------------------------------------------------------

async function receivedBySite(runId: number, t?: Transaction): Promise<Map<number | null, number>> {
  const rows = await q<{ site: number | null; n: number }>(
    `SELECT (payload->>'runFromSiteId')::int AS site, count(*)::int AS n FROM scan_events
      WHERE action = 'receive' AND payload ? 'runId' AND (payload->>'runId')::int = $1 AND voided_at IS NULL AND NOT inferred
      GROUP BY 1`,
    [runId],
    t,
  );
  return new Map(rows.map((r) => [r.site, r.n]));
}

export async function progressOf(runId: number, t?: Transaction): Promise<RunProgress> {
  return runProgress(await stopsOf(runId, t), await receivedBySite(runId, t));
}

/** The run's requests move with it; each step is one the request table allows (others are left as they are). */
async function moveRequests(runId: number, to: 'scheduled' | 'done' | 'open', plannedOn: string | null, t: Transaction) {
  const rows = await q<{ id: number; status: string; ready_on: string | null }>(
    `SELECT id, status, to_char(ready_on, 'YYYY-MM-DD') AS ready_on FROM collection_requests WHERE truck_run_id = $1 FOR UPDATE`,
    [runId],
    t,
  );
  if (to === 'scheduled' && plannedOn) {
    const early = rows.find((r) => r.ready_on && r.ready_on > plannedOn);
    if (early) throw new AppError('unprocessable', `A request on this run is ready only on ${early.ready_on}; plan the run for that day or later.`);
  }
  const ids = rows.filter((r) => r.status !== to && canMove('collection', r.status, to)).map((r) => r.id);
  if (!ids.length) return;
  await sequelize.query(
    `UPDATE collection_requests SET status = $2, planned_for = $3, version = version + 1, updated_at = now()${to === 'open' ? ', truck_run_id = NULL' : ''} WHERE id = ANY($1::int[])`,
    { bind: [ids, to, to === 'open' ? null : plannedOn], transaction: t },
  );
}

async function finish(row: TruckRun, to: 'done' | 'cancelled', t: Transaction) {
  row.status = to;
  row.finishedAt = new Date();
  await row.save({ transaction: t });
  if (to === 'done') await moveRequests(row.id, 'done', row.plannedOn, t);
  else {
    await moveRequests(row.id, 'open', null, t);
    // Requests the run had not scheduled yet are let go too, so a new run can take them.
    await sequelize.query('UPDATE collection_requests SET truck_run_id = NULL, version = version + 1, updated_at = now() WHERE truck_run_id = $1', {
      bind: [row.id],
      transaction: t,
    });
  }
}

export async function commandRun(id: number, command: RunCommand, version: number, actor: AuditActor): Promise<{ id: number; status: RunStatus; version: number }> {
  return sequelize.transaction(async (t) => {
    const row = await lockRun(id, version, t);
    const stops = await stopsOf(row.id, t);
    const progress = runProgress(stops, await receivedBySite(row.id, t));
    const capacity = command === 'confirm' ? await runCapacity(row.trailerId, row.binTypeId, t) : null;
    const decision = decideRunCommand(
      { status: row.status, carrier: row.carrier, stops: stops.length, received: progress.received, expected: progress.expected, capacity: capacity?.bins ?? null },
      command,
    );
    if (!decision.ok) throw new AppError('transition_refused', decision.reason);
    const before = { status: row.status };
    if (decision.to === 'confirmed') {
      row.status = 'confirmed';
      row.confirmedAt = new Date();
      await row.save({ transaction: t });
      await moveRequests(row.id, 'scheduled', row.plannedOn, t);
    } else {
      await finish(row, decision.to as 'done' | 'cancelled', t);
    }
    await recordAudit({ actor, action: `truck_run.${command}`, entityType: 'truck_run', entityId: row.id, before, after: { status: row.status } }, { transaction: t });
    return { id: row.id, status: row.status, version: row.version };
  });
}

// ---------------------------------------------------------------------------
// Receiving (called by the scan service inside its transaction)
// ---------------------------------------------------------------------------

/**
 * A receive scan that names a run: the run must be confirmed and come back to the scan's depot. Answers the site
 * the bin came from (where it stood, or its open trip's customer site), kept in the scan's payload.
 */
export async function checkRunReceive(
  runId: number,
  action: string,
  scanSiteId: number | null,
  asset: { id: number; site_id: number | null; site_kind: string | null; current_trip_id: number | null },
  t: Transaction,
): Promise<{ runFromSiteId: number | null; runRef: string }> {
  if (action !== 'receive') throw new AppError('validation_failed', 'A truck run is named only with a receive scan.', [{ path: 'runId', message: 'Only when receiving.' }]);
  const [r] = await q<{ id: number; reference: string; status: RunStatus; depot_site_id: number; depot: string }>(
    `SELECT r.id, r.reference, r.status, r.depot_site_id, s.name AS depot FROM truck_runs r JOIN sites s ON s.id = r.depot_site_id WHERE r.id = $1 FOR UPDATE OF r`,
    [runId],
    t,
  );
  if (!r) throw new AppError('not_found', 'There is no such truck run.');
  if (r.status !== 'confirmed') {
    throw new AppError('transition_refused', `Run ${r.reference} is ${r.status}: only a confirmed run is received against.`, { reason: 'run_not_confirmed', action: 'receive' });
  }
  if (scanSiteId !== r.depot_site_id) {
    throw new AppError('transition_refused', `Run ${r.reference} comes back to ${r.depot}; receive its bins there.`, { reason: 'run_other_depot', action: 'receive' });
  }
  let from = asset.site_kind === 'customer' ? asset.site_id : null;
  if (from === null && asset.current_trip_id !== null) {
    const [trip] = await q<{ customer_site_id: number | null }>('SELECT customer_site_id FROM trips WHERE id = $1', [asset.current_trip_id], t);
    from = trip?.customer_site_id ?? null;
  }
  return { runFromSiteId: from, runRef: r.reference };
}

/** After a receive against the run: when every expected bin is in, the run is done (and its requests collected). */
export async function afterRunReceive(runId: number, t: Transaction): Promise<void> {
  const progress = await progressOf(runId, t);
  if (!progress.complete) return;
  const row = await TruckRun.findByPk(runId, { transaction: t, lock: t.LOCK.UPDATE });
  if (row?.status === 'confirmed') {
    await finish(row, 'done', t);
    await recordAudit(
      { actor: { userId: null, ip: null }, action: 'truck_run.received', entityType: 'truck_run', entityId: row.id, after: { status: 'done' } },
      { transaction: t },
    );
  }
}

// ---------------------------------------------------------------------------
// Reading
// ---------------------------------------------------------------------------

export interface RunListRow {
  id: number;
  reference: string;
  status: RunStatus;
  plannedOn: string;
  depot: string;
  carrier: string | null;
  trailer: string | null;
  stops: number;
  expected: number;
  received: number;
  roadKm: number | null;
}

const RECEIVED_SQL = `(SELECT count(*)::int FROM scan_events e WHERE e.action = 'receive' AND e.payload ? 'runId' AND (e.payload->>'runId')::int = r.id AND e.voided_at IS NULL AND NOT e.inferred)`;

export async function listRuns(filter: { status?: RunStatus | 'open'; depotId?: number; from?: LocalDate; to?: LocalDate } = {}, limit = 100): Promise<RunListRow[]> {
  const bind: unknown[] = [];
  const where: string[] = [];
  if (filter.status === 'open') where.push(`r.status IN ('planned', 'confirmed')`);
  else if (filter.status) where.push(`r.status = $${bind.push(filter.status)}`);
  if (filter.depotId) where.push(`r.depot_site_id = $${bind.push(filter.depotId)}`);
  if (filter.from) where.push(`r.planned_on >= $${bind.push(filter.from)}::date`);
  if (filter.to) where.push(`r.planned_on <= $${bind.push(filter.to)}::date`);
  return q<RunListRow>(
    `SELECT r.id, r.reference, r.status, to_char(r.planned_on, 'YYYY-MM-DD') AS "plannedOn", d.name AS depot, r.carrier, tr.name AS trailer, r.road_km AS "roadKm",
            (SELECT count(*)::int FROM truck_run_stops st WHERE st.run_id = r.id) AS stops,
            (SELECT COALESCE(sum(st.expected_bins), 0)::int FROM truck_run_stops st WHERE st.run_id = r.id) AS expected,
            ${RECEIVED_SQL} AS received
       FROM truck_runs r JOIN sites d ON d.id = r.depot_site_id LEFT JOIN trailers tr ON tr.id = r.trailer_id
      ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
      ORDER BY CASE r.status WHEN 'planned' THEN 0 WHEN 'confirmed' THEN 1 ELSE 2 END, r.planned_on, r.id
      LIMIT ${Math.max(1, Math.min(500, limit))}`,
    bind,
  );
}

export interface RunStopView {
  position: number;
  siteId: number;
  name: string;
  code: string;
  address: string | null;
  customer: string;
  /** Road km from the previous stop (or the depot). */
  legKm: number | null;
  expected: number;
  received: number;
  left: number;
  requests: Array<{ id: number; quantity: number; readyOn: string | null; status: string; contactName: string | null; contactPhone: string | null; locationNote: string | null }>;
}

export interface RunView {
  id: number;
  reference: string;
  status: RunStatus;
  version: number;
  plannedOn: string;
  depot: { id: number; name: string; code: string; address: string | null };
  carrier: string | null;
  trailer: { id: number; name: string } | null;
  binTypeId: number | null;
  roadKm: number | null;
  capacity: RunCapacity | null;
  stops: RunStopView[];
  progress: RunProgress;
  commands: Array<{ command: RunCommand; label: string }>;
  /** Why a planned run cannot be confirmed yet (shown beside the commands), or null. */
  confirmBlocked: string | null;
  editable: { stops: boolean; carrier: boolean };
}

export async function runView(id: number): Promise<RunView | null> {
  const [r] = await q<{
    id: number;
    reference: string;
    status: RunStatus;
    version: number;
    plannedOn: string;
    depotId: number;
    depotName: string;
    depotCode: string;
    depotAddress: string | null;
    depotLat: number | null;
    depotLon: number | null;
    carrier: string | null;
    trailerId: number | null;
    trailerName: string | null;
    binTypeId: number | null;
    roadKm: number | null;
  }>(
    `SELECT r.id, r.reference, r.status, r.version, to_char(r.planned_on, 'YYYY-MM-DD') AS "plannedOn", d.id AS "depotId", d.name AS "depotName", d.code AS "depotCode",
            d.address AS "depotAddress", d.latitude::float8 AS "depotLat", d.longitude::float8 AS "depotLon", r.carrier, r.trailer_id AS "trailerId", tr.name AS "trailerName",
            r.bin_type_id AS "binTypeId", r.road_km AS "roadKm"
       FROM truck_runs r JOIN sites d ON d.id = r.depot_site_id LEFT JOIN trailers tr ON tr.id = r.trailer_id WHERE r.id = $1`,
    [id],
  );
  if (!r) return null;
  const stopRows = await q<{
    position: number;
    siteId: number;
    name: string;
    code: string;
    address: string | null;
    customer: string;
    expected: number;
    lat: number | null;
    lon: number | null;
  }>(
    `SELECT st.position, st.site_id AS "siteId", s.name, s.code, s.address, o.name AS customer, st.expected_bins AS expected, s.latitude::float8 AS lat, s.longitude::float8 AS lon
       FROM truck_run_stops st JOIN sites s ON s.id = st.site_id JOIN organisations o ON o.id = s.organisation_id WHERE st.run_id = $1 ORDER BY st.position`,
    [id],
  );
  const requests = await q<RunStopView['requests'][number] & { siteId: number }>(
    `SELECT id, site_id AS "siteId", quantity, to_char(ready_on, 'YYYY-MM-DD') AS "readyOn", status, contact_name AS "contactName", contact_phone AS "contactPhone", location_note AS "locationNote"
       FROM collection_requests WHERE truck_run_id = $1 ORDER BY id`,
    [id],
  );
  const progress = await progressOf(id);
  const capacity = await runCapacity(r.trailerId, r.binTypeId);
  const facts = { status: r.status, carrier: r.carrier, stops: stopRows.length, received: progress.received, expected: progress.expected, capacity: capacity?.bins ?? null };
  let at: Point | null = r.depotLat !== null && r.depotLon !== null ? { lat: r.depotLat, lon: r.depotLon } : null;
  const stops = stopRows.map((s, i) => {
    const here = s.lat !== null && s.lon !== null ? { lat: s.lat, lon: s.lon } : null;
    const legKm = at && here ? Math.round(roadKm(at, here, DEFAULT_ROAD_FACTOR)) : null;
    at = here;
    const p = progress.stops[i]!;
    return {
      position: s.position,
      siteId: s.siteId,
      name: s.name,
      code: s.code,
      address: s.address,
      customer: s.customer,
      legKm,
      expected: s.expected,
      received: p.received,
      left: p.left,
      requests: requests.filter((x) => x.siteId === s.siteId).map(({ siteId: _, ...rest }) => rest),
    };
  });
  return {
    id: r.id,
    reference: r.reference,
    status: r.status,
    version: r.version,
    plannedOn: r.plannedOn,
    depot: { id: r.depotId, name: r.depotName, code: r.depotCode, address: r.depotAddress },
    carrier: r.carrier,
    trailer: r.trailerId !== null ? { id: r.trailerId, name: r.trailerName! } : null,
    binTypeId: r.binTypeId,
    roadKm: r.roadKm,
    capacity,
    stops,
    progress,
    commands: runCommands(facts),
    confirmBlocked: (() => {
      const d = r.status === 'planned' ? decideRunCommand(facts, 'confirm') : null;
      return d && !d.ok ? d.reason : null;
    })(),
    editable: editableParts(r.status),
  };
}

/** What the run page's editor offers: depots, trailers in use, bin types, and the sites with open requests. */
export async function runChoices() {
  const [depotRows, trailers, binTypes, openSites] = await Promise.all([
    q<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'depot' AND active ORDER BY name`),
    q<{ id: number; name: string }>('SELECT id, name FROM trailers WHERE active ORDER BY name'),
    q<{ id: number; name: string }>('SELECT id, name FROM bin_types WHERE active ORDER BY name'),
    q<{ id: number; name: string; bins: number }>(
      `SELECT s.id, s.name, (array_agg(r.quantity ORDER BY r.created_at DESC, r.id DESC))[1] AS bins
         FROM collection_requests r JOIN sites s ON s.id = r.site_id
        WHERE r.status = 'open' AND r.truck_run_id IS NULL AND s.kind = 'customer' AND s.active GROUP BY s.id ORDER BY s.name`,
    ),
  ]);
  return { depots: depotRows, trailers, binTypes, openSites };
}

export interface YardRun {
  id: number;
  reference: string;
  plannedOn: string;
  carrier: string | null;
  stops: Array<{ name: string; expected: number; received: number; left: number }>;
  expected: number;
  received: number;
  left: number;
}

/** Confirmed runs coming back to the depot today (and those planned earlier still not done), soonest first. */
export async function runsExpectedAt(depotId: number, now = new Date()): Promise<YardRun[]> {
  const { timeZone } = await getSettings();
  const today = localDate(now, timeZone);
  const rows = await q<{ id: number; reference: string; plannedOn: string; carrier: string | null }>(
    `SELECT id, reference, to_char(planned_on, 'YYYY-MM-DD') AS "plannedOn", carrier FROM truck_runs
      WHERE depot_site_id = $1 AND status = 'confirmed' AND planned_on <= $2::date ORDER BY planned_on, id`,
    [depotId, today],
  );
  return Promise.all(rows.map((r) => yardRun(r)));
}

async function yardRun(r: { id: number; reference: string; plannedOn: string; carrier: string | null }): Promise<YardRun> {
  const names = await q<{ name: string }>('SELECT s.name FROM truck_run_stops st JOIN sites s ON s.id = st.site_id WHERE st.run_id = $1 ORDER BY st.position', [r.id]);
  const p = await progressOf(r.id);
  return {
    ...r,
    stops: p.stops.map((s, i) => ({ name: names[i]!.name, expected: s.expected, received: s.received, left: s.left })),
    expected: p.expected,
    received: p.received,
    left: p.left,
  };
}

/** One run for the yard's receiving page (confirmed or done, at the user's depot), or null. */
export async function yardRunAt(depotId: number, runId: number): Promise<(YardRun & { status: RunStatus; depotId: number }) | null> {
  const [r] = await q<{ id: number; reference: string; plannedOn: string; carrier: string | null; status: RunStatus; depotId: number }>(
    `SELECT id, reference, to_char(planned_on, 'YYYY-MM-DD') AS "plannedOn", carrier, status, depot_site_id AS "depotId" FROM truck_runs WHERE id = $1 AND depot_site_id = $2`,
    [runId, depotId],
  );
  if (!r) return null;
  const { status, depotId: d, ...rest } = r;
  return { ...(await yardRun(rest)), status, depotId: d };
}
