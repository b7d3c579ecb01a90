import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld } from '../support/fixtures';
import { handBin, handTrip, logEvent, setAsset, sqlRows } from '../support/hand-made';
import { Organisation, Site, CollectionRequest } from '@/models';
import { loadPoolOverview, type PoolOverview } from '@/lib/fleet/pool-overview.server';
import { STATUSES } from '@/lib/scans/lifecycle';

// The pool overview against hand-made rows: every count is checked twice — against a direct SQL count over
// the same tables (so the grouped queries and the rules in between lose nothing), and against the number
// worked out by hand from the rows below. Operator zone Europe/Amsterdam (CET, UTC+1 in winter, UTC+2 in
// summer); "today" is 30 Nov 2026. All times are midday UTC, so local dates equal the UTC dates.
const NOW = new Date('2026-11-30T12:00:00Z');
const at = (date: string) => `${date}T12:00:00Z`;

let w: Awaited<ReturnType<typeof poolWorld>>;
let overview: PoolOverview;
const ids: Record<string, number> = {};

beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld(); // customer "Test Customer" (14 free days) with site CUS-T1; depots DEP-T1 and DEP-T2
  const c2 = await Organisation.create({ name: 'Second Customer', kind: 'customer', contactEmail: null, freeDays: 21 });
  const c2site = await Site.create({ organisationId: c2.id, code: 'CUS-T2', name: 'Second customer site', kind: 'customer', address: null, latitude: '51.2', longitude: '5.9' });
  const bin = async (name: string, registeredOn = '2025-06-01', siteId = w.depot.id) => {
    const a = await handBin(w.planner, { serial: name.toUpperCase(), binTypeId: w.binType.id, siteId, registeredAt: at(registeredOn) });
    ids[name] = a.id;
    return a.id;
  };
  for (const name of ['b1', 'b2', 'b3', 'b4', 'b5', 'b6', 'b7', 'b8', 'b9', 'b10', 'b11', 'b13', 'b14']) await bin(name);
  await bin('b12', '2026-06-01', w.depot2.id); // joined the pool inside the shrinkage window

  // At depots
  await setAsset(ids.b1!, { last_scan_at: at('2026-11-20'), next_intermediate_due: '2027-01-15', next_full_due: '2029-01-01', next_due: '2027-01-15' });
  await setAsset(ids.b2!, { last_scan_at: at('2026-10-01'), next_intermediate_due: '2026-11-10', next_full_due: '2028-01-01', next_due: '2026-11-10' });
  await setAsset(ids.b3!, {
    status: 'prepared',
    site_id: w.depot2.id,
    liner_lot_id: w.lot.id,
    last_scan_at: at('2026-11-29'),
    next_intermediate_due: '2027-03-10',
    next_full_due: '2027-03-10',
    next_due: '2027-03-10',
  });
  await setAsset(ids.b12!, { last_scan_at: at('2026-11-25') });
  await setAsset(ids.b13!, { status: 'quarantine', last_scan_at: at('2026-11-28') });

  // With customers. b4: delivered 10 Nov, 14 free days → free until 24 Nov, 6 days over on 30 Nov.
  const t4 = await handTrip({
    assetId: ids.b4!,
    customerId: w.customer.id,
    depotSiteId: w.depot.id,
    customerSiteId: w.customerSite.id,
    dispatchedAt: at('2026-11-08'),
    deliveredAt: at('2026-11-10'),
  });
  await setAsset(ids.b4!, { status: 'on_hire', site_id: w.customerSite.id, customer_id: w.customer.id, current_trip_id: t4, last_scan_at: at('2026-11-10') });
  // b5: delivered 20 Nov → 10 days of 14, not overdue.
  const t5 = await handTrip({
    assetId: ids.b5!,
    customerId: w.customer.id,
    depotSiteId: w.depot.id,
    customerSiteId: w.customerSite.id,
    dispatchedAt: at('2026-11-18'),
    deliveredAt: at('2026-11-20'),
  });
  await setAsset(ids.b5!, { status: 'on_hire', site_id: w.customerSite.id, customer_id: w.customer.id, current_trip_id: t5, last_scan_at: at('2026-11-20') });
  // b6: delivered 1 Nov, 21 free days → free until 22 Nov, 8 over; emptied 15 Nov → waiting 15 days.
  const t6 = await handTrip({
    assetId: ids.b6!,
    customerId: c2.id,
    depotSiteId: w.depot.id,
    customerSiteId: c2site.id,
    dispatchedAt: at('2026-10-30'),
    deliveredAt: at('2026-11-01'),
    dischargedAt: at('2026-11-15'),
  });
  await setAsset(ids.b6!, {
    status: 'awaiting_collection',
    site_id: c2site.id,
    customer_id: c2.id,
    current_trip_id: t6,
    site_since: at('2026-11-01'),
    last_scan_at: at('2026-11-15'),
  });
  await CollectionRequest.create({ source: 'portal', siteId: c2site.id, customerId: c2.id, quantity: 1, status: 'open' } as never);
  // b7: delivery never scanned; dispatched 5 Nov → 25 days, 21 free → 4 over, counted from the dispatch.
  const t7 = await handTrip({ assetId: ids.b7!, customerId: c2.id, depotSiteId: w.depot2.id, customerSiteId: c2site.id, dispatchedAt: at('2026-11-05') });
  await setAsset(ids.b7!, { status: 'on_hire', site_id: c2site.id, customer_id: c2.id, current_trip_id: t7, last_scan_at: at('2026-11-05') });
  // b8: on the road out.
  const t8 = await handTrip({ assetId: ids.b8!, customerId: w.customer.id, depotSiteId: w.depot.id, dispatchedAt: at('2026-11-29') });
  await setAsset(ids.b8!, { status: 'in_transit', leg: 'outbound', site_id: null, customer_id: w.customer.id, current_trip_id: t8, last_scan_at: at('2026-11-29') });
  // A finished trip of b1 in September.
  await handTrip({ assetId: ids.b1!, customerId: w.customer.id, depotSiteId: w.depot.id, dispatchedAt: at('2026-09-01'), returnedAt: at('2026-09-25') });

  // Out of the pool. b9 declared missing 10 Mar 2026 (inside the window); b14 on 1 Oct 2025 (before it);
  // b10 retired 20 Dec 2025; b11 declared missing 1 Feb 2026 and found again 15 Feb (back at a depot).
  await setAsset(ids.b9!, {
    status: 'missing',
    site_id: w.customerSite.id,
    customer_id: w.customer.id,
    last_scan_at: at('2026-03-10'),
    next_intermediate_due: '2027-01-20',
    next_full_due: '2029-01-01',
    next_due: '2027-01-20',
  });
  await logEvent({ assetId: ids.b9!, action: 'mark_missing', occurredAt: at('2026-03-10'), statusTo: 'missing' });
  await setAsset(ids.b14!, { status: 'missing', last_scan_at: at('2025-10-01') });
  await logEvent({ assetId: ids.b14!, action: 'mark_missing', occurredAt: at('2025-10-01'), statusTo: 'missing' });
  await setAsset(ids.b10!, { status: 'retired', last_scan_at: at('2025-12-20'), next_intermediate_due: '2027-01-05', next_full_due: '2029-01-01', next_due: '2027-01-05' });
  await logEvent({ assetId: ids.b10!, action: 'retire', occurredAt: at('2025-12-20'), statusTo: 'retired' });
  await setAsset(ids.b11!, { site_id: w.depot2.id, last_scan_at: at('2026-02-15') });
  await logEvent({ assetId: ids.b11!, action: 'mark_missing', occurredAt: at('2026-02-01'), statusTo: 'missing' });
  await logEvent({ assetId: ids.b11!, action: 'mark_found', occurredAt: at('2026-02-15'), statusTo: 'available' });
  // A voided declaration does not count.
  await logEvent({ assetId: ids.b1!, action: 'mark_missing', occurredAt: at('2026-05-01'), statusTo: 'missing', voided: true });

  overview = await loadPoolOverview({ staleDays: 30, now: NOW });
});
afterAll(async () => {
  await sequelize.close();
});

