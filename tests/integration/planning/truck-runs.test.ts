import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan } from '@/lib/scans/scan-service.server';
import { createCollectionRequest } from '@/lib/requests/requests.server';
import { listPortalCollections } from '@/lib/portal/portal-requests.server';
import { commandRun, createRun, runView, runsExpectedAt, suggestCollectionRuns, updateRun } from '@/lib/planning/truck-runs.server';
import { runSuggestQuery } from '@/lib/planning/run-forms';
import { addDays, localDate } from '@/lib/calendar';
import { CollectionRequest, Site } from '@/models';

const w = usePoolWorld();
const actor = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
const today = () => localDate(new Date(), 'Europe/Amsterdam');
const sel = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

let nearSite: Site;
let farSite: Site;

/** A bin out on hire at a customer site (dispatched on the test order, delivered there). */
async function onHireAt(siteId: number) {
  const bin = await newBin(w);
  for (const s of [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId },
  ] as const) {
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, ...s });
  }
  return bin;
}

async function request(siteId: number, quantity: number, readyOn = today()) {
  const created = await createCollectionRequest({
    source: 'planner',
    assetId: null,
    siteId,
    customerId: w.customer.id,
    quantity,
    readyOn,
    locationNote: null,
    contactName: 'Gate keeper',
    contactPhone: null,
    contactEmail: null,
    note: null,
    requestedBy: null,
    requesterIp: null,
  });
  await created.delivery;
  return created.id;
}

const receive = (assetId: number, runId: number, siteId = w.depot.id) => recordScan(w.yard, { clientEventId: randomUUID(), assetId, action: 'receive', siteId, runId });

beforeAll(async () => {
  // Two customer sites a few km apart near the test depot (51.9, 4.4), one far away with a minimum of 10 bins.
  nearSite = await Site.create({
    organisationId: w.customer.id,
    code: 'CUS-T2',
    name: 'Second customer site',
    kind: 'customer',
    address: 'Quay 2',
    latitude: '51.85',
    longitude: '4.5',
  });
  farSite = await Site.create({
    organisationId: w.customer.id,
    code: 'CUS-T3',
    name: 'Far site',
    kind: 'customer',
    address: null,
    latitude: '51.75',
    longitude: '4.55',
    minCollectionQty: 10,
  });
});

