import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, makeUser } from '../support/fixtures';
import { handBin, handTrip, logEvent, setAsset } from '../support/hand-made';
import { Organisation } from '@/models';
import { listTrips } from '@/lib/trips/trip-list.server';
import { loadTripView } from '@/lib/trips/trip-view.server';
import { parseTripListQuery, type TripListQuery } from '@/lib/trips/trip-list-query';
import { GET } from '@/pages/api/trips/index';
import type { SessionUser } from '@/lib/accounts/session-user.server';

// The trip list against hand-made trips: sorting by every whitelisted column, the filters, paging, the API's
// answers to bad columns, and the trip page's data. Zone Europe/Amsterdam; the spring and summer instants
// below are at 10:00 UTC = 12:00 CEST, so local date = UTC date. Day counts worked by hand:
//   t1 bin 10  cust A  depot 1  out 2 Mar, delivered 3 Mar, collected 20 Mar, back 22 Mar → at customer 17, cycle 20
//   t2 bin 7   cust B  depot 2  out 10 Apr, delivered 12 Apr, collected 30 Apr, back 2 May  → 18, cycle 22; seals B1 ≠ B9 (flagged)
//   t3 bin 100 cust A  depot 1  out 5 May, no delivery scan, collected 15 May, back 16 May → 10 (from dispatch, estimated), cycle 11
//   t4 bin 10  cust B  depot 1  out 1 Jun, delivered 2 Jun, still out                     → none, none
//   t5 bin 7   cust A  depot 2  out 20 May, back 10 Jun, no delivery or collection scans    → 21 (estimated), cycle 21; seals C1 vs c1 (not flagged)
const at = (date: string) => `${date}T10:00:00Z`;
let w: Awaited<ReturnType<typeof poolWorld>>;
const trip: Record<string, number> = {};
let customerB: Organisation;
let planner: SessionUser;
let customerUser: SessionUser;

const query = (params: Record<string, string> = {}): TripListQuery => {
  const parsed = parseTripListQuery(params);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return parsed.query;
};
const order = async (params: Record<string, string>) => (await listTrips(query(params))).rows.map((r) => Object.entries(trip).find(([, id]) => id === r.id)![0]);

function get(search: string, user: SessionUser | null): Promise<Response> {
  const request = new Request(`http://pool.test/api/trips${search}`);
  return GET({ request, url: new URL(request.url), params: {}, locals: { user, clientAddress: '192.0.2.7' } } as unknown as APIContext) as Promise<Response>;
}

beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld();
  customerB = await Organisation.create({ name: 'Bravo Blending', kind: 'customer', contactEmail: null, freeDays: 21 });
  const bins: Record<string, number> = {};
  for (const serial of ['10', '7', '100']) bins[serial] = (await handBin(w.planner, { serial, binTypeId: w.binType.id, siteId: w.depot.id, registeredAt: at('2026-01-05') })).id;
  const A = w.customer.id; // "Test Customer"
  const B = customerB.id;
  trip.t1 = await handTrip({
    assetId: bins['10']!,
    customerId: A,
    depotSiteId: w.depot.id,
    customerSiteId: w.customerSite.id,
    linerLotId: w.lot.id,
    dispatchedAt: at('2026-03-02'),
    deliveredAt: at('2026-03-03'),
    collectedAt: at('2026-03-20'),
    returnedAt: at('2026-03-22'),
    fillProduct: 'Test oil',
    fillVolumeL: 900,
    sealsApplied: ['A1', 'A2'],
    sealsVerified: ['A2', 'A1'],
  });
  trip.t2 = await handTrip({
    assetId: bins['7']!,
    customerId: B,
    depotSiteId: w.depot2.id,
    dispatchedAt: at('2026-04-10'),
    deliveredAt: at('2026-04-12'),
    collectedAt: at('2026-04-30'),
    returnedAt: at('2026-05-02'),
    sealsApplied: ['B1'],
    sealsVerified: ['B9'],
    sealMismatch: true,
  });
  trip.t3 = await handTrip({
    assetId: bins['100']!,
    customerId: A,
    depotSiteId: w.depot.id,
    dispatchedAt: at('2026-05-05'),
    collectedAt: at('2026-05-15'),
    returnedAt: at('2026-05-16'),
  });
  trip.t4 = await handTrip({ assetId: bins['10']!, customerId: B, depotSiteId: w.depot.id, dispatchedAt: at('2026-06-01'), deliveredAt: at('2026-06-02') });
  trip.t5 = await handTrip({
    assetId: bins['7']!,
    customerId: A,
    depotSiteId: w.depot2.id,
    dispatchedAt: at('2026-05-20'),
    returnedAt: at('2026-06-10'),
    sealsApplied: ['C1'],
    sealsVerified: ['c1'],
  });
  await setAsset(bins['10']!, { status: 'on_hire', site_id: w.customerSite.id, customer_id: B, current_trip_id: trip.t4 });
  await logEvent({ assetId: bins['7']!, action: 'dispatch', occurredAt: at('2026-04-10'), statusTo: 'in_transit', tripId: trip.t2, siteId: w.depot2.id });
  await logEvent({ assetId: bins['7']!, action: 'discharge', occurredAt: at('2026-04-28'), statusTo: 'on_hire', tripId: trip.t2 });

  const plannerRow = await makeUser('planner', w.operator.id);
  planner = {
    id: plannerRow.id,
    email: plannerRow.email,
    name: plannerRow.name,
    role: 'planner',
    organisationId: w.operator.id,
    organisationName: 'Test Pool',
    homeSiteId: null,
    qualifiedInspector: false,
  };
  const customerRow = await makeUser('customer', w.customer.id);
  customerUser = {
    id: customerRow.id,
    email: customerRow.email,
    name: customerRow.name,
    role: 'customer',
    organisationId: w.customer.id,
    organisationName: 'Test Customer',
    homeSiteId: null,
    qualifiedInspector: false,
  };
});
afterAll(async () => {
  await sequelize.close();
});

