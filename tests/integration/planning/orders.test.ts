import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { QueryTypes } from 'sequelize';
import { sqlErrorCode, sequelize } from '../support/db';
import { callRoute, json, sessionUser } from '../support/route';
import { recordScan } from '@/lib/scans/scan-service.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { startLoad, addBinToLoad, dispatchLoad } from '@/lib/loads/load-service.server';
import { loadYardHome } from '@/lib/yard/yard-home.server';
import { loadDepotSnapshot } from '@/lib/yard/depot-snapshot.server';
import { ordersAt } from '@/lib/yard/action-options.server';
import { commandOrder, createOrder, fillPlannerData, listOrders, orderView, tariffOn } from '@/lib/planning/orders.server';
import { orderInputSchema, DEFAULT_ORDER_LIST } from '@/lib/planning/order-forms';
import { addDays, localDate } from '@/lib/calendar';
import { HireOrder, Organisation, Site, Tariff } from '@/models';
import * as listRoute from '@/pages/api/planning/orders/index';
import * as statusRoute from '@/pages/api/planning/orders/[id]/status';

process.env.AUTH_SECRET ??= 'test-secret';
const w = usePoolWorld();
const sel = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
const actor = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
const today = () => localDate(new Date(), 'Europe/Amsterdam');

async function refused(p: Promise<unknown>, code: string, message: RegExp) {
  const err = await appErrorOf(p);
  expect(err.code).toBe(code);
  expect(err.message).toMatch(message);
}

async function preparedBin() {
  const bin = await newBin(w);
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
  return bin;
}

function input(extra: Record<string, unknown> = {}) {
  return orderInputSchema.parse({
    customerId: w.customer.id,
    deliverySiteId: w.customerSite.id,
    depotSiteId: w.depot.id,
    binTypeId: w.binType.id,
    quantity: 3,
    neededBy: addDays(today(), 2),
    ...extra,
  });
}

beforeAll(async () => {
  // The customer's tariffs: an old one up to yesterday, the current one open-ended.
  await Tariff.create({
    customerId: w.customer.id,
    freeDays: 10,
    dailyRate: '1.50',
    perTripFee: '20.00',
    lostBinFee: '700.00',
    currency: 'EUR',
    validFrom: '2020-01-01',
    validTo: addDays(today(), -1),
  });
  await Tariff.create({
    customerId: w.customer.id,
    freeDays: 14,
    dailyRate: '1.75',
    perTripFee: '22.00',
    lostBinFee: '750.00',
    currency: 'EUR',
    validFrom: today(),
    validTo: null,
  });
});

describe('tariffs with effective dates', () => {
  test('the order reads the tariff in force at its wanted date, both ends included', async () => {
    expect((await tariffOn(w.customer.id, addDays(today(), -1)))?.dailyRate).toBe('1.50');
    expect((await tariffOn(w.customer.id, today()))?.dailyRate).toBe('1.75');
    expect(await tariffOn(w.customer.id, '2019-12-31')).toBeNull();
  });
  test('overlapping tariffs of one customer are refused by the database', async () => {
    const code = await sqlErrorCode(
      `INSERT INTO tariffs (customer_id, free_days, daily_rate, per_trip_fee, lost_bin_fee, currency, valid_from) VALUES ($1, 7, 1, 1, 1, 'EUR', $2)`,
      [w.customer.id, addDays(today(), 30)],
    );
    expect(code).toBe('23P01'); // exclusion violation
  });
  test('an order with no tariff in force cannot be confirmed; as a draft it is kept', async () => {
    const other = await Organisation.create({ name: 'No Terms Ltd', kind: 'customer', contactEmail: null });
    const site = await Site.create({ organisationId: other.id, code: 'CUS-NT', name: 'No terms site', kind: 'customer', address: null, latitude: '52', longitude: '5' });
    await refused(createOrder(input({ customerId: other.id, deliverySiteId: site.id, confirm: true }), actor()), 'unprocessable', /no tariff in force/);
    const draft = await createOrder(input({ customerId: other.id, deliverySiteId: site.id }), actor());
    expect(draft.status).toBe('draft');
    const view = await orderView(draft.id);
    expect(view!.tariff).toBeNull();
    expect(view!.commands.map((c) => c.command)).toEqual(['confirm', 'cancel']);
    await expect(commandOrder(draft.id, { command: 'confirm', version: view!.version }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
  });
});

describe('a draft counts nowhere', () => {
  test('not on the yard home, the depot snapshot, the dispatch choices or a load; a scan against it is refused', async () => {
    const draft = await createOrder(input({ quantity: 5 }), actor());
    const confirmed = await createOrder(input({ quantity: 5, confirm: true }), actor()); // the same order, confirmed
    const home = await loadYardHome(w.depot.id, w.yard.id!);
    expect(home.orders.map((o) => o.id)).not.toContain(draft.id);
    expect(home.orders.map((o) => o.id)).toContain(confirmed.id);
    const snap = await loadDepotSnapshot(w.depot.id);
    expect(snap!.orders.map((o) => o.id)).not.toContain(draft.id);
    expect(snap!.orders.map((o) => o.id)).toContain(confirmed.id);
    expect((await ordersAt(w.depot.id, w.binType.id)).map((o) => o.id)).not.toContain(draft.id);
    expect((await ordersAt(w.depot.id, w.binType.id)).map((o) => o.id)).toContain(confirmed.id);
    await expect(startLoad({ ...w.yard, id: w.yard.id! }, { purpose: 'hire', hireOrderId: draft.id })).rejects.toMatchObject({ code: 'unprocessable' });
    const bin = await preparedBin();
    await refused(
      recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'dispatch', siteId: w.depot.id, purpose: 'hire', hireOrderId: draft.id }),
      'transition_refused',
      /still a draft/,
    );
    const [{ n }] = await sel<{ n: number }>(`SELECT count(*)::int AS n FROM trips WHERE hire_order_id = $1`, [draft.id]);
    expect(n).toBe(0);

    // once confirmed it is demand
    const v = await orderView(draft.id);
    expect(v!.tariff?.dailyRate).toBe('1.75');
    await commandOrder(draft.id, { command: 'confirm', version: v!.version }, actor());
    expect((await ordersAt(w.depot.id, w.binType.id)).map((o) => o.id)).toContain(draft.id);
  });
});