describe('counts by status and site', () => {
  test('status totals equal a direct count per status, and the hand count', async () => {
    const direct = await sqlRows<{ status: string; n: number }>('SELECT status, count(*)::int AS n FROM assets GROUP BY status');
    for (const s of STATUSES) expect(overview.byStatus[s], s).toBe(direct.find((r) => r.status === s)?.n ?? 0);
    expect(overview.byStatus).toMatchObject({ available: 4, prepared: 1, on_hire: 3, awaiting_collection: 1, in_transit: 1, quarantine: 1, missing: 2, retired: 1, in_repair: 0 });
    expect(overview.inService).toBe(11);
    expect(overview.today).toBe('2026-11-30');
  });

  test('per site (missing and retired left out) equals a direct count per site and status', async () => {
    const direct = await sqlRows<{ code: string | null; status: string; n: number }>(
      `SELECT s.code, a.status, count(*)::int AS n FROM assets a LEFT JOIN sites s ON s.id = a.site_id
        WHERE a.status NOT IN ('retired', 'missing') GROUP BY 1, 2`,
    );
    for (const row of direct) {
      const counts = row.code === null ? overview.noSite : overview.sites.find((s) => s.code === row.code)!.byStatus;
      expect(counts[row.status as keyof typeof counts], `${row.code} ${row.status}`).toBe(row.n);
    }
    const totals = Object.fromEntries(overview.sites.map((s) => [s.code, s.total]));
    expect(totals).toEqual({ 'DEP-T1': 3, 'DEP-T2': 3, 'CUS-T1': 2, 'CUS-T2': 2 });
    expect(overview.noSite.in_transit).toBe(1);
    expect(overview.sites.map((s) => s.kind)).toEqual(['depot', 'depot', 'customer', 'customer']); // depots first
  });
});

