import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import Papa from 'papaparse';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, makeUser } from '../support/fixtures';
import { handBin, handTrip, logEvent, setAsset } from '../support/hand-made';
import { Organisation } from '@/models';
import { reuseData } from '@/lib/trips/reuse-data.server';
import { reuseByYear, reuseCsv, reuseSummary } from '@/lib/trips/reuse-report';
import { GET } from '@/pages/api/fleet/reuse.csv';
import type { SessionUser } from '@/lib/accounts/session-user.server';

// The reuse report read from the database: four bins with the same history as the hand-worked case in
// tests/unit/reuse-report.test.ts (commissioned 15 Jun 2024, 1 Mar 2025, 20 Nov 2026, 10 Jan 2024; the
// second declared missing on 10 Feb 2026, the fourth retired on 1 May 2025), now as registrations, trips
// and log entries, so the SQL grouping by year, period and customer is what is under test. Instants are at
// 10:00 UTC, the same calendar day in Europe/Amsterdam.
const at = (date: string) => `${date}T10:00:00Z`;
const NOW = new Date('2026-12-01T12:00:00Z');
const PERIOD = { from: '2025-12-02', to: '2026-12-01' };
const GRAI = (serial: string) => `09529999100108${serial}`; // 952999910010 → check digit 8 (GS1 mod-10, worked in labels.test.ts)
let C1: number;
let planner: SessionUser;
let customerUser: SessionUser;