describe("an order's status follows its loads", () => {
  test('confirmed → loading with the first bin on a truck → dispatched when every bin has left', async () => {
    const order = await createOrder(input({ quantity: 2, confirm: true }), actor());
    expect(order.status).toBe('confirmed');
    const yardUser = { ...w.yard, id: w.yard.id! };
    const first = await startLoad(yardUser, { purpose: 'hire', hireOrderId: order.id, targetCount: 1 });
    expect(first.targetCount).toBe(1);
    await addBinToLoad(w.yard, first.id, { clientEventId: randomUUID(), assetId: (await preparedBin()).id });
    let view = await orderView(order.id);
    expect(view!.status).toBe('loading');
    expect(view!.progress).toEqual({ quantity: 2, loaded: 1, dispatched: 0 });
    await dispatchLoad(first.id, { carrier: 'Test Haulage', vehicleRegistration: 'AB-1', trailerSeals: [] });
    view = await orderView(order.id);
    expect(view!.status).toBe('loading'); // 1 of 2 has left
    expect(view!.progress.dispatched).toBe(1);

    const second = await startLoad(yardUser, { purpose: 'hire', hireOrderId: order.id });
    expect(second.targetCount).toBe(1); // what is left of the order
    await addBinToLoad(w.yard, second.id, { clientEventId: randomUUID(), assetId: (await preparedBin()).id });
    expect((await orderView(order.id))!.status).toBe('loading'); // all loaded, truck still at the depot
    await dispatchLoad(second.id, { carrier: 'Test Haulage', vehicleRegistration: 'AB-2', trailerSeals: [] });
    view = await orderView(order.id);
    expect(view!.status).toBe('dispatched');
    expect(view!.progress).toEqual({ quantity: 2, loaded: 2, dispatched: 2 });
    expect(view!.loads.map((l) => [l.status, l.bins])).toEqual([
      ['dispatched', 1],
      ['dispatched', 1],
    ]);
    expect(view!.commands.map((c) => c.command)).toEqual(['close']);

    // a stale copy is refused, the current one closes it
    await expect(commandOrder(order.id, { command: 'close', version: view!.version - 1 }, actor())).rejects.toMatchObject({ code: 'changed_meanwhile' });
    const closed = await commandOrder(order.id, { command: 'close', version: view!.version }, actor());
    expect(closed.status).toBe('closed');
    const audit = await sequelize.query(`SELECT action FROM audit_entries WHERE entity_type = 'hire_order' AND entity_id = $1 ORDER BY id`, {
      bind: [String(order.id)],
      type: 'SELECT',
    });
    expect(audit.map((a) => (a as { action: string }).action)).toEqual(['order.create', 'order.close']);
  });

  test('a single dispatch scan without a load moves the order straight on', async () => {
    const order = await createOrder(input({ quantity: 1, confirm: true }), actor());
    const bin = await preparedBin();
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'dispatch', siteId: w.depot.id, purpose: 'hire', hireOrderId: order.id });
    expect((await HireOrder.findByPk(order.id))!.status).toBe('dispatched');
  });

  test('a voided dispatch rolls the status back: dispatched → loading → confirmed, and the order can be cancelled again', async () => {
    const order = await createOrder(input({ quantity: 2, confirm: true }), actor());
    const scans = [];
    for (const bin of [await preparedBin(), await preparedBin()]) {
      scans.push(await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'dispatch', siteId: w.depot.id, purpose: 'hire', hireOrderId: order.id }));
    }
    expect((await HireOrder.findByPk(order.id))!.status).toBe('dispatched');
    const me: SessionUser = {
      id: w.planner.id!,
      email: 'p@test.example',
      name: 'Planner',
      role: 'planner',
      organisationId: w.operator.id,
      organisationName: '',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    await voidScan(me, scans[1]!.eventId, 'Wrong order scanned', '127.0.0.1');
    let view = (await orderView(order.id))!;
    expect(view.status).toBe('loading');
    expect(view.progress).toEqual({ quantity: 2, loaded: 1, dispatched: 1 });
    await voidScan(me, scans[0]!.eventId, 'Wrong order scanned', '127.0.0.1');
    view = (await orderView(order.id))!;
    expect(view.status).toBe('confirmed');
    expect(view.progress).toEqual({ quantity: 2, loaded: 0, dispatched: 0 });
    expect(view.commands.map((c) => c.command)).toEqual(['cancel']);
    // Dispatched again, it moves on again: the status follows its loads both ways.
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: scans[0]!.assetId, action: 'dispatch', siteId: w.depot.id, purpose: 'hire', hireOrderId: order.id });
    expect((await HireOrder.findByPk(order.id))!.status).toBe('loading');
  });

  test('an order with bins loaded cannot be cancelled, only closed short', async () => {
    const order = await createOrder(input({ quantity: 4, confirm: true }), actor());
    const load = await startLoad({ ...w.yard, id: w.yard.id! }, { purpose: 'hire', hireOrderId: order.id });
    await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: (await preparedBin()).id });
    const v = (await orderView(order.id))!;
    await refused(commandOrder(order.id, { command: 'cancel', version: v.version }, actor()), 'transition_refused', /bins are already loaded/);
    expect((await commandOrder(order.id, { command: 'close', version: v.version }, actor())).status).toBe('closed');
  });
});

