import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { differenceInCalendarDays, parseISO } from 'date-fns';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld } from '../support/fixtures';
import { handBin, handTrip } from '../support/hand-made';
import { Organisation } from '@/models';
import { tripStatistics, tripsForPeriod } from '@/lib/trips/trip-statistics.server';

// Trip statistics read from the database for April 2026 (30 days), checked against values worked by hand.
// Zone Europe/Amsterdam, CEST (UTC+2) all month; instants are 10:00 UTC = 12:00 local, so local date = UTC
// date. Conventions: calendar-day differences; on hire from the dispatch day up to, not including, the
// return day; periods include both ends (src/lib/trips/trip-stats.ts). The trips:
//   bin A: a0 C1 depot 1, 1 → 25 Mar (before April; gives A's first depot gap, 25 Mar → 2 Apr = 8 days)
//          a1 C1 depot 1, out 2 Apr, delivered 3, collected 15, back 17 Apr → cycle 15, at customer 12, on hire 2–16 Apr = 15 days
//          a2 C2 depot 2, out 20 Apr, delivered 21, still out → on hire 20–30 Apr = 11 days; gap 17 → 20 Apr = 3 days
//   bin B: b1 C2 depot 1, out 5 Apr, delivered 6, collected 26, back 28 Apr → cycle 23, at customer 20, on hire 5–27 Apr = 23 days
//          bx C1 depot 1, out 5 May → after April, not read
//   bin C: c0 C1 depot 2, 10 Jan → 1 Feb 2025 (more than a year before April: its gap is not looked for)
//          c1 C1 depot 2, out 10 Apr, delivered 11, collected 20, back 22 Apr → cycle 12, at customer 9, on hire 10–21 Apr = 12 days
const APRIL = { from: '2026-04-01', to: '2026-04-30' };
const at = (date: string) => `${date}T10:00:00Z`;
let C1: number;
let C2: number;
let depot1: number;
let depot2: number;

beforeAll(async () => {
  await resetDatabase();
  const w = await poolWorld();
  C1 = w.customer.id;
  C2 = (await Organisation.create({ name: 'Bravo Blending', kind: 'customer', contactEmail: null, freeDays: 21 })).id;
  depot1 = w.depot.id;
  depot2 = w.depot2.id;
  const bin = async (serial: string) => (await handBin(w.planner, { serial, binTypeId: w.binType.id, siteId: depot1, registeredAt: at('2024-12-01') })).id;
  const [A, B, C] = [await bin('A1'), await bin('B1'), await bin('C1')];
  await handTrip({ assetId: A, customerId: C1, depotSiteId: depot1, dispatchedAt: at('2026-03-01'), returnedAt: at('2026-03-25') });
  await handTrip({
    assetId: A,
    customerId: C1,
    depotSiteId: depot1,
    dispatchedAt: at('2026-04-02'),
    deliveredAt: at('2026-04-03'),
    collectedAt: at('2026-04-15'),
    returnedAt: at('2026-04-17'),
  });
  await handTrip({ assetId: A, customerId: C2, depotSiteId: depot2, dispatchedAt: at('2026-04-20'), deliveredAt: at('2026-04-21') });
  await handTrip({
    assetId: B,
    customerId: C2,
    depotSiteId: depot1,
    dispatchedAt: at('2026-04-05'),
    deliveredAt: at('2026-04-06'),
    collectedAt: at('2026-04-26'),
    returnedAt: at('2026-04-28'),
  });
  await handTrip({ assetId: C, customerId: C1, depotSiteId: depot2, dispatchedAt: at('2025-01-10'), returnedAt: at('2025-02-01') });
  await handTrip({
    assetId: C,
    customerId: C1,
    depotSiteId: depot2,
    dispatchedAt: at('2026-04-10'),
    deliveredAt: at('2026-04-11'),
    collectedAt: at('2026-04-20'),
    returnedAt: at('2026-04-22'),
  });
  // B's next trip starts after April; the open trip a2 forbids another open trip on A, so bx goes on B after b1.
  await handTrip({ assetId: B, customerId: C1, depotSiteId: depot1, dispatchedAt: at('2026-05-05') });
});
afterAll(async () => {
  await sequelize.close();
});

test('the hand-worked day counts agree with date-fns differenceInCalendarDays', () => {
  const d = (a: string, b: string) => differenceInCalendarDays(parseISO(b), parseISO(a));
  expect([d('2026-04-02', '2026-04-17'), d('2026-04-05', '2026-04-28'), d('2026-04-10', '2026-04-22')]).toEqual([15, 23, 12]);
  expect([d('2026-04-03', '2026-04-15'), d('2026-04-06', '2026-04-26'), d('2026-04-11', '2026-04-20')]).toEqual([12, 20, 9]);
  expect([d('2026-03-25', '2026-04-02'), d('2026-04-17', '2026-04-20')]).toEqual([8, 3]);
});

