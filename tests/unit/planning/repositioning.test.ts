// The repositioning problem from data: netting of orders against stock and expected returns, and the problem and
// plan built from it. Hand-worked cases (each written out beside its check); the whole-truck solver itself is
// checked against Hillier & Lieberman in transport-plan.test.ts.
import { describe, test, expect } from 'vitest';
import {
  depotBalance,
  shortageProblem,
  collectionProblem,
  planRepositioning,
  naiveRepositioning,
  trucksFor,
  type RepoDepot,
  type RepoSite,
  type Balance,
} from '@/lib/planning/repositioning';
import { solveTruckPlan } from '@/lib/planning/transport-plan';

const none = () => 0;

describe('depotBalance: what a depot is short of, and what it may spare', () => {
  test('two orders against 10 in the yard and 2 expected back by the second: 1 short from 10 Dec, nothing to spare', () => {
    // cumulative need 5 (5 Dec) then 13 (10 Dec); cover 10 + 0, then 10 + 2 → gaps −5, +1; spare min(10, 5, −1) → 0
    const returns = (d: string) => (d >= '2026-12-10' ? 2 : 0);
    expect(
      depotBalance({
        onHand: 10,
        needs: [
          { date: '2026-12-05', bins: 5 },
          { date: '2026-12-10', bins: 8 },
        ],
        returnsBy: returns,
      }),
    ).toEqual({
      shortage: 1,
      shortOn: '2026-12-10',
      spare: 0,
      needed: 13,
    });
  });
  test('let it come back: an empty yard with 4 wanted and 4 expected back by then is not short', () => {
    expect(depotBalance({ onHand: 0, needs: [{ date: '2026-12-08', bins: 4 }], returnsBy: () => 4 })).toMatchObject({ shortage: 0, spare: 0 });
  });
  test('spare bins are those not needed on any date, counting only returns that arrive before each need', () => {
    // 10 held; 6 wanted 4 Dec (nothing back yet) → 4 free then; 4 more wanted 9 Dec with 5 back by then → 10 + 5 − 10 = 5; spare = min(10, 4, 5) = 4
    const returns = (d: string) => (d >= '2026-12-09' ? 5 : 0);
    expect(
      depotBalance({
        onHand: 10,
        needs: [
          { date: '2026-12-09', bins: 4 },
          { date: '2026-12-04', bins: 6 },
        ],
        returnsBy: returns,
      }),
    ).toEqual({
      shortage: 0,
      shortOn: null,
      spare: 4,
      needed: 10,
    });
  });
  test('no orders: everything held may be spared; two orders on one date add up; the first short date is kept', () => {
    expect(depotBalance({ onHand: 7, needs: [], returnsBy: none })).toEqual({ shortage: 0, shortOn: null, spare: 7, needed: 0 });
    expect(
      depotBalance({
        onHand: 1,
        needs: [
          { date: '2026-12-04', bins: 2 },
          { date: '2026-12-04', bins: 3 },
          { date: '2026-12-06', bins: 5 },
        ],
        returnsBy: none,
      }),
    ).toEqual({
      shortage: 9,
      shortOn: '2026-12-04',
      spare: 0,
      needed: 10,
    });
  });
  test('refuses what cannot be a count of bins', () => {
    expect(() => depotBalance({ onHand: -1, needs: [], returnsBy: none })).toThrow(/onHand/);
    expect(() => depotBalance({ onHand: 1, needs: [{ date: '2026-12-04', bins: 1.5 }], returnsBy: none })).toThrow(/whole/);
  });
});

describe('trucksFor: whole trucks for a mix', () => {
  test('10 per truck of one type and 20 of another: 7 + 6 fill 0.7 + 0.3 = one truck; 8 + 6 need two', () => {
    expect(trucksFor([7, 6], [10, 20])).toBe(1);
    expect(trucksFor([8, 6], [10, 20])).toBe(2);
    expect(trucksFor([0, 0], [10, 20])).toBe(0);
  });
});