describe('the fill planner reads the order and its bin type', () => {
  test('capacity, masses and liner limit come from the order; the usual UN mark of the type is offered', async () => {
    await sequelize.query(`UPDATE assets SET un_marking = '31HA2/Y/03 26/D/Faltwerk 12/10800/1285' WHERE id IN (SELECT id FROM assets ORDER BY id LIMIT 2)`);
    const order = await createOrder(input({ linerMaxFillTempC: 30 }), actor());
    const data = (await fillPlannerData(order.id))!;
    expect(data.binType).toEqual({ name: 'Test bin 1000 L', capacityL: 1000, tareKg: 86, maxGrossKg: 1285, unCode: '31HA2' });
    expect(data.linerMaxFillTempC).toBe(30);
    expect(data.usualMark).toBe('31HA2/Y/03 26/D/Faltwerk 12/10800/1285');
    expect(data.binsWithUsualMark).toBe(2);
    const [{ n }] = await sel<{ n: number }>(`SELECT count(*)::int AS n FROM assets WHERE status <> 'retired'`, []);
    expect(data.binsOfType).toBe(n);
    expect(await fillPlannerData(999_999)).toBeNull();
  });
});

describe('the database keeps the statuses', () => {
  test("the old word 'open' is gone and a new order starts as a draft", async () => {
    const code = await sqlErrorCode(`UPDATE hire_orders SET status = 'open' WHERE id = $1`, [w.order.id]);
    expect(code).toBe('23514');
    const [row] = await sel<{ column_default: string }>(`SELECT column_default FROM information_schema.columns WHERE table_name = 'hire_orders' AND column_name = 'status'`, []);
    expect(row.column_default).toContain('draft');
  });
});