test("reads the period's trips and each bin's last trip back within a year before it — nothing else", async () => {
  const trips = await tripsForPeriod(APRIL, 'Europe/Amsterdam');
  expect(trips.map((t) => t.dispatchedAt.slice(0, 10)).sort()).toEqual(['2026-03-01', '2026-04-02', '2026-04-05', '2026-04-10', '2026-04-20']);
});

describe('April 2026', () => {
  test('all trips: 4 trips, 3 back; cycles 15, 23, 12; at customer 12, 20, 9; 61 of 90 bin-days on hire; gaps 8 and 3', async () => {
    const { overall } = await tripStatistics(APRIL, 'customer');
    expect(overall).toMatchObject({ trips: 4, completedTrips: 3, bins: 3, medianCycleDays: 15, depotGaps: 2, meanDepotDays: 5.5 });
    expect(overall!.meanCycleDays).toBeCloseTo(50 / 3, 12);
    expect(overall!.meanDwellDays).toBeCloseTo(41 / 3, 12);
    expect(overall!.utilisation).toBeCloseTo((15 + 11 + 23 + 12) / 90, 12);
    expect(overall!.rotationsPerBinPerYear).toBeCloseTo((3 / 3) * (365 / 30), 12);
  });

  test('per customer, with names', async () => {
    const stats = await tripStatistics(APRIL, 'customer');
    const row = (id: number) => stats.rows.find((r) => r.key === String(id))!;
    // C1: a1 and c1 → cycle (15 + 12) / 2, at customer (12 + 9) / 2, on hire (15 + 12) / 60, gap 8 (c's is too old)
    expect(row(C1)).toMatchObject({ trips: 2, completedTrips: 2, bins: 2, meanCycleDays: 13.5, medianCycleDays: 13.5, meanDwellDays: 10.5, depotGaps: 1, meanDepotDays: 8 });
    expect(row(C1).utilisation).toBeCloseTo(27 / 60, 12);
    // C2: a2 (open) and b1 → cycle 23, at customer 20, on hire (11 + 23) / 60, gap 3
    expect(row(C2)).toMatchObject({ trips: 2, completedTrips: 1, bins: 2, meanCycleDays: 23, meanDwellDays: 20, depotGaps: 1, meanDepotDays: 3 });
    expect(row(C2).utilisation).toBeCloseTo(34 / 60, 12);
    expect(row(C2).rotationsPerBinPerYear).toBeCloseTo((1 / 2) * (365 / 30), 12);
    expect(stats.names.get(String(C2))).toEqual({ name: 'Bravo Blending' });
  });

  test('per depot: a gap belongs to the depot that sent the bin out again', async () => {
    const stats = await tripStatistics(APRIL, 'depot');
    expect(stats.rows.find((r) => r.key === String(depot1))).toMatchObject({ trips: 2, completedTrips: 2, meanCycleDays: 19, meanDwellDays: 16, meanDepotDays: 8 });
    expect(stats.rows.find((r) => r.key === String(depot2))).toMatchObject({ trips: 2, completedTrips: 1, meanCycleDays: 12, meanDwellDays: 9, meanDepotDays: 3 });
    expect(stats.names.get(String(depot2))).toEqual({ name: 'Second depot' });
  });

  test('per bin, named by serial with the GRAI for the link', async () => {
    const stats = await tripStatistics(APRIL, 'asset');
    const bySerial = Object.fromEntries(stats.rows.map((r) => [stats.names.get(r.key)!.name, r]));
    expect(bySerial.A1).toMatchObject({ trips: 2, completedTrips: 1, meanCycleDays: 15, depotGaps: 2, meanDepotDays: 5.5 });
    expect(bySerial.A1!.utilisation).toBeCloseTo(26 / 30, 12);
    expect(bySerial.B1).toMatchObject({ trips: 1, meanCycleDays: 23, depotGaps: 0, meanDepotDays: null });
    expect(bySerial.C1).toMatchObject({ trips: 1, meanCycleDays: 12, depotGaps: 0 });
    expect(stats.names.get(stats.rows[0]!.key)!.grai).toMatch(/^09529999100108/);
  });

  test('a period with no trips: no rows', async () => {
    const stats = await tripStatistics({ from: '2025-06-01', to: '2025-06-30' }, 'customer');
    expect(stats).toMatchObject({ rows: [], overall: null });
  });
});
