/**
 * Suggested truck runs for collections: requests near each other and ready at about the same time go on one truck,
 * its stops in driving order. A suggestion the planner edits, not an optimum: the rules are few and said here so the
 * planner can follow them.
 *
 *   suggestRuns(stops, options) → { runs, waiting }
 *
 * 1. A site below its minimum collection quantity waits (it is listed with what it still lacks).
 * 2. A site with more than a truckload gets full trucks of its own first; the rest joins the grouping.
 * 3. Runs are built earliest-ready first: a run starts with the earliest stop left, then takes the stop nearest to
 *    any of its stops among those ready within `windowDays` of the run's first stop, while the bins fit the truck
 *    and the detour it adds stays within `maxDetourKm`. A run leaves on the latest ready day of its stops.
 * 4. Stops are driven nearest-first from the depot, then improved by reversing any stretch of the route that makes
 *    it shorter (2-opt) until none does. Distances are great-circle × road factor (`lane-costs.ts`).
 */
import { addDays, daysBetween, type LocalDate } from '@/lib/calendar';
import { roadKm, type Point } from './lane-costs';

export interface CollectionStop {
  /** The site's key; one stop per site (the latest count it reported stands for it). */
  key: string;
  name: string;
  point: Point;
  readyOn: LocalDate;
  bins: number;
  /** The site's minimum collection quantity (1 when it has none). */
  minimum?: number;
}

export interface RunOptions {
  depot: Point;
  /** Folded bins that fill one truck. */
  truckCapacity: number;
  windowDays: number;
  maxDetourKm: number;
  roadFactor: number;
}

export interface SuggestedRun {
  leavesOn: LocalDate;
  stops: Array<{ key: string; name: string; bins: number; readyOn: LocalDate }>;
  bins: number;
  /** Depot → stops in order → depot, road km. */
  km: number;
  /** True for a full truck from one site (rule 2). */
  fullTruck: boolean;
}

export interface RunSuggestion {
  runs: SuggestedRun[];
  waiting: Array<{ key: string; name: string; bins: number; short: number }>;
}

const km = (a: Point, b: Point, f: number) => roadKm(a, b, f);

/** Length of depot → stops → depot. */
export function routeKm(depot: Point, stops: readonly Point[], roadFactor: number): number {
  let total = 0;
  let at = depot;
  for (const s of stops) {
    total += km(at, s, roadFactor);
    at = s;
  }
  return stops.length ? total + km(at, depot, roadFactor) : 0;
}

/** Nearest-first from the depot, then 2-opt until no reversal shortens the route. Returns indexes into `stops`. */
export function driveOrder(depot: Point, stops: readonly Point[], roadFactor: number): number[] {
  const left = stops.map((_, i) => i);
  const order: number[] = [];
  let at = depot;
  while (left.length) {
    let best = 0;
    for (let j = 1; j < left.length; j++) if (km(at, stops[left[j]!]!, roadFactor) < km(at, stops[left[best]!]!, roadFactor) - 1e-9) best = j;
    const [next] = left.splice(best, 1);
    order.push(next!);
    at = stops[next!]!;
  }
  const length = (o: number[]) =>
    routeKm(
      depot,
      o.map((i) => stops[i]!),
      roadFactor,
    );
  for (let improved = true; improved; ) {
    improved = false;
    for (let i = 0; i < order.length - 1; i++) {
      for (let j = i + 1; j < order.length; j++) {
        const candidate = [...order.slice(0, i), ...order.slice(i, j + 1).reverse(), ...order.slice(j + 1)];
        if (length(candidate) < length(order) - 1e-6) {
          order.splice(0, order.length, ...candidate);
          improved = true;
        }
      }
    }
  }
  return order;
}