describe('truck runs from collection requests', () => {
  let runId = 0;
  const bins: Array<{ id: number }> = [];

  test('two requests near each other and ready together are suggested as one run; a site below its minimum waits', async () => {
    bins.push(await onHireAt(w.customerSite.id), await onHireAt(w.customerSite.id), await onHireAt(nearSite.id));
    await request(w.customerSite.id, 2);
    await request(nearSite.id, 1);
    await request(farSite.id, 3);
    const s = await suggestCollectionRuns(runSuggestQuery.parse({ depot: String(w.depot.id), type: String(w.binType.id) }));
    expect(s.runs).toHaveLength(1);
    const [run] = s.runs;
    expect(run!.bins).toBe(3);
    expect(run!.stops.map((x) => x.siteId).sort()).toEqual([w.customerSite.id, nearSite.id].sort());
    expect(s.waiting).toEqual([{ siteId: farSite.id, name: 'Far site', bins: 3, short: 7 }]);
    // The standard trailer (13.6 × 2.45 × 2.7 m) takes 26 floor positions of 1200 × 1000 (REFERENCES §9, common
    // practice) × 6 levels of 380 mm folded under 2700 mm with 50 mm head room ((2700 − 50) / 380 = 6.97 → 6) = 156.
    expect(s.capacity?.bins).toBe(156);

    const saved = await createRun(
      { depotId: w.depot.id, plannedOn: run!.leavesOn, binTypeId: w.binType.id, stops: run!.stops.map((x) => ({ siteId: x.siteId, expectedBins: x.bins })) },
      actor(),
    );
    runId = saved.id;
    expect(saved.reference).toMatch(/^RUN-\d{6}-T1-01$/);
    const linked = await CollectionRequest.findAll({ where: { truckRunId: runId } });
    expect(linked).toHaveLength(2);
    expect(linked.every((r) => r.status === 'open')).toBe(true);
    // Planned requests are no longer suggested.
    const again = await suggestCollectionRuns(runSuggestQuery.parse({ depot: String(w.depot.id) }));
    expect(again.runs).toHaveLength(0);
  });

  test('a planned run is not received against, and is confirmed only with a carrier', async () => {
    const refused = await appErrorOf(receive(bins[0]!.id, runId));
    expect(refused.message).toMatch(/planned: only a confirmed run is received against/);
    const v = (await runView(runId))!;
    const noCarrier = await appErrorOf(commandRun(runId, 'confirm', v.version, actor()));
    expect(noCarrier.message).toMatch(/Name the carrier/);
    const stale = await appErrorOf(updateRun(runId, { version: v.version + 5, carrier: 'X' }, actor()));
    expect(stale.code).toBe('changed_meanwhile');
  });

  test('the planner edits and confirms; the customer sees the run day', async () => {
    let v = (await runView(runId))!;
    await updateRun(runId, { version: v.version, carrier: 'Test Haulage', reorder: true }, actor());
    v = (await runView(runId))!;
    expect(v.carrier).toBe('Test Haulage');
    expect(v.stops.map((s) => s.position)).toEqual([1, 2]);
    await commandRun(runId, 'confirm', v.version, actor());
    const requests = await CollectionRequest.findAll({ where: { truckRunId: runId } });
    expect(requests.every((r) => r.status === 'scheduled' && r.plannedFor === v.plannedOn)).toBe(true);
    const portal = await listPortalCollections({ userId: 0, name: 'c', email: 'c@test.example', organisationId: w.customer.id, siteIds: null });
    const onRun = portal.filter((p) => requests.some((r) => r.id === p.id));
    expect(onRun.map((p) => p.plannedFor)).toEqual([v.plannedOn, v.plannedOn]);
    // The stops are fixed once confirmed.
    const fixed = await appErrorOf(updateRun(runId, { version: (await runView(runId))!.version, stops: [{ siteId: nearSite.id, expectedBins: 1 }] }, actor()));
    expect(fixed.message).toMatch(/confirmed: its day and stops are fixed/);
  });

  test('a confirmed run receives its bins: at its depot only, counted per stop, done when all are in', async () => {
    const elsewhere = await appErrorOf(receive(bins[0]!.id, runId, w.depot2.id));
    expect(elsewhere.message).toMatch(/comes back to Test depot/);
    // The yard sees the run due back today (its requests were ready today).
    expect((await runsExpectedAt(w.depot.id)).map((r) => r.id)).toContain(runId);

    await receive(bins[0]!.id, runId);
    await receive(bins[2]!.id, runId);
    let v = (await runView(runId))!;
    expect(v.status).toBe('confirmed');
    expect(v.progress).toMatchObject({ expected: 3, received: 2, left: 1 });
    expect(v.stops.find((s) => s.siteId === w.customerSite.id)).toMatchObject({ expected: 2, received: 1, left: 1 });
    expect(v.stops.find((s) => s.siteId === nearSite.id)).toMatchObject({ expected: 1, received: 1, left: 0 });

    // Collected on the road first (no site any more): the open trip's customer site names the stop.
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bins[1]!.id, action: 'collect', siteId: w.customerSite.id });
    await receive(bins[1]!.id, runId);
    v = (await runView(runId))!;
    expect(v.status).toBe('done');
    expect(v.progress).toMatchObject({ expected: 3, received: 3, left: 0, complete: true });
    const requests = await CollectionRequest.findAll({ where: { truckRunId: runId } });
    expect(requests.map((r) => r.status)).toEqual(['done', 'done']);
    const [event] = await sel<{ payload: Record<string, unknown> }>(`SELECT payload FROM scan_events WHERE asset_id = $1 AND action = 'receive' AND NOT inferred`, [bins[1]!.id]);
    expect(event!.payload).toMatchObject({ runId, runFromSiteId: w.customerSite.id });
    // A done run takes no more receipts.
    const late = await appErrorOf(receive(bins[0]!.id, runId));
    expect(late.code).toBe('transition_refused');
  });

  test('a cancelled run lets its requests go back to open; a request on a run is changed on the run', async () => {
    const id = await request(nearSite.id, 4, addDays(today(), 1));
    const { id: run2 } = await createRun(
      { depotId: w.depot.id, plannedOn: addDays(today(), 1), carrier: 'Other Haulage', stops: [{ siteId: nearSite.id, expectedBins: 4 }] },
      actor(),
    );
    await updateRun(run2, { version: (await runView(run2))!.version, plannedOn: today() }, actor());
    const tooEarly = await appErrorOf(commandRun(run2, 'confirm', (await runView(run2))!.version, actor()));
    expect(tooEarly.message).toMatch(/ready only on/);
    const v = (await runView(run2))!;
    await updateRun(run2, { version: v.version, plannedOn: addDays(today(), 1) }, actor());
    await commandRun(run2, 'confirm', (await runView(run2))!.version, actor());
    expect((await CollectionRequest.findByPk(id))!.status).toBe('scheduled');
    await commandRun(run2, 'cancel', (await runView(run2))!.version, actor());
    const back = (await CollectionRequest.findByPk(id))!;
    expect(back).toMatchObject({ status: 'open', truckRunId: null, plannedFor: null });
    const audit = await sel<{ action: string }>(`SELECT action FROM audit_entries WHERE entity_type = 'truck_run' AND entity_id = $1 ORDER BY id`, [String(run2)]);
    expect(audit.map((a) => a.action)).toEqual(['truck_run.create', 'truck_run.update', 'truck_run.update', 'truck_run.confirm', 'truck_run.cancel']);
  });
  test('a run that expects more bins than one truck takes is not confirmed until it fits', async () => {
    await request(farSite.id, 12, addDays(today(), 2));
    const { id } = await createRun({ depotId: w.depot.id, plannedOn: addDays(today(), 2), carrier: 'Big Haulage', stops: [{ siteId: farSite.id, expectedBins: 1 }] }, actor());
    const capacity = (await runView(id))!.capacity!.bins;
    expect(capacity).toBeGreaterThan(0);
    await updateRun(id, { version: (await runView(id))!.version, stops: [{ siteId: farSite.id, expectedBins: capacity + 1 }] }, actor());
    const over = (await runView(id))!;
    expect(over.commands.map((c) => c.command)).toEqual(['cancel']);
    expect(over.confirmBlocked).toBe(`The stops expect ${capacity + 1} bins but one truck takes ${capacity}: move 1 to another run or choose a larger trailer.`);
    const refused = await appErrorOf(commandRun(id, 'confirm', over.version, actor()));
    expect(refused.code).toBe('transition_refused');
    expect((await runView(id))!.status).toBe('planned');
    await updateRun(id, { version: (await runView(id))!.version, stops: [{ siteId: farSite.id, expectedBins: capacity }] }, actor());
    const fits = (await runView(id))!;
    expect(fits.confirmBlocked).toBeNull();
    expect((await commandRun(id, 'confirm', fits.version, actor())).status).toBe('confirmed');
    await commandRun(id, 'cancel', (await runView(id))!.version, actor());
  });
});
