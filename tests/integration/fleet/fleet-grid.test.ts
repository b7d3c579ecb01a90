import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import Papa from 'papaparse';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, makeUser } from '../support/fixtures';
import { callRoute, json, sessionUser } from '../support/route';
import { countBins, fetchBinsPage, type BinRow } from '@/lib/fleet/fleet-grid.server';
import { parseGridRequest, type QueryContext } from '@/lib/fleet/grid-query';
import { makeGrai } from '@/lib/gs1';
import { GET as binsRoute } from '@/pages/api/fleet/bins/index';
import { GET as exportRoute } from '@/pages/api/fleet/bins/export.csv';
import { GET as countRoute } from '@/pages/api/fleet/bins/count';

// Hand-made bins with known answers. Today is 1 Dec 2026 in Amsterdam (UTC+1 in winter).
const CTX: QueryContext = { timeZone: 'Europe/Amsterdam', today: '2026-12-01' };

let w: Awaited<ReturnType<typeof poolWorld>>;
const ids: Record<string, number> = {};

interface BinSpec {
  key: string;
  serial: string;
  status: string;
  site: 'depot' | 'depot2' | 'customerSite' | null;
  customer?: boolean;
  siteSince: string | null;
  lastScanAt: string | null;
  nextDue: string | null;
  lastInspectionOn?: string | null;
  tripCount: number;
  leg?: string;
  lot?: boolean;
  /** The current trip's delivery: "over free days" counts from it (overdue-return.ts), not from siteSince. */
  deliveredAt?: string;
}

const BINS: BinSpec[] = [
  // arrived 23:30 local on 30 Nov → 1 day at site today; test lapsed on 15 Nov
  {
    key: 'B1',
    serial: 'S-001',
    status: 'available',
    site: 'depot',
    siteSince: '2026-11-30T22:30:00Z',
    lastScanAt: '2026-11-30T22:30:00Z',
    nextDue: '2026-11-15',
    lastInspectionOn: '2024-05-15',
    tripCount: 5,
  },
  // on hire 21 days with 14 free days; test due in 19 days
  {
    key: 'B2',
    serial: 'S-002',
    status: 'on_hire',
    site: 'customerSite',
    customer: true,
    siteSince: '2026-11-10T10:00:00Z',
    deliveredAt: '2026-11-10T10:00:00Z',
    lastScanAt: '2026-11-10T10:00:00Z',
    nextDue: '2026-12-20',
    tripCount: 2,
    lot: true,
  },
  // on site 6 days, delivered 12 days ago (moved between two sites of the customer): inside the free days
  {
    key: 'B3',
    serial: 'S-003',
    status: 'on_hire',
    site: 'customerSite',
    customer: true,
    siteSince: '2026-11-25T10:00:00Z',
    deliveredAt: '2026-11-19T10:00:00Z',
    lastScanAt: '2026-11-25T10:00:00Z',
    nextDue: '2027-06-01',
    tripCount: 9,
    lot: true,
  },
  // folded at the customer 30 days; last scan 00:30 local on 1 Nov → silent exactly 30 days; no periodic test
  {
    key: 'B4',
    serial: 'X-104',
    status: 'awaiting_collection',
    site: 'customerSite',
    customer: true,
    siteSince: '2026-11-01T12:00:00Z',
    deliveredAt: '2026-10-20T12:00:00Z',
    lastScanAt: '2026-10-31T23:30:00Z',
    nextDue: null,
    tripCount: 0,
  },
  // in quarantine since 1 Sep; test due in 35 days (not "soon")
  { key: 'B5', serial: 'X-105', status: 'quarantine', site: 'depot2', siteSince: '2026-09-01T08:00:00Z', lastScanAt: '2026-09-01T08:00:00Z', nextDue: '2027-01-05', tripCount: 1 },
  // on a truck, no site; scanned 00:10 local today; test due today (due soon, not overdue)
  { key: 'B6', serial: 'S-006', status: 'in_transit', site: null, leg: 'outbound', siteSince: null, lastScanAt: '2026-11-30T23:10:00Z', nextDue: '2026-12-01', tripCount: 3 },
  { key: 'B7', serial: 'R-007', status: 'retired', site: 'depot', siteSince: '2025-01-01T09:00:00Z', lastScanAt: '2025-01-01T09:00:00Z', nextDue: null, tripCount: 40 },
];

