// The statistics table (summarise() per group plus time at the depot, and an "all trips" row) against
// values worked by hand. Dates are in UTC at midday so local date = UTC date; the conventions are those of
// trip-stats.ts (calendar-day differences; on hire from the dispatch day up to, not including, the return
// day; periods include both ends). Day counts double-checked with date-fns differenceInCalendarDays.
import { describe, test, expect } from 'vitest';
import { differenceInCalendarDays, parseISO } from 'date-fns';
import { statsTable } from '@/lib/trips/trip-stats-table.ts';
import type { Trip } from '@/lib/trips/trip-stats.ts';

const APRIL = { from: '2026-04-01', to: '2026-04-30' }; // 30 days
const at = (date: string) => `${date}T12:00:00Z`;

// Bin A: a0 came back before April (only there to give the first depot gap), a1 a full rotation in April,
// a2 out since 20 April from the second depot. Bin B: one full rotation in April.
const a0: Trip = { assetId: 'A', customerId: 'C1', depotId: 'D1', dispatchedAt: at('2026-03-01'), returnedAt: at('2026-03-25') };
const a1: Trip = {
  assetId: 'A',
  customerId: 'C1',
  depotId: 'D1',
  dispatchedAt: at('2026-04-02'),
  deliveredAt: at('2026-04-03'),
  collectedAt: at('2026-04-15'),
  returnedAt: at('2026-04-17'),
};
const a2: Trip = { assetId: 'A', customerId: 'C2', depotId: 'D2', dispatchedAt: at('2026-04-20'), deliveredAt: at('2026-04-21') };
const b1: Trip = {
  assetId: 'B',
  customerId: 'C2',
  depotId: 'D1',
  dispatchedAt: at('2026-04-05'),
  deliveredAt: at('2026-04-06'),
  collectedAt: at('2026-04-26'),
  returnedAt: at('2026-04-28'),
};
const trips = [a2, b1, a0, a1];
const opts = { period: APRIL, timeZone: 'UTC' };

test('the hand-worked day counts agree with date-fns', () => {
  const d = (a: string, b: string) => differenceInCalendarDays(parseISO(b), parseISO(a));
  expect([d('2026-04-02', '2026-04-17'), d('2026-04-03', '2026-04-15'), d('2026-04-05', '2026-04-28'), d('2026-04-06', '2026-04-26')]).toEqual([15, 12, 23, 20]);
  expect([d('2026-03-25', '2026-04-02'), d('2026-04-17', '2026-04-20')]).toEqual([8, 3]);
});

describe('per customer', () => {
  const { rows, overall } = statsTable(trips, { ...opts, groupBy: 'customer' });

  test('C1: a1 only (a0 came back before April); cycle 2 → 17 Apr = 15 days, dwell 3 → 15 Apr = 12; on hire 2–16 Apr = 15 of 30 days', () => {
    expect(rows[0]).toMatchObject({ key: 'C1', trips: 1, completedTrips: 1, bins: 1, meanCycleDays: 15, medianCycleDays: 15, meanDwellDays: 12, utilisation: 0.5 });
    expect(rows[0]!.rotationsPerBinPerYear).toBeCloseTo(365 / 30, 12); // 1 rotation / 1 bin × 365 / 30
    expect(rows[0]).toMatchObject({ depotGaps: 1, meanDepotDays: 8 }); // 25 Mar → 2 Apr, waited for C1's order
  });

  test('C2: a2 (open) and b1 (cycle 23, dwell 20); on hire 20–30 Apr = 11 and 5–27 Apr = 23 days of 2 × 30', () => {
    expect(rows[1]).toMatchObject({ key: 'C2', trips: 2, completedTrips: 1, bins: 2, meanCycleDays: 23, meanDwellDays: 20, depotGaps: 1, meanDepotDays: 3 });
    expect(rows[1]!.utilisation).toBeCloseTo(34 / 60, 12);
    expect(rows[1]!.rotationsPerBinPerYear).toBeCloseTo((1 / 2) * (365 / 30), 12);
  });

  test('all trips together: cycles 15 and 23 (mean 19), dwell 12 and 20 (mean 16), (15 + 11 + 23) / 60 on hire, gaps 8 and 3', () => {
    expect(overall).toMatchObject({ key: '*', trips: 3, completedTrips: 2, bins: 2, meanCycleDays: 19, medianCycleDays: 19, meanDwellDays: 16, depotGaps: 2, meanDepotDays: 5.5 });
    expect(overall!.utilisation).toBeCloseTo(49 / 60, 12);
    expect(overall!.rotationsPerBinPerYear).toBeCloseTo(365 / 30, 12); // 2 rotations / 2 bins
  });
});

describe('per depot and per bin', () => {
  test('depots: the gap belongs to the depot that dispatched the next trip (8 days at D1, 3 at D2)', () => {
    const { rows } = statsTable(trips, { ...opts, groupBy: 'depot' });
    expect(rows.map((r) => [r.key, r.trips, r.completedTrips, r.meanCycleDays, r.meanDepotDays])).toEqual([
      ['D1', 2, 2, 19, 8],
      ['D2', 1, 0, null, 3],
    ]);
  });

  test('bins: A waited 8 and 3 days (mean 5.5); B has no earlier trip, so no gap', () => {
    const { rows } = statsTable(trips, { ...opts, groupBy: 'asset' });
    expect(rows.map((r) => [r.key, r.trips, r.depotGaps, r.meanDepotDays])).toEqual([
      ['A', 2, 2, 5.5],
      ['B', 1, 0, null],
    ]);
    expect(rows[0]!.utilisation).toBeCloseTo(26 / 30, 12); // 15 + 11 days of 30
  });

  test('a gap whose next dispatch is outside the period does not count', () => {
    const { overall } = statsTable(trips, { ...opts, groupBy: 'customer', period: { from: '2026-04-18', to: '2026-04-30' } });
    expect(overall).toMatchObject({ depotGaps: 1, meanDepotDays: 3 }); // 17 → 20 Apr only
  });

  test('no trips: no rows, no overall row', () => {
    expect(statsTable([], { ...opts, groupBy: 'asset' })).toEqual({ rows: [], overall: null });
  });
});