describe('the order list and the API', () => {
  test('filters and paging happen in the database', async () => {
    const all = await listOrders(DEFAULT_ORDER_LIST);
    const [{ n }] = await sel<{ n: number }>(`SELECT count(*)::int AS n FROM hire_orders`, []);
    expect(all.total).toBe(n);
    const drafts = await listOrders({ ...DEFAULT_ORDER_LIST, filters: { status: 'draft' } });
    const [{ d }] = await sel<{ d: number }>(`SELECT count(*)::int AS d FROM hire_orders WHERE status = 'draft'`, []);
    expect(drafts.total).toBe(d);
    expect(drafts.rows.every((r) => r.status === 'draft')).toBe(true);
    const demand = await listOrders({ ...DEFAULT_ORDER_LIST, filters: { status: 'demand' } });
    expect(demand.rows.every((r) => r.status === 'confirmed' || r.status === 'loading')).toBe(true);
    const page1 = await listOrders({ ...DEFAULT_ORDER_LIST, sort: 'reference', size: 2 });
    const page2 = await listOrders({ ...DEFAULT_ORDER_LIST, sort: 'reference', size: 2, page: 2 });
    expect(page1.rows).toHaveLength(2);
    const refs = [...page1.rows, ...page2.rows].map((r) => r.reference);
    expect(refs).toEqual([...refs].sort());
    expect(new Set(refs).size).toBe(refs.length);
    const byRef = await listOrders({ ...DEFAULT_ORDER_LIST, filters: { ref: 'ho-test' } });
    expect(byRef.rows.map((r) => r.reference)).toEqual(['HO-TEST-1']);
    const pct = await listOrders({ ...DEFAULT_ORDER_LIST, filters: { ref: '%' } });
    expect(pct.total).toBe(0); // a LIKE wildcard typed in is a plain character
  });

  test('GET answers 400 on a bad query, 403 for the yard; POST validates and creates', async () => {
    const planner = sessionUser(w.planner);
    const bad = await callRoute(listRoute.GET, { user: planner, path: '/api/planning/orders', query: { status: 'open' } });
    expect(bad.status).toBe(400);
    expect((await json(bad)).error?.message).toContain('status');
    const yard = await callRoute(listRoute.GET, { user: sessionUser(w.yard), path: '/api/planning/orders' });
    expect(yard.status).toBe(403);
    const ok = await callRoute(listRoute.GET, { user: planner, path: '/api/planning/orders', query: { status: 'dispatched', size: '5' } });
    expect(ok.status).toBe(200);

    const invalid = await callRoute(listRoute.POST, { user: planner, path: '/api/planning/orders', method: 'POST', body: { customerId: 'x', quantity: -1 } });
    expect(invalid.status).toBe(400);
    expect((await json(invalid)).error?.code).toBe('validation_failed');
    // a site of another customer does not fit
    const depotAsSite = await callRoute(listRoute.POST, {
      user: planner,
      path: '/api/planning/orders',
      method: 'POST',
      body: { customerId: w.customer.id, deliverySiteId: w.depot2.id, depotSiteId: w.depot.id, binTypeId: w.binType.id, quantity: 2, neededBy: addDays(today(), 3) },
    });
    expect(depotAsSite.status).toBe(400);
    expect(JSON.stringify((await json(depotAsSite)).error?.details)).toContain('deliverySiteId');
    const before = await HireOrder.count();
    const created = await callRoute(listRoute.POST, {
      user: planner,
      path: '/api/planning/orders',
      method: 'POST',
      body: {
        customerId: w.customer.id,
        deliverySiteId: w.customerSite.id,
        depotSiteId: w.depot.id,
        binTypeId: w.binType.id,
        quantity: 2,
        neededBy: addDays(today(), 3),
        linerFoodContact: true,
        linerMaxFillTempC: 40,
        confirm: true,
      },
    });
    expect(created.status).toBe(201);
    const body = (await json<{ data: { id: number; reference: string; status: string } }>(created)).data;
    expect(body.status).toBe('confirmed');
    expect(body.reference).toMatch(/^HO-\d{6}-\d{2}$/);
    expect(await HireOrder.count()).toBe(before + 1);
    const stored = (await HireOrder.findByPk(body.id))!;
    expect([stored.linerFoodContact, stored.linerMaxFillTempC, stored.createdBy]).toEqual([true, 40, w.planner.id]);

    const refused = await callRoute(statusRoute.POST, {
      user: planner,
      path: `/api/planning/orders/${body.id}/status`,
      method: 'POST',
      params: { id: String(body.id) },
      body: { command: 'confirm', version: stored.version },
    });
    expect(refused.status).toBe(422);
    const missing = await callRoute(statusRoute.POST, {
      user: planner,
      path: '/api/planning/orders/abc/status',
      method: 'POST',
      params: { id: 'abc' },
      body: { command: 'cancel', version: 0 },
    });
    expect(missing.status).toBe(404);
    const cancelled = await callRoute(statusRoute.POST, {
      user: planner,
      path: `/api/planning/orders/${body.id}/status`,
      method: 'POST',
      params: { id: String(body.id) },
      body: { command: 'cancel', version: stored.version },
    });
    expect(cancelled.status).toBe(200);
    expect((await HireOrder.findByPk(body.id))!.status).toBe('cancelled');
  });
});