async function insertBin(spec: BinSpec, n: number) {
  const siteId = spec.site ? w[spec.site].id : null;
  const [rows] = await sequelize.query(
    `INSERT INTO assets (grai, serial, bin_type_id, manufacture_month, status, site_id, site_since, customer_id, leg, liner_lot_id,
                         last_scan_at, trip_count, last_inspection_on, next_intermediate_due, next_full_due, next_due)
     VALUES ($1, $2, $3, '2024-01-01', $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $13, $13) RETURNING id`,
    {
      bind: [
        makeGrai('9529999', '10010', `G${String(n).padStart(5, '0')}`),
        spec.serial,
        w.binType.id,
        spec.status,
        siteId,
        spec.siteSince,
        spec.customer ? w.customer.id : null,
        spec.leg ?? null,
        spec.lot ? w.lot.id : null,
        spec.lastScanAt,
        spec.tripCount,
        spec.lastInspectionOn ?? null,
        spec.nextDue,
      ],
    },
  );
  ids[spec.key] = (rows as Array<{ id: number }>)[0]!.id;
  if (spec.deliveredAt) {
    const [trip] = await sequelize.query(
      `INSERT INTO trips (asset_id, customer_id, depot_site_id, dispatched_at, delivered_at, status) VALUES ($1, $2, $3, $4::timestamptz - interval '1 day', $4, 'open') RETURNING id`,
      { bind: [ids[spec.key], w.customer.id, w.depot.id, spec.deliveredAt] },
    );
    await sequelize.query('UPDATE assets SET current_trip_id = $1 WHERE id = $2', { bind: [(trip as Array<{ id: number }>)[0]!.id, ids[spec.key]] });
  }
}

beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld();
  for (const [i, b] of BINS.entries()) await insertBin(b, i + 1);
});
afterAll(async () => {
  await sequelize.close();
});

async function page(raw: Record<string, unknown>) {
  return fetchBinsPage(parseGridRequest({ startRow: 0, endRow: 100, ...raw }), CTX);
}
const keysOf = (rows: BinRow[]) => rows.map((r) => Object.keys(ids).find((k) => ids[k] === r.id));

/** Outside check for day counts: the calendar day of an instant in a zone, read through ICU (Intl), not luxon or SQL. */
function icuLocalDay(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(iso));
}
function icuDaysSince(iso: string | null): number | null {
  if (!iso) return null;
  return (Date.parse(`${CTX.today}T00:00:00Z`) - Date.parse(`${icuLocalDay(iso, CTX.timeZone)}T00:00:00Z`)) / 86_400_000;
}