describe('with customers and overdue back', () => {
  test('per customer: on hire, awaiting collection, overdue (hand-worked) — totals equal a direct count', async () => {
    const [direct] = await sqlRows<{ on_hire: number; awaiting: number }>(
      `SELECT count(*) FILTER (WHERE status = 'on_hire')::int AS on_hire, count(*) FILTER (WHERE status = 'awaiting_collection')::int AS awaiting FROM assets`,
    );
    expect(overview.customers.reduce((n, c) => n + c.onHire, 0)).toBe(direct!.on_hire);
    expect(overview.customers.reduce((n, c) => n + c.awaitingCollection, 0)).toBe(direct!.awaiting);
    const byName = Object.fromEntries(overview.customers.map((c) => [c.name, c]));
    expect(byName['Test Customer']).toMatchObject({ freeDays: 14, onHire: 2, awaitingCollection: 0, overdue: 1, overdueEstimated: 0, worstDaysOver: 6 });
    expect(byName['Second Customer']).toMatchObject({ freeDays: 21, onHire: 1, awaitingCollection: 1, overdue: 2, overdueEstimated: 1, worstDaysOver: 8 });
    expect(overview.overdueTotal).toBe(3);
  });

  test('the longest overdue first: b6 (8 days), b4 (6), b7 (4, from dispatch)', () => {
    expect(overview.overdueBins.map((b) => [b.serial, b.daysOver, b.freeUntil, b.estimated])).toEqual([
      ['B6', 8, '2026-11-22', false],
      ['B4', 6, '2026-11-24', false],
      ['B7', 4, '2026-11-26', true],
    ]);
  });

  test('empties waiting: one at CUS-T2, emptied 15 Nov (15 days), one collection request open', () => {
    expect(overview.empties).toEqual([
      {
        siteId: expect.any(Number),
        code: 'CUS-T2',
        name: 'Second customer site',
        customerName: 'Second Customer',
        count: 1,
        oldestSince: '2026-11-15',
        longestWaitDays: 15,
        openRequests: 1,
      },
    ]);
  });
});

describe('not scanned for N days', () => {
  test('30 days: b2 (1 Oct) and b11 (15 Feb); equals a direct count of in-service bins last scanned before 1 Nov', async () => {
    const [direct] = await sqlRows<{ n: number }>(
      `SELECT count(*)::int AS n FROM assets WHERE status NOT IN ('retired', 'missing') AND last_scan_at < '2026-11-01T00:00:00+01:00'`,
    );
    expect(overview.stale).toMatchObject({ days: 30, firstRecentDay: '2026-11-01', count: direct!.n });
    expect(overview.stale.bins.map((b) => b.serial)).toEqual(['B11', 'B2']); // oldest scan first
  });

  test('60 days still takes b2 (scanned 60 days ago); 61 days does not', async () => {
    expect((await loadPoolOverview({ staleDays: 60, now: NOW })).stale.count).toBe(2);
    expect((await loadPoolOverview({ staleDays: 61, now: NOW })).stale.count).toBe(1);
  });
});

describe('shrinkage over the last 365 days (1 Dec 2025 – 30 Nov 2026)', () => {
  test('declared 2 (b9, b11; the voided one and b14 before the window do not count), found again 1 → 1 lost', () => {
    expect(overview.shrinkage).toMatchObject({ window: { from: '2025-12-01', to: '2026-11-30' }, declaredMissing: 2, foundAgain: 1 });
  });

  test('pool 12 at the start (13 registered, less b14 gone before it) and 11 now: 1 / 11.5 = 8.70 % a year', () => {
    expect(overview.shrinkage).toMatchObject({ poolAtStart: 12, poolAtEnd: 11 });
    expect(overview.shrinkage.result.ratePerYear).toBeCloseTo(1 / 11.5, 12);
  });
});

describe('by month', () => {
  test('trips per month equal direct counts by local month', async () => {
    const direct = await sqlRows<{ month: string; n: number }>(
      `SELECT to_char(dispatched_at AT TIME ZONE 'Europe/Amsterdam', 'YYYY-MM') AS month, count(*)::int AS n FROM trips GROUP BY 1`,
    );
    for (const row of direct) expect(overview.tripsPerMonth.find((m) => m.month === row.month)?.dispatched, row.month).toBe(row.n);
    expect(overview.tripsPerMonth).toHaveLength(18);
    expect(overview.tripsPerMonth[0]!.month).toBe('2025-06');
    expect(overview.tripsPerMonth.find((m) => m.month === '2026-09')).toMatchObject({ dispatched: 1, returned: 1 });
    expect(overview.tripsPerMonth.find((m) => m.month === '2026-11')).toMatchObject({ dispatched: 4, returned: 0 });
  });

  test('tests due: b2 overdue; Jan 2027 a periodic test (b1); Mar 2027 a full inspection (b3); missing and retired left out', () => {
    expect(overview.testsDue.overdue).toBe(1);
    expect(overview.testsDue.months[0]!.month).toBe('2026-11');
    expect(overview.testsDue.months.find((m) => m.month === '2027-01')).toMatchObject({ intermediate: 1, full: 0 });
    expect(overview.testsDue.months.find((m) => m.month === '2027-03')).toMatchObject({ intermediate: 0, full: 1 });
    expect(overview.testsDue.months.reduce((n, m) => n + m.intermediate + m.full, 0)).toBe(2);
  });
});