beforeAll(async () => {
  await resetDatabase();
  const w = await poolWorld();
  C1 = w.customer.id; // "Test Customer"
  const C2 = (await Organisation.create({ name: 'Bravo Blending', kind: 'customer', contactEmail: null, freeDays: 21 })).id;
  const bin = async (serial: string, on: string) => (await handBin(w.planner, { serial, binTypeId: w.binType.id, siteId: w.depot.id, registeredAt: at(on) })).id;
  const B1 = await bin('100001', '2024-06-15');
  const B2 = await bin('100002', '2025-03-01');
  const B3 = await bin('100010', '2026-11-20');
  const B4 = await bin('100003', '2024-01-10');
  // Closed trips, each dispatched ten days before it came back (customer, return date).
  const rotations: Array<[number, number, string]> = [
    [B1, C2, '2024-08-01'],
    [B1, C2, '2024-09-15'],
    [B1, C2, '2024-11-01'],
    [B1, C2, '2025-02-01'],
    [B1, C2, '2025-05-01'],
    [B1, C1, '2025-08-01'],
    [B1, C2, '2025-12-05'],
    [B1, C2, '2025-12-20'],
    [B1, C1, '2026-03-01'],
    [B1, C1, '2026-09-01'],
    [B2, C1, '2025-04-15'],
    [B2, C2, '2025-06-01'],
    [B2, C2, '2025-09-01'],
    [B2, C2, '2025-12-10'],
    [B4, C2, '2024-02-01'],
    [B4, C2, '2024-03-01'],
    [B4, C2, '2024-04-01'],
    [B4, C2, '2024-05-01'],
    [B4, C2, '2024-06-01'],
    [B4, C2, '2025-03-01'],
  ];
  for (const [assetId, customerId, back] of rotations) {
    const out = new Date(Date.parse(at(back)) - 10 * 86_400_000).toISOString();
    await handTrip({ assetId, customerId, depotSiteId: w.depot.id, dispatchedAt: out, returnedAt: at(back) });
  }
  // An open trip does not count as a rotation.
  await handTrip({ assetId: B3, customerId: C1, depotSiteId: w.depot.id, dispatchedAt: at('2026-11-25') });
  await setAsset(B2, { status: 'missing' });
  await logEvent({ assetId: B2, action: 'mark_missing', occurredAt: at('2026-02-10'), statusTo: 'missing' });
  await setAsset(B4, { status: 'retired' });
  await logEvent({ assetId: B4, action: 'retire', occurredAt: at('2025-05-01'), statusTo: 'retired' });

  const p = await makeUser('planner', w.operator.id);
  planner = { id: p.id, email: p.email, name: p.name, role: 'planner', organisationId: w.operator.id, organisationName: 'Test Pool', homeSiteId: null, qualifiedInspector: false };
  const c = await makeUser('customer', w.customer.id);
  customerUser = {
    id: c.id,
    email: c.email,
    name: c.name,
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

function get(search: string, user: SessionUser | null): Promise<Response> {
  const request = new Request(`http://pool.test/api/fleet/reuse.csv${search}`);
  return GET({ request, url: new URL(request.url), params: {}, locals: { user, clientAddress: '192.0.2.8' } } as unknown as APIContext) as Promise<Response>;
}

describe('the rows behind the report', () => {
  test('commissioning and leaving dates come from the log; rotations by year and in the period from the trips', async () => {
    const data = await reuseData(PERIOD, null, NOW);
    const bySerial = Object.fromEntries(data!.bins.map((b) => [b.serial, b]));
    expect(bySerial['100001']).toMatchObject({
      commissionedOn: '2024-06-15',
      leftOn: null,
      rotationsTotal: 10,
      rotationsByYear: { 2024: 3, 2025: 5, 2026: 2 },
      rotationsInPeriod: 4,
    });
    expect(bySerial['100002']).toMatchObject({ commissionedOn: '2025-03-01', leftOn: '2026-02-10', rotationsTotal: 4, rotationsByYear: { 2025: 4 }, rotationsInPeriod: 1 });
    expect(bySerial['100010']).toMatchObject({ commissionedOn: '2026-11-20', leftOn: null, rotationsTotal: 0, rotationsInPeriod: 0 });
    expect(bySerial['100003']).toMatchObject({ commissionedOn: '2024-01-10', leftOn: '2025-05-01', rotationsTotal: 6, rotationsByYear: { 2024: 5, 2025: 1 } });
    expect(data!.today).toBe('2026-12-01');
  });

  test('the figures equal the hand-worked case: 3 bins in the pool, 2 reused, 5 rotations over 448 bin-days, 20 / 4 since commissioning', async () => {
    const data = await reuseData(PERIOD, null, NOW);
    const s = reuseSummary(data!.bins, PERIOD, data!.today, data!.scope);
    expect(s).toMatchObject({ bins: 3, binsReused: 2, rotations: 5, binDays: 448, binsEverCommissioned: 4, averageRotationsSinceCommissioning: 5 });
    expect(reuseByYear(data!.bins, data!.today, data!.scope).map((y) => [y.year, y.bins, y.rotations, y.binDays])).toEqual([
      [2026, 3, 2, 388],
      [2025, 3, 10, 792],
      [2024, 2, 8, 557],
    ]);
  });

  test('one customer: only their rotations count', async () => {
    const data = await reuseData(PERIOD, C1, NOW);
    expect(data!.scope).toEqual({ kind: 'customer', name: 'Test Customer' });
    const bySerial = Object.fromEntries(data!.bins.map((b) => [b.serial, b]));
    expect(bySerial['100001']).toMatchObject({ rotationsTotal: 3, rotationsByYear: { 2025: 1, 2026: 2 }, rotationsInPeriod: 2 });
    expect(bySerial['100002']).toMatchObject({ rotationsTotal: 1, rotationsInPeriod: 0 });
    const csv = reuseCsv(data!.bins, PERIOD, data!.today, data!.scope);
    expect(csv.rows).toEqual([['Test Customer', GRAI('100001'), '100001', 'T1000', '2024-06-15', '', PERIOD.from, PERIOD.to, 2, 3, 2.46, 1.22]]); // counts and rates as numbers, not text
  });

  test('an unknown customer: null (the endpoint answers 404)', async () => {
    expect(await reuseData(PERIOD, 999_999, NOW)).toBeNull();
  });
});

describe('GET /api/fleet/reuse.csv', () => {
  // A period safely in the past, so the answer does not depend on the day the test runs, except the
  // years-in-service columns, which run to today and are checked for their form only.
  test('the whole pool in 2025: one row per bin in the pool, UTF-8 with a byte-order mark, as an attachment', async () => {
    const res = await get('?from=2025-01-01&to=2025-12-31', planner);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="reuse-2025-01-01-to-2025-12-31.csv"');
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]); // the UTF-8 byte-order mark
    const text = new TextDecoder().decode(bytes); // decoding drops the mark
    const lines = text.trimEnd().split('\r\n');
    expect(lines[0]).toBe(
      'grai,serial,bin_type,commissioned_on,left_pool_on,period_from,period_to,rotations_in_period,rotations_since_commissioning,years_in_service,rotations_per_year_in_service',
    );
    // B3 joined in 2026: not in the pool in 2025. B4 left on 1 May 2025: in the pool for part of the year.
    const rows = lines.slice(1).map((l) => l.split(','));
    expect(rows.map((r) => r.slice(0, 9))).toEqual([
      [GRAI('100001'), '100001', 'T1000', '2024-06-15', '', '2025-01-01', '2025-12-31', '5', '10'],
      [GRAI('100002'), '100002', 'T1000', '2025-03-01', '2026-02-10', '2025-01-01', '2025-12-31', '4', '4'],
      [GRAI('100003'), '100003', 'T1000', '2024-01-10', '2025-05-01', '2025-01-01', '2025-12-31', '1', '6'],
    ]);
    for (const r of rows) expect(r.slice(9).every((v) => /^\d+(\.\d{1,2})?$/.test(v))).toBe(true); // numbers, at most two decimals
    // The same text read by a general CSV parser gives the same table.
    expect(
      Papa.parse<string[]>(text.trimEnd(), { newline: '\r\n' })
        .data.slice(1)
        .map((r) => r.slice(0, 9)),
    ).toEqual(rows.map((r) => r.slice(0, 9)));
  });

  test('one customer: their name on every row and in the file name', async () => {
    const res = await get(`?from=2025-01-01&to=2025-12-31&customer=${C1}`, planner);
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="reuse-2025-01-01-to-2025-12-31-test-customer.csv"');
    const lines = (await res.text()).trimEnd().split('\r\n'); // text() drops the byte-order mark
    expect(lines[0]!.startsWith('customer,grai,')).toBe(true);
    expect(lines[0]).toContain('rotations_for_customer_in_period');
    // 2025 for Test Customer: B1 came back once (1 Aug), B2 once (15 Apr).
    expect(lines.slice(1).map((l) => l.split(',').slice(0, 10))).toEqual([
      ['Test Customer', GRAI('100001'), '100001', 'T1000', '2024-06-15', '', '2025-01-01', '2025-12-31', '1', '3'],
      ['Test Customer', GRAI('100002'), '100002', 'T1000', '2025-03-01', '2026-02-10', '2025-01-01', '2025-12-31', '1', '1'],
    ]);
  });

  test('refusals: an unknown parameter or a bad period (400), an unknown customer (404), a customer user (403)', async () => {
    expect((await get('?from=2025-01-01&format=xlsx', planner)).status).toBe(400);
    expect((await get('?from=2025-02-30', planner)).status).toBe(400);
    expect((await get('?from=2025-06-01&to=2025-01-01', planner)).status).toBe(400);
    expect((await get('?customer=abc', planner)).status).toBe(400);
    expect((await get('?customer=999999', planner)).status).toBe(404);
    expect((await get('', customerUser)).status).toBe(403);
  });
});
