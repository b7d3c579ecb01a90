/**
 * Lane costs for repositioning, and the naive plan the optimum is compared with.
 *
 *   greatCircleKm(a, b)                   → distance over the earth's surface (haversine, mean radius)
 *   roadKm(a, b, roadFactor)              → the road distance estimate: great-circle × road factor
 *   truckCostMatrix(from, to, settings)   → cost of one truck per lane: road km × cost per km
 *   naiveTruckPlan(input)                 → each shortage served from its nearest source that still has bins
 *                                           of that type, in whole trucks per lane (the "before" of the saving)
 *
 * The road factor and the cost per km are the planner's (shown and editable on the page); the defaults here
 * are common practice figures, not sourced: a road factor of about 1.3 over great-circle distance for
 * regional road networks, and the cost per km is left to the operator.
 */
import type { TruckPlanInput } from './transport-plan';

export interface Point {
  lat: number;
  lon: number;
}

/** IUGG mean earth radius, km. */
export const EARTH_RADIUS_KM = 6371.0088;
/** Common practice figure for regional road networks (no source): road km ≈ 1.3 × great-circle km. */
export const DEFAULT_ROAD_FACTOR = 1.3;

function checkPoint(p: Point, label: string) {
  if (!p || !(Math.abs(p.lat) <= 90) || !(Math.abs(p.lon) <= 180)) {
    throw new RangeError(`${label} must have a latitude in [-90, 90] and a longitude in [-180, 180] (got ${JSON.stringify(p)})`);
  }
}

export function greatCircleKm(a: Point, b: Point): number {
  checkPoint(a, 'from');
  checkPoint(b, 'to');
  const rad = Math.PI / 180;
  const dLat = (b.lat - a.lat) * rad;
  const dLon = (b.lon - a.lon) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.lat * rad) * Math.cos(b.lat * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(h)));
}

export function roadKm(a: Point, b: Point, roadFactor = DEFAULT_ROAD_FACTOR): number {
  if (!(roadFactor >= 1 && roadFactor <= 3)) throw new RangeError(`road factor must be between 1 and 3 (got ${String(roadFactor)})`);
  return greatCircleKm(a, b) * roadFactor;
}

/** Cost of one truck per lane, rounded to cents; a source and destination at the same place cost nothing. */
export function truckCostMatrix(
  from: readonly Point[],
  to: readonly Point[],
  { roadFactor = DEFAULT_ROAD_FACTOR, costPerKm }: { roadFactor?: number; costPerKm: number },
): number[][] {
  if (!(costPerKm > 0 && Number.isFinite(costPerKm))) throw new RangeError(`cost per km must be a number > 0 (got ${String(costPerKm)})`);
  return from.map((a) => to.map((b) => Math.round(roadKm(a, b, roadFactor) * costPerKm * 100) / 100));
}

export interface NaivePlan {
  totalCost: number;
  totalTrucks: number;
  /** trucks[i][j] and load[i][j][k] per lane. */
  trucks: number[][];
  load: number[][][];
  unmetDemand: number[][];
}

/**
 * The plan a planner would make without the solver: destinations in order, each bin type in order, each
 * shortage filled from the nearest (cheapest truck) source with bins of that type left; bins then go in as
 * few trucks per lane as their mix needs. Empties that must be collected are not forced here — the naive plan
 * only serves shortages — so compare it on shortages alone.
 */
export function naiveTruckPlan(input: TruckPlanInput): NaivePlan {
  const types = input.truckCapacity.length;
  const left = input.supplies.map((r) => [...r]);
  const unmet = input.demands.map((r) => [...r]);
  const load = input.supplies.map(() => input.demands.map(() => Array<number>(types).fill(0)));
  input.demands.forEach((_, j) => {
    const bySource = input.supplies
      .map((_, i) => i)
      .filter((i) => input.truckCosts[i][j] !== null)
      .sort((a, b) => (input.truckCosts[a][j] as number) - (input.truckCosts[b][j] as number) || a - b);
    for (let k = 0; k < types; k++) {
      for (const i of bySource) {
        if (unmet[j][k] === 0) break;
        const n = Math.min(unmet[j][k], left[i][k]);
        left[i][k] -= n;
        unmet[j][k] -= n;
        load[i][j][k] += n;
      }
    }
  });
  const trucks = load.map((row) => row.map((l) => Math.ceil(l.reduce((s, b, k) => s + b / input.truckCapacity[k], 0) - 1e-9) || 0)); // never −0
  let totalCost = 0;
  trucks.forEach((row, i) => row.forEach((t, j) => (totalCost += t * ((input.truckCosts[i][j] as number | null) ?? 0))));
  return {
    totalCost: Math.round(totalCost * 100) / 100,
    totalTrucks: trucks.flat().reduce((a, b) => a + b, 0),
    trucks,
    load,
    unmetDemand: unmet,
  };
}
