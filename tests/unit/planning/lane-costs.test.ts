import { describe, expect, it } from 'vitest';
import { EARTH_RADIUS_KM, greatCircleKm, naiveTruckPlan, roadKm, truckCostMatrix } from '@/lib/planning/lane-costs';
import { solveTruckPlan } from '@/lib/planning/transport-plan';

describe('distances', () => {
  it('matches arcs worked by hand on a sphere of the IUGG mean radius', () => {
    // One degree of latitude along a meridian = R·π/180; a quarter of the equator = R·π/2; antipodes = R·π.
    expect(EARTH_RADIUS_KM).toBe(6371.0088);
    expect(greatCircleKm({ lat: 10, lon: 5 }, { lat: 11, lon: 5 })).toBeCloseTo(111.19508, 4);
    expect(greatCircleKm({ lat: 0, lon: 0 }, { lat: 0, lon: 90 })).toBeCloseTo(10_007.5572, 3);
    expect(greatCircleKm({ lat: 0, lon: 0 }, { lat: 0, lon: 180 })).toBeCloseTo(20_015.1144, 3);
  });

  it('agrees with the spherical law of cosines (an independent formula) on scattered pairs', () => {
    const rad = Math.PI / 180;
    const cosines = (a: { lat: number; lon: number }, b: { lat: number; lon: number }) =>
      EARTH_RADIUS_KM * Math.acos(Math.sin(a.lat * rad) * Math.sin(b.lat * rad) + Math.cos(a.lat * rad) * Math.cos(b.lat * rad) * Math.cos((b.lon - a.lon) * rad));
    const pts = [
      { lat: 52.1, lon: 4.3 },
      { lat: 48.7, lon: 9.2 },
      { lat: 45.4, lon: -1.1 },
      { lat: 55.9, lon: 12.6 },
    ];
    for (const a of pts) for (const b of pts) if (a !== b) expect(greatCircleKm(a, b)).toBeCloseTo(cosines(a, b), 6);
  });

  it('road estimate = great-circle × road factor; truck cost = road km × cost per km', () => {
    const a = { lat: 10, lon: 5 };
    const b = { lat: 11, lon: 5 };
    expect(roadKm(a, b, 1.25)).toBeCloseTo(111.19508 * 1.25, 4);
    expect(truckCostMatrix([a], [a, b], { roadFactor: 1.25, costPerKm: 2 })).toEqual([[0, Math.round(111.19508 * 1.25 * 2 * 100) / 100]]);
    expect(() => roadKm(a, b, 0.5)).toThrow(/road factor/);
    expect(() => truckCostMatrix([a], [b], { costPerKm: 0 })).toThrow(/cost per km/);
    expect(() => greatCircleKm({ lat: 91, lon: 0 }, b)).toThrow(/latitude/);
  });
});

describe('naive plan (each shortage from its nearest source)', () => {
  it('worked by hand: serving X first from the nearest source leaves Y a far one; the optimum swaps them', async () => {
    // A and B hold 10 bins each (10 a truck). X wants 10: A 100, B 110 a truck. Y wants 10: A 100, B 300.
    // Naive: X ← A (100), then Y ← B (300) = 400. Optimum: X ← B (110), Y ← A (100) = 210. Saving 190.
    const input = {
      supplies: [[10], [10]],
      demands: [[10], [10]],
      truckCosts: [
        [100, 100],
        [110, 300],
      ],
      truckCapacity: [10],
    };
    const naive = naiveTruckPlan(input);
    expect(naive).toMatchObject({
      totalCost: 400,
      totalTrucks: 2,
      trucks: [
        [1, 0],
        [0, 1],
      ],
      unmetDemand: [[0], [0]],
    });
    const best = await solveTruckPlan(input, { mipRelGap: 0 });
    expect(best.totalCost).toBe(210);
    expect(naive.totalCost - best.totalCost).toBe(190);
  });

  it('mixes bin types on a lane in as few trucks as they fill, and reports what it cannot serve', () => {
    const naive = naiveTruckPlan({ supplies: [[6, 2]], demands: [[8, 2]], truckCosts: [[50]], truckCapacity: [10, 5] });
    // 6 of type 1 (0.6 truck) + 2 of type 2 (0.4 truck) = one truck; 2 of type 1 unserved.
    expect(naive).toMatchObject({ totalTrucks: 1, totalCost: 50, unmetDemand: [[2, 0]] });
  });
});
