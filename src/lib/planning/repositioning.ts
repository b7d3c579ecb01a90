/**
 * The repositioning plan from data: which depots are short of empties for their confirmed orders, which can spare
 * some, which customer sites have folded empties waiting, and the whole-truck problem `solveTruckPlan` solves.
 *
 *   depotBalance({ onHand, needs, returnsBy })  → shortage (bins to bring in) and spare (bins that may leave now)
 *   repositioningProblem(input)                 → the TruckPlanInput, with what each row and column stands for
 *   planLanes(problem, result)                  → the solver's lanes per physical lane (source → depot), in trucks
 *   naiveRepositioning(problem)                 → the plan without the solver, for the saving
 *
 * Netting ("let it come back"): a depot's need is its confirmed orders' bins not yet dispatched, by wanted date;
 * its cover is what it holds now plus the bins expected back by that date at the forecast's low quantile (10 %:
 * nine times in ten at least that many are back). The shortage is the largest gap between cumulative need and
 * cover over the horizon's dates, so a bin expected back in time for its order is not moved. A depot may spare only
 * what it holds now and will not need at any date (the returns it counts on arrive later).
 *
 * Two stages, each solved to its optimum by `solveTruckPlan`: (1) the shortages, served from spare depot bins and
 * customer empties alike — as many bins as the lanes allow, then the fewest truck costs; (2) the customer empties
 * stage 1 did not use, all collected (must ship) to the depot yards at the least truck cost. A depot's spare bins
 * are never moved merely to fill another yard. Loads of both stages on one physical lane travel on the same trucks:
 * `planLanes` adds them per lane and counts the trucks of the combined load, which can only save trucks. (One
 * model for both stages needs yard room only customer sites may fill, which the solver does not offer yet.)
 */
import type { LocalDate } from '@/lib/calendar';
import type { TruckPlanInput, TruckPlanResult } from './transport-plan';
import { naiveTruckPlan, type Point, truckCostMatrix, roadKm } from './lane-costs';

export interface DatedBins {
  date: LocalDate;
  bins: number;
}

export interface BalanceInput {
  /** Empties in the depot now (available or prepared). */
  onHand: number;
  /** Bins still to go out on confirmed orders, by wanted date (any order). */
  needs: readonly DatedBins[];
  /** Bins expected back by a date (cumulative, the low quantile of the forecast); nondecreasing in the date. */
  returnsBy: (date: LocalDate) => number;
}

export interface Balance {
  /** Bins that must come in from elsewhere to meet every order on its date. */
  shortage: number;
  /** The first wanted date the depot would be short on, when it is short. */
  shortOn: LocalDate | null;
  /** Bins that may leave today without making any order short. */
  spare: number;
  /** Sum of the needs. */
  needed: number;
}

export function depotBalance({ onHand, needs, returnsBy }: BalanceInput): Balance {
  if (!(Number.isInteger(onHand) && onHand >= 0)) throw new RangeError(`onHand must be a whole number ≥ 0 (got ${String(onHand)})`);
  const byDate = new Map<LocalDate, number>();
  for (const n of needs) {
    if (!(Number.isInteger(n.bins) && n.bins >= 0)) throw new RangeError(`needs must be whole numbers of bins ≥ 0 (got ${String(n.bins)})`);
    byDate.set(n.date, (byDate.get(n.date) ?? 0) + n.bins);
  }
  let cumulative = 0;
  let shortage = 0;
  let shortOn: LocalDate | null = null;
  let spare = onHand;
  for (const date of [...byDate.keys()].sort()) {
    cumulative += byDate.get(date)!;
    const back = Math.max(0, Math.floor(returnsBy(date)));
    const gap = cumulative - onHand - back;
    if (gap > shortage) {
      if (shortOn === null) shortOn = date;
      shortage = gap;
    }
    spare = Math.min(spare, onHand + back - cumulative);
  }
  return { shortage, shortOn, spare: Math.max(0, spare), needed: cumulative };
}

export interface RepoBinType {
  key: string;
  name: string;
  /** Folded empties of this type that fill one truck (the load plan's answer). */
  truckCapacity: number;
}