describe('one page of the fleet grid against hand-made bins', () => {
  test('default order is by GRAI; a first page that is short tells the row count', async () => {
    const res = await page({});
    expect(keysOf(res.rows)).toEqual(['B1', 'B2', 'B3', 'B4', 'B5', 'B6', 'B7']);
    expect(res.lastRow).toBe(7);
    expect(res.today).toBe('2026-12-01');
    const b2 = res.rows[1]!;
    expect(b2).toMatchObject({
      serial: 'S-002',
      status: 'on_hire',
      customerName: 'Test Customer',
      siteName: 'Customer site',
      binTypeCode: 'T1000',
      linerLot: 'TL-001',
      freeDays: 14,
    });
    expect(b2.lastScanLocal).toBe('2026-11-10 11:00'); // 10:00 UTC is 11:00 in Amsterdam in November
    expect(b2.siteSinceOn).toBe('2026-11-10');
  });

  test('days at site and days since the last scan count calendar days in the operator zone (checked through ICU)', async () => {
    const res = await page({});
    for (const row of res.rows) {
      const spec = BINS.find((b) => ids[b.key] === row.id)!;
      expect(row.daysAtSite).toBe(icuDaysSince(spec.siteSince));
      expect(row.daysSilent).toBe(icuDaysSince(spec.lastScanAt));
    }
    // The 23:30-local arrival counts one day, not zero (UTC would still say 30 Nov 22:30 → 1 too, so check the 00:10 case):
    expect(res.rows.find((r) => r.id === ids.B6)!.daysSilent).toBe(0); // 23:10 UTC on 30 Nov is 00:10 on 1 Dec in Amsterdam
    expect(res.rows.find((r) => r.id === ids.B4)!.daysSilent).toBe(30);
  });

  test('flags: overdue, due within 30 days, over the customer’s free days', async () => {
    const res = await page({});
    const flagged = (f: 'overdue' | 'dueSoon' | 'overFreeDays') => keysOf(res.rows.filter((r) => r[f]));
    expect(flagged('overdue')).toEqual(['B1']);
    expect(flagged('dueSoon')).toEqual(['B2', 'B6']);
    expect(flagged('overFreeDays')).toEqual(['B2', 'B4']);
  });

  test('filter to one status, sorted by next test due', async () => {
    const res = await page({ filterModel: { status: { filterType: 'set', values: ['on_hire'] } }, sortModel: [{ colId: 'nextDue', sort: 'asc' }] });
    expect(keysOf(res.rows)).toEqual(['B2', 'B3']);
    const desc = await page({ filterModel: { status: { filterType: 'set', values: ['on_hire', 'quarantine'] } }, sortModel: [{ colId: 'nextDue', sort: 'desc' }] });
    expect(keysOf(desc.rows)).toEqual(['B3', 'B5', 'B2']);
  });

  test('status and site together; a site filter with "none" finds the bin on a truck', async () => {
    expect(
      keysOf(
        (await page({ filterModel: { status: { filterType: 'set', values: ['on_hire', 'awaiting_collection'] }, site: { filterType: 'set', values: [w.customerSite.id] } } })).rows,
      ),
    ).toEqual(['B2', 'B3', 'B4']);
    expect(keysOf((await page({ filterModel: { site: { filterType: 'set', values: [null] } } })).rows)).toEqual(['B6']);
  });

  test('next due ascending puts bins without a due date last; ties break by id', async () => {
    const res = await page({ sortModel: [{ colId: 'nextDue', sort: 'asc' }] });
    expect(keysOf(res.rows)).toEqual(['B1', 'B6', 'B2', 'B5', 'B3', 'B4', 'B7']);
  });

  test('sorting by days at site follows the arrival instant (in transit has no count and sorts as smallest)', async () => {
    const res = await page({ sortModel: [{ colId: 'daysAtSite', sort: 'desc' }] });
    expect(keysOf(res.rows)).toEqual(['B7', 'B5', 'B4', 'B2', 'B3', 'B1', 'B6']);
    const asc = await page({ sortModel: [{ colId: 'daysAtSite', sort: 'asc' }] });
    expect(keysOf(asc.rows)).toEqual(['B6', 'B1', 'B3', 'B2', 'B4', 'B5', 'B7']);
  });

  test('multi-sort: status (lifecycle order), then trips made descending', async () => {
    const res = await page({
      sortModel: [
        { colId: 'status', sort: 'asc' },
        { colId: 'tripCount', sort: 'desc' },
      ],
    });
    expect(keysOf(res.rows)).toEqual(['B1', 'B6', 'B3', 'B2', 'B4', 'B5', 'B7']);
  });

  test('text, number, date and day-count filters', async () => {
    expect(keysOf((await page({ filterModel: { serial: { filterType: 'text', type: 'startsWith', filter: 'x-' } } })).rows)).toEqual(['B4', 'B5']);
    expect(keysOf((await page({ filterModel: { serial: { filterType: 'text', type: 'equals', filter: 'S-003' } } })).rows)).toEqual(['B3']);
    expect(keysOf((await page({ filterModel: { tripCount: { filterType: 'number', type: 'greaterThan', filter: 4 } } })).rows)).toEqual(['B1', 'B3', 'B7']);
    expect(
      keysOf((await page({ filterModel: { nextDue: { filterType: 'date', type: 'inRange', dateFrom: '2026-12-01 00:00:00', dateTo: '2027-01-05 00:00:00' } } })).rows),
    ).toEqual(['B2', 'B5', 'B6']);
    // last scan "on 1 Dec" in Amsterdam: only the 00:10-local scan, not the 23:30-local one of 30 Nov
    expect(keysOf((await page({ filterModel: { lastScanAt: { filterType: 'date', type: 'equals', dateFrom: '2026-12-01' } } })).rows)).toEqual(['B6']);
    expect(keysOf((await page({ filterModel: { daysSilent: { filterType: 'number', type: 'greaterThanOrEqual', filter: 30 } } })).rows)).toEqual(['B4', 'B5', 'B7']);
    expect(keysOf((await page({ filterModel: { daysAtSite: { filterType: 'number', type: 'inRange', filter: 6, filterTo: 21 } } })).rows)).toEqual(['B2', 'B3']);
    expect(keysOf((await page({ filterModel: { linerLot: { filterType: 'text', type: 'blank' } } })).rows)).toEqual(['B1', 'B4', 'B5', 'B6', 'B7']);
    expect(keysOf((await page({ filterModel: { overFreeDays: { filterType: 'boolean', value: true } } })).rows)).toEqual(['B2', 'B4']);
    expect(keysOf((await page({ filterModel: { dueThisMonth: { filterType: 'boolean', value: true } } })).rows)).toEqual(['B1', 'B2', 'B6']);
  });

  test('pages of two cover the set once, in order; the end is known from a short page or from the count', async () => {
    const sortModel = [{ colId: 'tripCount', sort: 'asc' }];
    const first = await fetchBinsPage(parseGridRequest({ startRow: 0, endRow: 2, sortModel }), CTX);
    expect(first.lastRow).toBeNull();
    expect(await countBins({}, CTX)).toBe(7);
    const seen = [...first.rows];
    for (let start = 2; start < 7; start += 2) {
      const p = await fetchBinsPage(parseGridRequest({ startRow: start, endRow: start + 2, sortModel }), CTX);
      expect(p.lastRow).toBe(start + 2 < 7 ? null : 7);
      seen.push(...p.rows);
    }
    expect(keysOf(seen)).toEqual(['B4', 'B5', 'B2', 'B6', 'B1', 'B3', 'B7']);
    expect((await fetchBinsPage(parseGridRequest({ startRow: 10, endRow: 12 }), CTX)).lastRow).toBe(10);
  });
});