function run(depot: Point, members: CollectionStop[], roadFactor: number, fullTruck: boolean): SuggestedRun {
  const order = driveOrder(
    depot,
    members.map((m) => m.point),
    roadFactor,
  );
  const stops = order.map((i) => members[i]!);
  return {
    leavesOn: stops
      .map((s) => s.readyOn)
      .sort()
      .at(-1)!,
    stops: stops.map((s) => ({ key: s.key, name: s.name, bins: s.bins, readyOn: s.readyOn })),
    bins: stops.reduce((n, s) => n + s.bins, 0),
    km: Math.round(
      routeKm(
        depot,
        stops.map((s) => s.point),
        roadFactor,
      ),
    ),
    fullTruck,
  };
}

export function suggestRuns(stops: readonly CollectionStop[], opts: RunOptions): RunSuggestion {
  const { depot, truckCapacity, windowDays, maxDetourKm, roadFactor } = opts;
  if (!(Number.isInteger(truckCapacity) && truckCapacity > 0)) throw new RangeError(`truckCapacity must be a whole number > 0 (got ${String(truckCapacity)})`);
  if (!(Number.isInteger(windowDays) && windowDays >= 0)) throw new RangeError(`windowDays must be a whole number ≥ 0 (got ${String(windowDays)})`);
  if (!(maxDetourKm >= 0)) throw new RangeError(`maxDetourKm must be ≥ 0 (got ${String(maxDetourKm)})`);
  const keys = new Set<string>();
  const waiting: RunSuggestion['waiting'] = [];
  const runs: SuggestedRun[] = [];
  const pool: CollectionStop[] = [];
  for (const s of stops) {
    if (keys.has(s.key)) throw new RangeError(`one stop per site: ${s.key} appears twice`);
    keys.add(s.key);
    if (!(Number.isInteger(s.bins) && s.bins > 0)) throw new RangeError(`a stop collects a whole number of bins > 0 (${s.key}: ${String(s.bins)})`);
    const minimum = s.minimum ?? 1;
    if (s.bins < minimum) {
      waiting.push({ key: s.key, name: s.name, bins: s.bins, short: minimum - s.bins });
      continue;
    }
    let rest = s.bins;
    while (rest > truckCapacity) {
      runs.push(run(depot, [{ ...s, bins: truckCapacity }], roadFactor, true));
      rest -= truckCapacity;
    }
    pool.push({ ...s, bins: rest });
  }
  pool.sort((a, b) => (a.readyOn < b.readyOn ? -1 : a.readyOn > b.readyOn ? 1 : a.key < b.key ? -1 : 1));
  while (pool.length) {
    const first = pool.shift()!;
    const members = [first];
    let bins = first.bins;
    const until = addDays(first.readyOn, windowDays);
    for (;;) {
      const length = routeKm(
        depot,
        members.map((m) => m.point),
        roadFactor,
      );
      let pick = -1;
      let pickDist = Infinity;
      pool.forEach((c, i) => {
        if (c.readyOn > until || bins + c.bins > truckCapacity) return;
        const near = Math.min(...members.map((m) => km(m.point, c.point, roadFactor)));
        if (near >= pickDist) return;
        const order = driveOrder(
          depot,
          [...members, c].map((m) => m.point),
          roadFactor,
        );
        const detour =
          routeKm(
            depot,
            order.map((o) => [...members, c][o]!.point),
            roadFactor,
          ) - length;
        if (detour <= maxDetourKm) {
          pick = i;
          pickDist = near;
        }
      });
      if (pick < 0) break;
      const [c] = pool.splice(pick, 1);
      members.push(c!);
      bins += c!.bins;
    }
    runs.push(run(depot, members, roadFactor, false));
  }
  runs.sort((a, b) => (a.leavesOn < b.leavesOn ? -1 : a.leavesOn > b.leavesOn ? 1 : b.bins - a.bins));
  return { runs, waiting };
}

/** Days a run waits after its earliest stop was ready (what grouping costs the first customer). */
export function waitDays(r: SuggestedRun): number {
  return daysBetween(r.stops.map((s) => s.readyOn).sort()[0]!, r.leavesOn);
}