export interface RepoDepot {
  key: string;
  name: string;
  point: Point;
  /** Per bin type key. */
  balance: Record<string, Balance>;
}

export interface RepoSite {
  key: string;
  name: string;
  point: Point;
  /** Folded empties waiting for collection, per bin type key. */
  awaiting: Record<string, number>;
}

export interface RepositioningInput {
  types: readonly RepoBinType[];
  depots: readonly RepoDepot[];
  sites: readonly RepoSite[];
  costPerKm: number;
  roadFactor: number;
}

export type SourceRow = { kind: 'depot'; depot: RepoDepot } | { kind: 'site'; site: RepoSite };
export type DestinationColumn = { kind: 'shortage' | 'yard'; depot: RepoDepot };

export interface RepositioningProblem {
  input: TruckPlanInput;
  sources: SourceRow[];
  destinations: DestinationColumn[];
  types: readonly RepoBinType[];
  /** Road km per source and destination column. */
  km: number[][];
  costPerKm: number;
  roadFactor: number;
}

const place = (s: SourceRow) => (s.kind === 'depot' ? s.depot : s.site);

function problemOf(
  sources: SourceRow[],
  destinations: DestinationColumn[],
  supply: (s: SourceRow, t: RepoBinType) => number,
  demand: (d: DestinationColumn, t: RepoBinType) => number,
  { types, costPerKm, roadFactor }: Pick<RepositioningInput, 'types' | 'costPerKm' | 'roadFactor'>,
): RepositioningProblem {
  const points = destinations.map((d) => d.depot.point);
  const costs = truckCostMatrix(
    sources.map((s) => place(s).point),
    points,
    { roadFactor, costPerKm },
  );
  return {
    input: {
      supplies: sources.map((s) => types.map((t) => supply(s, t))),
      demands: destinations.map((d) => types.map((t) => demand(d, t))),
      // a depot does not send its spare bins to itself
      truckCosts: sources.map((s, i) => destinations.map((d, j) => (s.kind === 'depot' && d.depot.key === s.depot.key ? null : costs[i]![j]!))),
      truckCapacity: types.map((t) => t.truckCapacity),
      mustShip: sources.map((s) => s.kind === 'site' && destinations.every((d) => d.kind === 'yard')),
    },
    sources,
    destinations,
    types,
    km: sources.map((s) => points.map((p) => Math.round(roadKm(place(s).point, p, roadFactor)))),
    costPerKm,
    roadFactor,
  };
}

/** Stage 1: the shortages, from spare depot bins and customer empties (which need not all move here). */
export function shortageProblem(input: RepositioningInput): RepositioningProblem {
  const { types, depots, sites } = input;
  const sources: SourceRow[] = [
    ...depots.filter((d) => types.some((t) => (d.balance[t.key]?.spare ?? 0) > 0)).map((depot) => ({ kind: 'depot' as const, depot })),
    ...sites.filter((s) => types.some((t) => (s.awaiting[t.key] ?? 0) > 0)).map((site) => ({ kind: 'site' as const, site })),
  ];
  const destinations = depots.filter((d) => types.some((t) => (d.balance[t.key]?.shortage ?? 0) > 0)).map((depot) => ({ kind: 'shortage' as const, depot }));
  return problemOf(
    sources,
    destinations,
    (s, t) => (s.kind === 'depot' ? (s.depot.balance[t.key]?.spare ?? 0) : (s.site.awaiting[t.key] ?? 0)),
    (d, t) => d.depot.balance[t.key]?.shortage ?? 0,
    input,
  );
}