describe('the grid endpoint', () => {
  test('answers a planner with rows; refuses a customer (403)', async () => {
    const planner = sessionUser(w.planner);
    const ok = await callRoute(binsRoute, {
      user: planner,
      path: '/api/fleet/bins',
      query: { startRow: '0', endRow: '50', filterModel: JSON.stringify({ status: { filterType: 'set', values: ['quarantine'] } }) },
    });
    expect(ok.status).toBe(200);
    const body = await json<{ data: { rows: BinRow[]; lastRow: number } }>(ok);
    expect(body.data.rows.map((r) => r.serial)).toEqual(['X-105']);
    expect(body.data.lastRow).toBe(1);
    const refused = await callRoute(binsRoute, { user: sessionUser(w.customerUser), path: '/api/fleet/bins' });
    expect(refused.status).toBe(403);
    expect(await callRoute(binsRoute, { user: null, path: '/api/fleet/bins' }).then((r) => r.status)).toBe(401);
  });

  test('a filter or sort on a column that is not allowed is a 400 that names it', async () => {
    const planner = sessionUser(w.planner);
    const cases: Array<[Record<string, string>, RegExp]> = [
      [{ filterModel: JSON.stringify({ password_hash: { filterType: 'text', type: 'contains', filter: 'a' } }) }, /unknown column "password_hash"/],
      [{ sortModel: JSON.stringify([{ colId: 'email', sort: 'asc' }]) }, /unknown column "email"/],
      [{ sortModel: JSON.stringify([{ colId: 'overdue', sort: 'asc' }]) }, /cannot be sorted/],
      [{ filterModel: JSON.stringify({ serial: { filterType: 'text', type: 'matches', filter: 'a' } }) }, /text operator "matches"/],
      [{ startRow: '0', endRow: '1000' }, /at most 500 rows/],
      [{ filterModel: '{not json' }, /not valid JSON|Some fields/],
      [{ startRow: 'abc' }, /Some fields/],
      [{ limit: '5' }, /Some fields/],
    ];
    for (const [query, message] of cases) {
      const res = await callRoute(binsRoute, { user: planner, path: '/api/fleet/bins', query });
      expect(res.status, JSON.stringify(query)).toBe(400);
      const body = await json(res);
      expect(body.error!.code).toBe('validation_failed');
      expect(body.error!.message + JSON.stringify(body.error!.details ?? '')).toMatch(message);
    }
  });
});

describe('the count endpoint', () => {
  test('counts the filtered set; refuses unknown columns and customers', async () => {
    const planner = sessionUser(w.planner);
    const ok = await callRoute(countRoute, {
      user: planner,
      path: '/api/fleet/bins/count',
      query: { filterModel: JSON.stringify({ overFreeDays: { filterType: 'boolean', value: true } }) },
    });
    expect(ok.status).toBe(200);
    // Both routes read today's clock (the hand-made dates above are fixed to 1 Dec): the count is the list's length,
    // whatever the day the test runs on, and at least the two bins over their free days on 1 Dec.
    const count = (await json<{ data: { count: number } }>(ok)).data.count;
    const list = await callRoute(binsRoute, {
      user: planner,
      path: '/api/fleet/bins',
      query: { startRow: '0', endRow: '100', filterModel: JSON.stringify({ overFreeDays: { filterType: 'boolean', value: true } }) },
    });
    expect(count).toBe((await json<{ data: { rows: BinRow[] } }>(list)).data.rows.length);
    expect(count).toBeGreaterThanOrEqual(2);
    const bad = await callRoute(countRoute, {
      user: planner,
      path: '/api/fleet/bins/count',
      query: { filterModel: JSON.stringify({ secret: { filterType: 'text', type: 'equals', filter: 'x' } }) },
    });
    expect(bad.status).toBe(400);
    expect((await callRoute(countRoute, { user: sessionUser(w.customerUser), path: '/api/fleet/bins/count' })).status).toBe(403);
  });
});

