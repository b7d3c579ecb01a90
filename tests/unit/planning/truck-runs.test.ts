// Suggested collection runs. Cases worked by hand on the equator, where one degree of longitude (or latitude) is
// 2π × 6371.0088 km / 360 ≈ 111.195 km of great circle; road factor 1 keeps the arithmetic visible. The route order
// is checked against exhaustive search over every order (an independent check: for points in convex position the
// shortest round trip has no crossing, which 2-opt guarantees).
import { describe, test, expect } from 'vitest';
import { driveOrder, routeKm, suggestRuns, waitDays, type CollectionStop } from '@/lib/planning/truck-runs';

const DEG = 111.195;
const depot = { lat: 0, lon: 0 };
const stop = (key: string, lat: number, lon: number, bins: number, readyOn: string, minimum?: number): CollectionStop => ({
  key,
  name: `Site ${key}`,
  point: { lat, lon },
  bins,
  readyOn,
  minimum,
});
const opts = { depot, truckCapacity: 26, windowDays: 3, maxDetourKm: 30, roadFactor: 1 };

function permutations<T>(xs: T[]): T[][] {
  if (xs.length <= 1) return [xs];
  return xs.flatMap((x, i) => permutations([...xs.slice(0, i), ...xs.slice(i + 1)]).map((p) => [x, ...p]));
}

describe('route order', () => {
  test('nearest first from the depot: A (0.1° E) before B (0.2° E); depot → A → B → depot = 0.4° ≈ 44.5 km', () => {
    const pts = [
      { lat: 0, lon: 0.2 },
      { lat: 0, lon: 0.1 },
    ];
    expect(driveOrder(depot, pts, 1)).toEqual([1, 0]);
    expect(routeKm(depot, [pts[1]!, pts[0]!], 1)).toBeCloseTo(0.4 * DEG, 1);
  });
  test('six sites on a circle, shuffled: the order found is as short as the best of all 720 orders (exhaustive search)', () => {
    const angles = [200, 40, 310, 120, 260, 80];
    const pts = angles.map((a) => ({ lat: 0.5 + 0.5 * Math.sin((a * Math.PI) / 180), lon: 0.5 * Math.cos((a * Math.PI) / 180) }));
    const at = { lat: 0, lon: 0 }; // on the same circle (angle 270°): the points are in convex position
    const best = Math.min(
      ...permutations(pts.map((_, i) => i)).map((o) =>
        routeKm(
          at,
          o.map((i) => pts[i]!),
          1,
        ),
      ),
    );
    expect(
      routeKm(
        at,
        driveOrder(at, pts, 1).map((i) => pts[i]!),
        1,
      ),
    ).toBeCloseTo(best, 6);
  });
});

describe('suggestRuns', () => {
  // A 0.1° E (≈ 11.1 km), B 0.2° E (≈ 22.2 km), C 0.1° N (≈ 11.1 km), D 0.3° W (≈ 33.4 km).
  const A = stop('A', 0, 0.1, 10, '2026-12-04');
  const B = stop('B', 0, 0.2, 8, '2026-12-05');
  const C = stop('C', 0.1, 0, 12, '2026-12-05');
  const D = stop('D', 0, -0.3, 5, '2026-12-10');

  test('near and ready together share a truck; the third would overfill it; the late one waits for its day', () => {
    // Run 1 starts with A (ready 4 Dec, window to 7 Dec). Nearest to A is B (0.1° away) — 18 bins, detour
    // 0.4° − 0.2° ≈ 22.2 km ≤ 30: taken. C would make 30 > 26 bins. Run 2: C alone (D is ready after 8 Dec).
    // Run 3: D. Runs of one day, fuller first.
    const { runs, waiting } = suggestRuns([D, C, B, A], opts);
    expect(runs.map((r) => ({ stops: r.stops.map((s) => s.key), bins: r.bins, leavesOn: r.leavesOn, km: r.km }))).toEqual([
      { stops: ['A', 'B'], bins: 18, leavesOn: '2026-12-05', km: Math.round(0.4 * DEG) },
      { stops: ['C'], bins: 12, leavesOn: '2026-12-05', km: Math.round(0.2 * DEG) },
      { stops: ['D'], bins: 5, leavesOn: '2026-12-10', km: Math.round(0.6 * DEG) },
    ]);
    expect(waiting).toEqual([]);
    expect(waitDays(runs[0]!)).toBe(1); // A was ready a day before the run leaves
  });

  test('a detour longer than allowed starts a truck of its own', () => {
    const { runs } = suggestRuns([A, B], { ...opts, maxDetourKm: 20 });
    // B's detour from A is ≈ 22.2 km > 20: A leaves alone on 4 Dec, B on 5 Dec
    expect(runs.map((r) => [r.stops.map((s) => s.key), r.leavesOn])).toEqual([
      [['A'], '2026-12-04'],
      [['B'], '2026-12-05'],
    ]);
  });

  test('a site below its minimum waits with what it lacks; a site with more than a truckload gets full trucks first', () => {
    const E = stop('E', 0, 0.05, 3, '2026-12-04', 5);
    const F = stop('F', -0.1, 0, 60, '2026-12-06');
    const { runs, waiting } = suggestRuns([E, F], opts);
    expect(waiting).toEqual([{ key: 'E', name: 'Site E', bins: 3, short: 2 }]);
    expect(runs.map((r) => [r.stops[0]!.key, r.bins, r.fullTruck])).toEqual([
      ['F', 26, true],
      ['F', 26, true],
      ['F', 8, false],
    ]);
  });

  test('refuses what cannot be planned', () => {
    expect(() => suggestRuns([A, A], opts)).toThrow(/one stop per site/);
    expect(() => suggestRuns([{ ...A, bins: 0 }], opts)).toThrow(/whole number of bins/);
    expect(() => suggestRuns([A], { ...opts, truckCapacity: 0 })).toThrow(/truckCapacity/);
  });
});