/** Stage 2: the customer empties stage 1 left where they are (`usedAt[i][k]` per stage-1 source), all to a depot yard. */
export function collectionProblem(input: RepositioningInput, stage1: RepositioningProblem, used: readonly (readonly number[])[]): RepositioningProblem {
  const left = new Map<string, number[]>();
  for (const site of input.sites)
    left.set(
      site.key,
      input.types.map((t) => site.awaiting[t.key] ?? 0),
    );
  stage1.sources.forEach((s, i) => {
    if (s.kind === 'site')
      left.set(
        s.site.key,
        left.get(s.site.key)!.map((n, k) => n - (used[i]?.[k] ?? 0)),
      );
  });
  const sources: SourceRow[] = input.sites.filter((s) => left.get(s.key)!.some((n) => n > 0)).map((site) => ({ kind: 'site' as const, site }));
  const totals = input.types.map((_, k) => [...left.values()].reduce((n, row) => n + row[k]!, 0));
  const destinations: DestinationColumn[] = sources.length ? input.depots.map((depot) => ({ kind: 'yard' as const, depot })) : [];
  return problemOf(
    sources,
    destinations,
    (s, t) => left.get((s as { site: RepoSite }).site.key)![input.types.indexOf(t)]!,
    (_d, t) => totals[input.types.indexOf(t)]!,
    input,
  );
}

/** Bins each source sends in a solved plan, per bin type. */
export function sentBy(problem: RepositioningProblem, lanes: ReadonlyArray<{ from: number; load: readonly number[] }>): number[][] {
  const sent = problem.sources.map(() => problem.types.map(() => 0));
  for (const l of lanes) l.load.forEach((b, k) => (sent[l.from]![k]! += b));
  return sent;
}

export interface PlanLane {
  fromKind: 'depot' | 'site';
  fromKey: string;
  from: string;
  toKey: string;
  to: string;
  /** Bins per bin type, in the problem's type order; of them, how many fill a shortage (the rest go to the yard). */
  bins: number[];
  toShortage: number[];
  trucks: number;
  km: number;
  costPerTruck: number;
  cost: number;
}

export interface PlanSummary {
  lanes: PlanLane[];
  totalCost: number;
  totalTrucks: number;
  totalBins: number;
  /** Per depot key and bin type: shortage left after the plan. */
  unmet: Array<{ depotKey: string; depot: string; typeKey: string; type: string; bins: number }>;
}

/** Whole trucks for a mix of bins: each bin of type k takes 1/capacity[k] of a truck. */
export function trucksFor(bins: readonly number[], capacity: readonly number[]): number {
  const load = bins.reduce((s, b, k) => s + b / capacity[k]!, 0);
  return load <= 1e-9 ? 0 : Math.ceil(load - 1e-9);
}

type StageLoads = { problem: RepositioningProblem; loads: ReadonlyArray<{ from: number; to: number; load: readonly number[] }>; unmetDemand?: readonly (readonly number[])[] };

function summarise(stages: readonly StageLoads[]): PlanSummary {
  const types = stages[0]!.problem.types;
  const capacity = stages[0]!.problem.input.truckCapacity;
  const byLane = new Map<string, PlanLane>();
  for (const { problem, loads } of stages) {
    for (const { from, to, load } of loads) {
      if (!load.some((b) => b > 0)) continue;
      const source = problem.sources[from]!;
      const dest = problem.destinations[to]!;
      const key = `${source.kind}:${place(source).key}→${dest.depot.key}`;
      const lane = byLane.get(key) ?? {
        fromKind: source.kind,
        fromKey: place(source).key,
        from: place(source).name,
        toKey: dest.depot.key,
        to: dest.depot.name,
        bins: types.map(() => 0),
        toShortage: types.map(() => 0),
        trucks: 0,
        km: problem.km[from]![to]!,
        costPerTruck: problem.input.truckCosts[from]![to] ?? 0,
        cost: 0,
      };
      load.forEach((b, k) => {
        lane.bins[k]! += b;
        if (dest.kind === 'shortage') lane.toShortage[k]! += b;
      });
      byLane.set(key, lane);
    }
  }
  const lanes = [...byLane.values()].map((l) => {
    const trucks = trucksFor(l.bins, capacity);
    return { ...l, trucks, cost: Math.round(trucks * l.costPerTruck * 100) / 100 };
  });
  lanes.sort((a, b) => a.from.localeCompare(b.from) || a.to.localeCompare(b.to));
  const unmet: PlanSummary['unmet'] = [];
  for (const { problem, unmetDemand } of stages) {
    problem.destinations.forEach((d, j) => {
      if (d.kind !== 'shortage') return;
      types.forEach((t, k) => {
        const bins = unmetDemand?.[j]?.[k] ?? 0;
        if (bins > 0) unmet.push({ depotKey: d.depot.key, depot: d.depot.name, typeKey: t.key, type: t.name, bins });
      });
    });
  }
  return {
    lanes,
    totalCost: Math.round(lanes.reduce((s, l) => s + l.cost, 0) * 100) / 100,
    totalTrucks: lanes.reduce((s, l) => s + l.trucks, 0),
    totalBins: lanes.reduce((s, l) => s + l.bins.reduce((a, b) => a + b, 0), 0),
    unmet,
  };
}