// Three depots on a line of longitude 52° N: West (4.0° E), Mid (4.5° E), East (6.0° E); a customer site near West.
// One bin type, 10 folded bins to a truck, 1 per road km, road factor 1 (great-circle only) to keep the arithmetic
// visible: 0.5° of longitude at 52° N ≈ 34.2 km.
const bal = (b: Partial<Balance>): Record<string, Balance> => ({ f: { shortage: 0, shortOn: null, spare: 0, needed: 0, ...b } });
const depot = (key: string, lon: number, b: Partial<Balance>): RepoDepot => ({ key, name: key, point: { lat: 52, lon }, balance: bal(b) });
const site = (key: string, lon: number, n: number): RepoSite => ({ key, name: key, point: { lat: 52, lon }, awaiting: { f: n } });
const TYPES = [{ key: 'f', name: 'Folding 1000', truckCapacity: 10 }];

const solve = (input: Parameters<typeof solveTruckPlan>[0]) => solveTruckPlan(input, { timeLimit: 5 });
const lanesOf = (p: Awaited<ReturnType<typeof planRepositioning>>['plan']) =>
  p.lanes.map((l) => ({ from: l.from, to: l.to, bins: l.bins, toShortage: l.toShortage, trucks: l.trucks }));

describe('the repositioning plan', () => {
  test('a short depot is served by the site’s empties first and the nearest spare depot for the rest', async () => {
    // West short 12; Mid spares 20; East spares 20; site S (4.1° E) holds 7. Best: S → West 7 (1 truck, ~6.9 km)
    // and Mid → West 5 (1 truck, ~34.2 km); East (~137 km) is further than Mid.
    const input = {
      types: TYPES,
      depots: [depot('West', 4.0, { shortage: 12 }), depot('Mid', 4.5, { spare: 20 }), depot('East', 6.0, { spare: 20 })],
      sites: [site('S', 4.1, 7)],
      costPerKm: 1,
      roadFactor: 1,
    };
    const stage1 = shortageProblem(input);
    expect(stage1.sources.map((s) => `${s.kind}:${s.kind === 'depot' ? s.depot.key : s.site.key}`)).toEqual(['depot:Mid', 'depot:East', 'site:S']);
    expect(stage1.destinations.map((d) => `${d.kind}:${d.depot.key}`)).toEqual(['shortage:West']);
    expect(stage1.input.mustShip).toEqual([false, false, false]); // here the site's empties are optional
    const { plan, stages } = await planRepositioning(input, solve);
    expect(lanesOf(plan)).toEqual([
      { from: 'Mid', to: 'West', bins: [5], toShortage: [5], trucks: 1 },
      { from: 'S', to: 'West', bins: [7], toShortage: [7], trucks: 1 },
    ]);
    expect(plan.unmet).toEqual([]);
    expect(stages.collections).toBeNull(); // nothing left at the site
  });

  test('site empties beyond the shortage are collected too; both loads to one depot share a truck', async () => {
    // West short 3; S (4.1° E) holds 7 → 3 fill the shortage (stage 1), 4 go to the nearest yard, West (stage 2):
    // one lane S → West with 7 bins, one truck.
    const input = { types: TYPES, depots: [depot('West', 4.0, { shortage: 3 }), depot('Mid', 4.5, {})], sites: [site('S', 4.1, 7)], costPerKm: 1, roadFactor: 1 };
    const { plan } = await planRepositioning(input, solve);
    expect(lanesOf(plan)).toEqual([{ from: 'S', to: 'West', bins: [7], toShortage: [3], trucks: 1 }]);
    const stage2 = collectionProblem(input, shortageProblem(input), [[3]]);
    expect(stage2.input).toMatchObject({ supplies: [[4]], demands: [[4], [4]], mustShip: [true] });
  });

  test('a shortage no source can serve is reported, not hidden', async () => {
    const input = { types: TYPES, depots: [depot('West', 4.0, { shortage: 6 }), depot('Mid', 4.5, { spare: 2 })], sites: [], costPerKm: 1, roadFactor: 1 };
    const { plan } = await planRepositioning(input, solve);
    expect(lanesOf(plan)).toEqual([{ from: 'Mid', to: 'West', bins: [2], toShortage: [2], trucks: 1 }]);
    expect(plan.unmet).toEqual([{ depotKey: 'West', depot: 'West', typeKey: 'f', type: 'Folding 1000', bins: 4 }]);
  });

  test('the naive plan: nearest source per shortage, then each site’s leftover to the depot nearest to it; the saving', async () => {
    // West short 12: nearest source is S (9 of them), then Mid (3). Nothing left at S.
    const input = { types: TYPES, depots: [depot('West', 4.0, { shortage: 12 }), depot('Mid', 4.5, { spare: 20 })], sites: [site('S', 4.1, 9)], costPerKm: 1, roadFactor: 1 };
    expect(naiveRepositioning(input).lanes.map((l) => [l.from, l.to, l.bins[0], l.trucks])).toEqual([
      ['Mid', 'West', 3, 1],
      ['S', 'West', 9, 1],
    ]);
    // A site T by East (5.9° E) with 6; West short 2, East nothing. Naive: the nearest source to West is T (the only
    // one): 2 to West, and T's other 4 to East, its nearest depot — two trucks, ~133 + ~6.9 km.
    // Optimum: the same two lanes are forced (T must empty, West needs 2, only T has bins), so the saving is 0.
    const far = { types: TYPES, depots: [depot('West', 4.0, { shortage: 2 }), depot('East', 6.0, {})], sites: [site('T', 5.9, 6)], costPerKm: 1, roadFactor: 1 };
    expect(naiveRepositioning(far).lanes.map((l) => [l.from, l.to, l.bins[0]])).toEqual([
      ['T', 'East', 4],
      ['T', 'West', 2],
    ]);
    const solved = await planRepositioning(far, solve);
    expect(solved.saving).toBe(0);
    // With a second site U at 4.2° E holding 2, both plans take U's 2 to West and T's 6 to East.
    const three = { ...far, sites: [site('T', 5.9, 6), site('U', 4.2, 2)] };
    const p3 = await planRepositioning(three, solve);
    expect(lanesOf(p3.plan).map((l) => [l.from, l.to, l.bins[0]])).toEqual([
      ['T', 'East', 6],
      ['U', 'West', 2],
    ]);
    expect(p3.saving).toBeGreaterThanOrEqual(0);
  });

  test('the optimum beats the naive plan when nearest-first takes the one source the next shortage needed', async () => {
    // Along 52° N: B 3.69° E, West 4.00°, A 4.29°, Mid 4.59°; 10 to a truck, West and Mid each short 10, A and B
    // each spare 10. Naive (West first): A is nearest to West (0.29° vs 0.31°), so Mid gets B from 0.90° away:
    // 0.29° + 0.90° = 1.19°. Optimum: B → West (0.31°) and A → Mid (0.30°) = 0.61°. At 52° N one degree of
    // longitude is 111.2 km × cos 52° ≈ 68.5 km, so the saving is about 0.58° ≈ 39.7 km of one truck each.
    const input = {
      types: TYPES,
      depots: [depot('West', 4.0, { shortage: 10 }), depot('Mid', 4.59, { shortage: 10 }), depot('A', 4.29, { spare: 10 }), depot('B', 3.69, { spare: 10 })],
      sites: [],
      costPerKm: 1,
      roadFactor: 1,
    };
    const r = await planRepositioning(input, solve);
    expect(r.naive.lanes.map((l) => [l.from, l.to])).toEqual([
      ['A', 'West'],
      ['B', 'Mid'],
    ]);
    expect(lanesOf(r.plan).map((l) => [l.from, l.to, l.trucks])).toEqual([
      ['A', 'Mid', 1],
      ['B', 'West', 1],
    ]);
    expect(r.saving).toBeGreaterThan(39);
    expect(r.saving).toBeLessThan(40.5);
  });
});

describe('the page settings', () => {
  test('defaults, values from the query string, and refusals in words', async () => {
    const { parsePlanSettings } = await import('@/lib/planning/repositioning-settings');
    expect(parsePlanSettings(new URLSearchParams(''))).toMatchObject({ ok: true, settings: { horizonDays: 14, costPerKm: 1.6, roadFactor: 1.3 } });
    expect(parsePlanSettings(new URLSearchParams('horizonDays=21&costPerKm=2.1&roadFactor=1.25'))).toMatchObject({
      ok: true,
      settings: { horizonDays: 21, costPerKm: 2.1, roadFactor: 1.25 },
    });
    const bad = parsePlanSettings(new URLSearchParams('horizonDays=0.5&costPerKm=abc&roadFactor=9'));
    expect(bad.ok).toBe(false);
    if (!bad.ok)
      expect(bad.problems).toEqual(['The horizon is at least 1', 'The horizon is a whole number of days', 'The cost per km must be a number', 'The road factor is at most 3']);
  });
});