describe('the figures on each row', () => {
  test('days at the customer and cycle per the hand-worked list above; estimates marked', async () => {
    const { rows } = await listTrips(query({ sort: 'id', dir: 'asc' }));
    expect(rows.map((r) => [r.dwell?.days ?? null, r.dwell?.estimated ?? null, r.cycleDays])).toEqual([
      [17, false, 20],
      [18, false, 22],
      [10, true, 11],
      [null, null, null],
      [21, true, 21],
    ]);
    expect(rows[0]).toMatchObject({
      serial: '10',
      customerName: 'Test Customer',
      depotName: 'Test depot',
      linerLotNumber: 'TL-001',
      fill: 'Test oil · 900\u00a0L',
      status: 'closed',
      dispatchedOn: '2026-03-02',
      returnedOn: '2026-03-22',
    });
    expect(rows.map((r) => r.seals.state)).toEqual(['match', 'mismatch', 'not_sealed', 'not_sealed', 'mismatch']);
  });
});

describe('sorting on the server', () => {
  test('newest dispatch first by default', async () => {
    expect(await order({})).toEqual(['t4', 't5', 't3', 't2', 't1']);
  });

  test('bin serials in number order (7, 10, 100), ties by trip number', async () => {
    expect(await order({ sort: 'bin', dir: 'asc' })).toEqual(['t2', 't5', 't1', 't4', 't3']);
  });

  test('days at the customer ascending and descending; the open trip (unknown) last both ways', async () => {
    expect(await order({ sort: 'dwell', dir: 'asc' })).toEqual(['t3', 't1', 't2', 't5', 't4']);
    expect(await order({ sort: 'dwell', dir: 'desc' })).toEqual(['t5', 't2', 't1', 't3', 't4']);
  });

  test('cycle, back date, customer, depot, status', async () => {
    expect(await order({ sort: 'cycle', dir: 'asc' })).toEqual(['t3', 't1', 't5', 't2', 't4']);
    expect(await order({ sort: 'returned', dir: 'asc' })).toEqual(['t1', 't2', 't3', 't5', 't4']);
    expect(await order({ sort: 'customer', dir: 'asc' })).toEqual(['t2', 't4', 't1', 't3', 't5']); // Bravo… before Test…
    expect(await order({ sort: 'depot', dir: 'desc' })).toEqual(['t4', 't3', 't1', 't5', 't2']); // "Test depot" > "Second depot"
    expect(await order({ sort: 'status', dir: 'desc' })).toEqual(['t4', 't5', 't3', 't2', 't1']); // open > closed
  });
});