/** Both stages' answers per physical lane (loads on one lane share their trucks). */
export function planLanes(shortages: RepositioningProblem, first: TruckPlanResult, collections: RepositioningProblem | null, second: TruckPlanResult | null): PlanSummary {
  return summarise([{ problem: shortages, loads: first.lanes, unmetDemand: first.unmetDemand }, ...(collections && second ? [{ problem: collections, loads: second.lanes }] : [])]);
}

/**
 * The plan without the solver: each shortage filled from its nearest source with bins of that type left (as
 * `naiveTruckPlan`), then every site's empties not used so collected to the depot nearest to it.
 */
export function naiveRepositioning(input: RepositioningInput): PlanSummary {
  const shortages = shortageProblem(input);
  const naive = shortages.destinations.length ? naiveTruckPlan(shortages.input) : null;
  const first: Array<{ from: number; to: number; load: number[] }> = [];
  naive?.load.forEach((row, i) => row.forEach((load, j) => first.push({ from: i, to: j, load })));
  const collections = collectionProblem(input, shortages, sentBy(shortages, first));
  const second: Array<{ from: number; to: number; load: readonly number[] }> = [];
  collections.sources.forEach((_, i) => {
    let best = -1;
    collections.destinations.forEach((_, j) => {
      if (best < 0 || collections.input.truckCosts[i]![j]! < collections.input.truckCosts[i]![best]!) best = j;
    });
    if (best >= 0) second.push({ from: i, to: best, load: collections.input.supplies[i]! });
  });
  return summarise([
    { problem: shortages, loads: first, unmetDemand: naive?.unmetDemand },
    { problem: collections, loads: second },
  ]);
}

export interface RepositioningPlan {
  plan: PlanSummary;
  naive: PlanSummary;
  /** What the solver reported per stage (null when a stage had nothing to solve). */
  stages: { shortages: TruckPlanResult | null; collections: TruckPlanResult | null };
  /** Saving of the plan against the naive one (≥ 0 when both serve the same shortages). */
  saving: number;
}

type Solve = (input: TruckPlanInput) => Promise<TruckPlanResult>;
const EMPTY: TruckPlanResult = {
  status: 'optimal',
  hasPlan: true,
  totalCost: 0,
  totalTrucks: 0,
  lanes: [],
  unmetDemand: [],
  unusedSupply: [],
  mipGap: 0,
  bound: 0,
  solveSeconds: 0,
};

/** Both stages solved with `solve` (in a worker on the server, in-thread in tests), and the naive plan beside them. */
export async function planRepositioning(input: RepositioningInput, solve: Solve): Promise<RepositioningPlan> {
  const shortages = shortageProblem(input);
  const first = shortages.sources.length && shortages.destinations.length ? await solve(shortages.input) : null;
  const collections = collectionProblem(input, shortages, sentBy(shortages, first?.lanes ?? []));
  const second = collections.sources.length ? await solve(collections.input) : null;
  const unmetAll = { ...EMPTY, unmetDemand: shortages.input.demands.map((r) => [...r]) };
  const plan = planLanes(shortages, first ?? (shortages.destinations.length ? unmetAll : EMPTY), collections, second);
  const naive = naiveRepositioning(input);
  return { plan, naive, stages: { shortages: first, collections: second }, saving: Math.round((naive.totalCost - plan.totalCost) * 100) / 100 };
}