describe('CSV export', () => {
  test('exports the filtered, sorted view with the chosen columns', async () => {
    const res = await callRoute(exportRoute, {
      user: sessionUser(w.planner),
      path: '/api/fleet/bins/export.csv',
      query: {
        filterModel: JSON.stringify({ status: { filterType: 'set', values: ['on_hire', 'awaiting_collection'] } }),
        sortModel: JSON.stringify([{ colId: 'daysAtSite', sort: 'desc' }]),
        columns: 'serial,status,customer,daysAtSite,nextDue,overFreeDays',
      },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="loopfold-bins-\d{4}-\d{2}-\d{2}\.csv"/);
    const text = (await res.text()).replace(/^\uFEFF/, '');
    const parsed = Papa.parse<string[]>(text.trim());
    expect(parsed.data[0]).toEqual(['Serial', 'Status', 'Customer', 'Days at site', 'Next test due', 'Over free days']);
    expect(parsed.data.slice(1).map((r) => [r[0], r[1], r[2], r[4]])).toEqual([
      ['X-104', 'Awaiting collection', 'Test Customer', ''],
      ['S-002', 'On hire', 'Test Customer', '2026-12-20'],
      ['S-003', 'On hire', 'Test Customer', '2027-06-01'],
    ]);
  });

  test('an unknown export column is a 400; a customer gets 403', async () => {
    const bad = await callRoute(exportRoute, { user: sessionUser(w.planner), path: '/api/fleet/bins/export.csv', query: { columns: 'serial,password_hash' } });
    expect(bad.status).toBe(400);
    expect((await json(bad)).error!.message).toMatch(/password_hash/);
    expect((await callRoute(exportRoute, { user: sessionUser(w.customerUser), path: '/api/fleet/bins/export.csv' })).status).toBe(403);
  });

  test('a large export streams every row once, in order, across many cursor chunks', async () => {
    await sequelize.query(
      `INSERT INTO assets (grai, serial, bin_type_id, manufacture_month, status, site_id, site_since, last_scan_at, trip_count)
       SELECT '0952999910010' || '8' || 'L' || lpad(g::text, 6, '0'), 'L' || lpad(g::text, 6, '0'), $1, '2024-01-01', 'available', $2, now(), now(), g % 17
         FROM generate_series(1, 2600) g`,
      { bind: [w.binType.id, w.depot.id] },
    );
    const res = await callRoute(exportRoute, {
      user: sessionUser(w.planner),
      path: '/api/fleet/bins/export.csv',
      query: {
        filterModel: JSON.stringify({ serial: { filterType: 'text', type: 'startsWith', filter: 'L' } }),
        sortModel: JSON.stringify([{ colId: 'serial', sort: 'desc' }]),
        columns: 'serial,tripCount',
      },
    });
    const reader = res.body!.getReader();
    let chunks = 0;
    let text = '';
    const decoder = new TextDecoder();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks += 1;
      text += decoder.decode(value, { stream: true });
    }
    const lines = text.trim().split('\r\n');
    expect(lines).toHaveLength(2601);
    expect(lines[1]).toBe('L002600,16');
    expect(lines[2600]).toBe('L000001,1');
    expect(chunks).toBeGreaterThanOrEqual(4); // header + three 1,000-row fetches
    // the cursor's transaction is closed and its connection handed back
    const [open] = await sequelize.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state LIKE 'idle in transaction%'`);
    expect((open as Array<{ n: number }>)[0]!.n).toBe(0);
  });
});

describe('admins see the grid too', () => {
  test('an admin gets rows', async () => {
    const admin = await makeUser('admin', w.operator.id);
    const res = await callRoute(binsRoute, { user: sessionUser({ id: admin.id, role: 'admin', organisationId: w.operator.id }), path: '/api/fleet/bins' });
    expect(res.status).toBe(200);
  });
});