describe('filters', () => {
  test('customer, depot, status, liner lot', async () => {
    expect(await order({ customer: String(w.customer.id), sort: 'id', dir: 'asc' })).toEqual(['t1', 't3', 't5']);
    expect(await order({ depot: String(w.depot2.id), sort: 'id', dir: 'asc' })).toEqual(['t2', 't5']);
    expect(await order({ status: 'open' })).toEqual(['t4']);
    expect(await order({ lot: 'tl-0' })).toEqual(['t1']);
  });

  test('a serial matches from its beginning (10 → 10 and 100); a whole GRAI, even grouped or as a link, names one bin', async () => {
    expect(await order({ bin: '10', sort: 'id', dir: 'asc' })).toEqual(['t1', 't3', 't4']);
    // 952999910010 → check digit 8 (GS1 mod-10, worked in tests/integration/labels.test.ts)
    expect(await order({ bin: '0 9529999 10010 8 · 100', sort: 'id', dir: 'asc' })).toEqual(['t3']);
    expect(await order({ bin: 'http://localhost:4321/8003/095299991001087', sort: 'id', dir: 'asc' })).toEqual(['t2', 't5']);
    expect(await order({ bin: '%' })).toEqual([]); // typed wildcards match literally
  });

  test('dispatch dates (local days, both included) and seal mismatches (flagged or not the same numbers)', async () => {
    expect(await order({ from: '2026-04-10', to: '2026-05-20', sort: 'id', dir: 'asc' })).toEqual(['t2', 't3', 't5']);
    expect(await order({ mismatch: '1', sort: 'id', dir: 'asc' })).toEqual(['t2', 't5']);
  });
});

describe('paging', () => {
  test('two per page: 5 trips on 3 pages, in order; a page past the end is empty', async () => {
    const pages = await Promise.all([1, 2, 3, 4].map((page) => listTrips(query({ size: '2', page: String(page) }))));
    expect(pages.map((p) => p.rows.map((r) => r.id))).toEqual([[trip.t4, trip.t5], [trip.t3, trip.t2], [trip.t1], []]);
    expect(pages[0]).toMatchObject({ total: 5, pages: 3, page: 1, size: 2 });
  });
});

describe('GET /api/trips', () => {
  test('answers a page in the data envelope', async () => {
    const res = await get(`?customer=${customerB.id}&sort=dispatched&dir=asc`, planner);
    expect(res.status).toBe(200);
    const { data } = (await res.json()) as { data: { total: number; rows: Array<{ id: number }> } };
    expect(data.total).toBe(2);
    expect(data.rows.map((r) => r.id)).toEqual([trip.t2, trip.t4]);
  });

  test('a column that is not on the whitelist → 400 naming the allowed ones; nothing reaches SQL', async () => {
    for (const search of ['?sort=password_hash', '?sort=id;drop%20table%20trips', '?dir=sideways', '?customer_name=x', '?customer=1%20OR%201=1', '?page=0']) {
      const res = await get(search, planner);
      expect(res.status, search).toBe(400);
      const body = (await res.json()) as { error: { code: string; message: string; details: unknown[] } };
      expect(body.error.code).toBe('bad_request');
      expect(body.error.details.length).toBeGreaterThan(0);
    }
    const res = await get('?sort=password_hash', planner);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/must be one of: dispatched, returned, bin/);
    const [rows] = await sequelize.query('SELECT count(*)::int AS n FROM trips');
    expect(rows).toEqual([{ n: 5 }]); // the table and its five trips are still there
  });

  test('a customer user may not list trips (403); no session (401)', async () => {
    expect((await get('', customerUser)).status).toBe(403);
    expect((await get('', null)).status).toBe(401);
  });
});

describe('the trip page data', () => {
  test('the trip with its events, newest first, shaped for the timeline', async () => {
    const view = await loadTripView(trip.t2!);
    expect(view!.trip).toMatchObject({ id: trip.t2, serial: '7', customerName: 'Bravo Blending', seals: { state: 'mismatch', label: 'Seal mismatch' }, cycleDays: 22 });
    expect(view!.events.map((e) => e.action)).toEqual(['discharge', 'dispatch']);
    expect(view!.events[0]).toMatchObject({ tripId: trip.t2, inferred: false, voided: null, payload: {} });
    expect(await loadTripView(999_999)).toBeNull();
  });
});
