/**
 * Moving empties at the exact optimum: the classical transportation problem, and its integer-truck version.
 *
 * Both are solved by HiGHS (the `highs` package, HiGHS compiled to WebAssembly); there is no heuristic of our
 * own. This module is pure computation: the solver's WebAssembly is loaded once, on first use, from the
 * package. HiGHS solves synchronously on the calling thread, so servers call it through the worker runner
 * (`plan-solver.server.ts`), never on a request.
 *
 *   solveTransportation({ supplies, demands, costs }, options?)
 *       supplies[i] bins at source i, demands[j] bins wanted at destination j, costs[i][j] cost per bin on the
 *       lane i → j (null: no such lane). Minimum total cost; when supply and demand differ (or lanes are
 *       missing) as much demand as possible is met first, then at least cost, and the shortfall per
 *       destination (`unmetDemand`) and the surplus per source (`unusedSupply`) are reported.
 *
 *   solveTruckPlan({ supplies, demands, truckCosts, truckCapacity, mustShip? }, { timeLimit, mipRelGap })
 *       One commodity per bin type sharing whole trucks per lane: supplies[i][k] / demands[j][k] bins of type
 *       k, truckCosts[i][j] cost of one truck on the lane (null: no lane), truckCapacity[k] bins of type k
 *       that fill one truck. A truck may carry a mix: bins of type k take 1/truckCapacity[k] of it, so the
 *       bins of each type on a lane never exceed capacity × trucks, and neither does any mix. Sources marked
 *       `mustShip` (customer sites whose empties must all be collected) send everything they hold. Cost is
 *       charged per truck; trucks and bins are integers (a MIP). The answer carries the status and the
 *       relative gap HiGHS reports.
 *
 * Lexicographic objective, solved exactly in two steps: first the most demand that can be met (an LP per
 * bin type; a transportation LP with integer data has integer vertices), then the least cost with exactly
 * that much delivered. Bad input throws a PlanInputError with a message saying which value is wrong.
 */
import loadHighs from 'highs';
import type { Highs, ModelData } from 'highs';

export class PlanInputError extends Error {
  override name = 'PlanInputError';
}

/** What the solver says about the answer. 'optimal' for a MIP means within the requested relative gap. */
export type SolverStatus = 'optimal' | 'infeasible' | 'unbounded' | 'time_limit' | 'iteration_limit' | 'interrupted' | 'error';

export interface TransportationInput {
  supplies: readonly number[];
  demands: readonly number[];
  costs: readonly (readonly (number | null)[])[];
}

export interface TransportationFlow {
  from: number;
  to: number;
  amount: number;
  unitCost: number;
  cost: number;
}

export interface TransportationResult {
  status: SolverStatus;
  totalCost: number;
  totalShipped: number;
  flows: TransportationFlow[];
  /** Per destination: demand left unmet (0 when fully served). */
  unmetDemand: number[];
  /** Per source: supply left where it is. */
  unusedSupply: number[];
  /** Seconds HiGHS spent (both steps). */
  solveSeconds: number;
}

export interface TruckPlanInput {
  /** supplies[i][k]: bins of type k available at source i. */
  supplies: readonly (readonly number[])[];
  /** demands[j][k]: bins of type k wanted at destination j. */
  demands: readonly (readonly number[])[];
  /** truckCosts[i][j]: cost of one truck on lane i → j; null when there is no lane. */
  truckCosts: readonly (readonly (number | null)[])[];
  /** truckCapacity[k]: bins of type k that fill one truck on their own. */
  truckCapacity: readonly number[];
  /** mustShip[i]: everything at source i has to move (empties awaiting collection). */
  mustShip?: readonly boolean[];
}

export interface SolveOptions {
  /** Seconds HiGHS may spend on each step (HiGHS option `time_limit`). */
  timeLimit?: number;
  /** Relative gap at which the MIP stops (HiGHS option `mip_rel_gap`). */
  mipRelGap?: number;
}

export interface TruckLane {
  from: number;
  to: number;
  trucks: number;
  costPerTruck: number;
  cost: number;
  /** Bins of each type on the lane. */
  load: number[];
}

export interface TruckPlanResult {
  status: SolverStatus;
  /** False when the solver stopped without any feasible plan (lanes, flows and totals are then empty). */
  hasPlan: boolean;
  /** True when time ran out before HiGHS improved on (or took up) the rounded first plan, which is returned. */
  firstPlanOnly?: boolean;
  totalCost: number;
  totalTrucks: number;
  lanes: TruckLane[];
  /** unmetDemand[j][k]; unusedSupply[i][k]. */
  unmetDemand: number[][];
  unusedSupply: number[][];
  /**
   * Relative gap HiGHS reports between the plan and its lower bound (0 = proven optimal); null when there is
   * no plan, or when the search stopped before it had any bound (HiGHS then reports an infinite gap).
   */
  mipGap: number | null;
  /** HiGHS's lower bound on the cost. */
  bound: number | null;
  solveSeconds: number;
  /** Why there is no plan, in words, when hasPlan is false. */
  reason?: string;
}

export const DEFAULT_TIME_LIMIT_SECONDS = 10;
const DEFAULT_MIP_REL_GAP = 0.001;
const MIN_LP_SECONDS = 30;

let solverLoading: Promise<Highs> | null = null;

/** The HiGHS runtime, loaded once per thread. */
export function loadSolver(): Promise<Highs> {
  solverLoading ??= loadHighs().catch((error: unknown) => {
    solverLoading = null;
    throw error;
  });
  return solverLoading;
}

// ---------------------------------------------------------------------------------------------------------
// Input checks

function checkAmount(value: unknown, label: string, integer: boolean): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || (integer && !Number.isInteger(value))) {
    throw new PlanInputError(`${label} must be a ${integer ? 'whole number' : 'finite number'} ≥ 0 (got ${String(value)})`);
  }
  return value;
}

function checkCostMatrix(costs: unknown, rows: number, cols: number, label: string): (number | null)[][] {
  if (!Array.isArray(costs) || costs.length !== rows) {
    throw new PlanInputError(`${label} must have one row per source (${rows}), got ${Array.isArray(costs) ? costs.length : typeof costs}`);
  }
  return costs.map((row: unknown, i) => {
    if (!Array.isArray(row) || row.length !== cols) {
      throw new PlanInputError(`${label}[${i}] must have one entry per destination (${cols}), got ${Array.isArray(row) ? row.length : typeof row}`);
    }
    return row.map((c: unknown, j) => {
      if (c === null) return null;
      if (typeof c !== 'number' || !Number.isFinite(c)) {
        throw new PlanInputError(`${label}[${i}][${j}] must be a finite number, or null for no lane (got ${String(c)})`);
      }
      return c;
    });
  });
}

function checkList(value: unknown, label: string): unknown[] {
  if (!Array.isArray(value)) throw new PlanInputError(`${label} must be a list`);
  return value;
}

// ---------------------------------------------------------------------------------------------------------
// Running HiGHS

interface RunOutcome {
  status: SolverStatus;
  hasSolution: boolean;
  colValue: Float64Array;
  objective: number;
  mipGap: number | null;
  bound: number | null;
  seconds: number;
}

const STATUS_BY_CODE: Record<number, SolverStatus> = {
  7: 'optimal',
  8: 'infeasible',
  9: 'infeasible', // "unbounded or infeasible": our models are bounded (all flows are capped by supply)
  10: 'unbounded',
  13: 'time_limit',
  14: 'iteration_limit',
  17: 'interrupted',
};

function runModel(highs: Highs, data: ModelData, options: Record<string, number | string | boolean>, isMip: boolean, start?: Float64Array): RunOutcome {
  try {
    return highs.withModel(data, (model) => {
      model.options.set({ output_flag: false, ...options });
      if (start) model.setSolution({ colValue: start });
      model.run();
      const code = model.getModelStatus();
      const status = STATUS_BY_CODE[code] ?? 'error';
      const primal = Number(model.info.get('primal_solution_status')); // 2 = feasible
      const hasSolution = primal === 2;
      const colValue = hasSolution ? model.getSolution().colValue : new Float64Array(data.numCols);
      return {
        status,
        hasSolution,
        colValue,
        objective: hasSolution ? model.getObjectiveValue() : Number.NaN,
        mipGap: isMip && hasSolution ? Number(model.info.get('mip_gap')) : null,
        bound: isMip ? Number(model.info.get('mip_dual_bound')) : null,
        seconds: model.getRunTime(),
      };
    });
  } catch (error) {
    // A failure inside the WebAssembly may leave the runtime unusable: load a fresh one next time.
    solverLoading = null;
    throw error;
  }
}

/** Rows given as lists of column indices with coefficients → HiGHS CSR arrays. */
function csr(rows: { cols: number[]; vals: number[] }[], numCols: number) {
  const starts = [0];
  const indices: number[] = [];
  const values: number[] = [];
  for (const r of rows) {
    for (let t = 0; t < r.cols.length; t++) {
      indices.push(r.cols[t]);
      values.push(r.vals[t]);
    }
    starts.push(indices.length);
  }
  return {
    format: 'csr' as const,
    numRows: rows.length,
    numCols,
    starts: Int32Array.from(starts),
    indices: Int32Array.from(indices),
    values: Float64Array.from(values),
  };
}

/** A solver value that should be integral (vertex of a network LP, or an integer column), snapped. */
function snap(value: number): number {
  const rounded = Math.round(value) || 0; // never −0
  return Math.abs(value - rounded) <= 1e-6 * Math.max(1, Math.abs(value)) ? rounded : value;
}

interface Lane {
  from: number;
  to: number;
  cost: number;
}

/** Lane indices grouped by source and by destination, in one pass. */
function laneIndex(lanes: Lane[], sources: number, destinations: number) {
  const bySource: number[][] = Array.from({ length: sources }, () => []);
  const byDestination: number[][] = Array.from({ length: destinations }, () => []);
  lanes.forEach((l, li) => {
    bySource[l.from].push(li);
    byDestination[l.to].push(li);
  });
  return { bySource, byDestination };
}

function lanesOf(costs: (number | null)[][]): Lane[] {
  const lanes: Lane[] = [];
  costs.forEach((row, i) =>
    row.forEach((c, j) => {
      if (c !== null) lanes.push({ from: i, to: j, cost: c });
    }),
  );
  return lanes;
}

/**
 * Step 1: the most demand of each type that can be met over the given lanes, with mustShip sources sending
 * everything. Skipped (computed directly) when every lane exists and nothing must ship.
 */
function maxDeliverable(
  highs: Highs,
  supplies: number[][],
  demands: number[][],
  lanes: Lane[],
  mustShip: boolean[],
  options: Record<string, number | string | boolean>,
): { met: number[] | null; seconds: number } {
  const types = supplies[0]?.length ?? demands[0]?.length ?? 0;
  const complete = lanes.length === supplies.length * demands.length;
  if (complete && !mustShip.some(Boolean)) {
    const met = Array.from({ length: types }, (_, k) =>
      Math.min(
        supplies.reduce((s, row) => s + row[k], 0),
        demands.reduce((s, row) => s + row[k], 0),
      ),
    );
    return { met, seconds: 0 };
  }
  if (lanes.length === 0) {
    const stuck = supplies.some((row, i) => mustShip[i] && row.some((v) => v > 0));
    return { met: stuck ? null : Array(types).fill(0), seconds: 0 };
  }
  const numCols = lanes.length * types;
  const { bySource, byDestination } = laneIndex(lanes, supplies.length, demands.length);
  const rows: { cols: number[]; vals: number[] }[] = [];
  const rowLower: number[] = [];
  const rowUpper: number[] = [];
  supplies.forEach((row, i) => {
    for (let k = 0; k < types; k++) {
      const cols = bySource[i].map((li) => li * types + k);
      rows.push({ cols, vals: cols.map(() => 1) });
      rowLower.push(mustShip[i] ? row[k] : 0);
      rowUpper.push(row[k]);
    }
  });
  demands.forEach((row, j) => {
    for (let k = 0; k < types; k++) {
      const cols = byDestination[j].map((li) => li * types + k);
      rows.push({ cols, vals: cols.map(() => 1) });
      rowLower.push(0);
      rowUpper.push(row[k]);
    }
  });
  const outcome = runModel(
    highs,
    {
      numCols,
      numRows: rows.length,
      colCost: new Float64Array(numCols).fill(-1), // minimise −Σx = maximise what is delivered
      colLower: new Float64Array(numCols),
      colUpper: new Float64Array(numCols).fill(highs.infinity),
      rowLower: Float64Array.from(rowLower),
      rowUpper: Float64Array.from(rowUpper),
      matrix: csr(rows, numCols),
    },
    options,
    false,
  );
  if (outcome.status === 'infeasible') return { met: null, seconds: outcome.seconds };
  if (outcome.status !== 'optimal') {
    throw new Error(`HiGHS stopped with status ${outcome.status} while finding how much demand can be met`);
  }
  const met = Array(types).fill(0);
  lanes.forEach((_, li) => {
    for (let k = 0; k < types; k++) met[k] += outcome.colValue[li * types + k];
  });
  return { met: met.map(snap), seconds: outcome.seconds };
}

function highsOptions(options: SolveOptions | undefined, isMip: boolean): Record<string, number | string | boolean> {
  const timeLimit = options?.timeLimit ?? DEFAULT_TIME_LIMIT_SECONDS;
  if (!(typeof timeLimit === 'number' && timeLimit > 0)) throw new PlanInputError(`timeLimit must be a number of seconds > 0 (got ${String(timeLimit)})`);
  const out: Record<string, number | string | boolean> = { time_limit: timeLimit };
  if (isMip) {
    const gap = options?.mipRelGap ?? DEFAULT_MIP_REL_GAP;
    if (!(typeof gap === 'number' && gap >= 0 && gap < 1)) throw new PlanInputError(`mipRelGap must be a fraction in [0, 1) (got ${String(gap)})`);
    out.mip_rel_gap = gap;
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------------
// The transportation problem

export async function solveTransportation(input: TransportationInput, options?: SolveOptions): Promise<TransportationResult> {
  const supplies = checkList(input?.supplies, 'supplies').map((v, i) => checkAmount(v, `supplies[${i}]`, false));
  const demands = checkList(input?.demands, 'demands').map((v, j) => checkAmount(v, `demands[${j}]`, false));
  const costs = checkCostMatrix(input?.costs, supplies.length, demands.length, 'costs');
  const opts = highsOptions(options, false);
  const lanes = lanesOf(costs);
  const highs = await loadSolver();

  const { met, seconds: seconds1 } = maxDeliverable(
    highs,
    supplies.map((s) => [s]),
    demands.map((d) => [d]),
    lanes,
    supplies.map(() => false),
    opts,
  );
  const deliver = met![0];
  let flows: TransportationFlow[] = [];
  let status: SolverStatus = 'optimal';
  let seconds2 = 0;
  if (deliver > 0) {
    const numCols = lanes.length;
    const { bySource, byDestination } = laneIndex(lanes, supplies.length, demands.length);
    const rows = [...bySource, ...byDestination, lanes.map((_, li) => li)].map((cols) => ({ cols, vals: cols.map(() => 1) }));
    const outcome = runModel(
      highs,
      {
        numCols,
        numRows: rows.length,
        colCost: Float64Array.from(lanes.map((l) => l.cost)),
        colLower: new Float64Array(numCols),
        colUpper: new Float64Array(numCols).fill(highs.infinity),
        rowLower: Float64Array.from([...supplies.map(() => 0), ...demands.map(() => 0), deliver]),
        rowUpper: Float64Array.from([...supplies, ...demands, deliver]),
        matrix: csr(rows, numCols),
      },
      opts,
      false,
    );
    status = outcome.status;
    seconds2 = outcome.seconds;
    if (outcome.hasSolution) {
      flows = lanes
        .map((l, li) => {
          const amount = snap(outcome.colValue[li]);
          return { from: l.from, to: l.to, amount, unitCost: l.cost, cost: amount * l.cost };
        })
        .filter((f) => f.amount > 1e-9);
    }
  }
  const shipped = (pick: (f: TransportationFlow) => number, n: number) => {
    const sums = Array(n).fill(0);
    for (const f of flows) sums[pick(f)] += f.amount;
    return sums;
  };
  const inflow = shipped((f) => f.to, demands.length);
  const outflow = shipped((f) => f.from, supplies.length);
  return {
    status,
    totalCost: snap(flows.reduce((s, f) => s + f.cost, 0)),
    totalShipped: snap(flows.reduce((s, f) => s + f.amount, 0)),
    flows,
    unmetDemand: demands.map((d, j) => snap(d - inflow[j])),
    unusedSupply: supplies.map((s, i) => snap(s - outflow[i])),
    solveSeconds: seconds1 + seconds2,
  };
}

// ---------------------------------------------------------------------------------------------------------
// Whole trucks, several bin types

function checkTypeMatrix(value: unknown, label: string, types: number): number[][] {
  return checkList(value, label).map((row, i) => {
    const list = checkList(row, `${label}[${i}]`);
    if (list.length !== types) throw new PlanInputError(`${label}[${i}] must have one amount per bin type (${types}), got ${list.length}`);
    return list.map((v, k) => checkAmount(v, `${label}[${i}][${k}]`, true));
  });
}

/** Least common multiple of whole capacities, or 1 (fractional coefficients) when it would be large. */
function commonMultiple(values: number[]): number {
  const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));
  let l = 1;
  for (const v of values) {
    l = (l / gcd(l, v)) * v;
    if (l > 1e6) return 1;
  }
  return l;
}

export async function solveTruckPlan(input: TruckPlanInput, options?: SolveOptions): Promise<TruckPlanResult> {
  const capacity = checkList(input?.truckCapacity, 'truckCapacity').map((v, k) => {
    if (typeof v !== 'number' || !Number.isInteger(v) || v <= 0) {
      throw new PlanInputError(`truckCapacity[${k}] must be a whole number of bins > 0 (got ${String(v)})`);
    }
    return v;
  });
  const types = capacity.length;
  if (types === 0) throw new PlanInputError('truckCapacity must name at least one bin type');
  const supplies = checkTypeMatrix(input.supplies, 'supplies', types);
  const demands = checkTypeMatrix(input.demands, 'demands', types);
  const costs = checkCostMatrix(input.truckCosts, supplies.length, demands.length, 'truckCosts');
  const mustShip =
    input.mustShip === undefined
      ? supplies.map(() => false)
      : checkList(input.mustShip, 'mustShip').map((v, i) => {
          if (typeof v !== 'boolean') throw new PlanInputError(`mustShip[${i}] must be true or false`);
          return v;
        });
  if (mustShip.length !== supplies.length) throw new PlanInputError(`mustShip must have one entry per source (${supplies.length}), got ${mustShip.length}`);
  costs.forEach((row, i) =>
    row.forEach((c, j) => {
      if (c !== null && c < 0) throw new PlanInputError(`truckCosts[${i}][${j}] must be ≥ 0 (got ${c})`);
    }),
  );
  const mipOpts = highsOptions(options, true);
  // The LP steps before the search (milliseconds on an idle machine) may take longer than a very short
  // limit: without them there is no plan at all. The search gets what is left of the limit, at least 0.5 s.
  const lpOpts = { ...highsOptions(options, false), time_limit: Math.max(Number(mipOpts.time_limit), MIN_LP_SECONDS) };
  const lanes = lanesOf(costs);
  const highs = await loadSolver();

  const noPlan = (status: SolverStatus, reason: string, seconds: number): TruckPlanResult => ({
    status,
    hasPlan: false,
    totalCost: 0,
    totalTrucks: 0,
    lanes: [],
    unmetDemand: demands.map((r) => [...r]),
    unusedSupply: supplies.map((r) => [...r]),
    mipGap: null,
    bound: null,
    solveSeconds: seconds,
    reason,
  });

  const step1 = maxDeliverable(highs, supplies, demands, lanes, mustShip, lpOpts);
  if (step1.met === null) {
    return noPlan('infeasible', 'the empties that must be collected cannot all be taken to a destination over the lanes given', step1.seconds);
  }
  const met = step1.met;
  if (met.every((m) => m === 0)) {
    // Nothing can be delivered (no demand, or no lane to it) and nothing must move: the empty plan is optimal.
    const { reason: _none, ...rest } = noPlan('optimal', '', step1.seconds);
    return { ...rest, hasPlan: true, mipGap: 0, bound: 0 };
  }

  // Columns: x[lane][type] (bins, integer) then y[lane] (trucks, integer).
  const L = lanes.length;
  const xCol = (li: number, k: number) => li * types + k;
  const yCol = (li: number) => L * types + li;
  const numCols = L * types + L;
  const { bySource, byDestination } = laneIndex(lanes, supplies.length, demands.length);
  const rows: { cols: number[]; vals: number[] }[] = [];
  const rowLower: number[] = [];
  const rowUpper: number[] = [];
  supplies.forEach((row, i) => {
    for (let k = 0; k < types; k++) {
      const cols = bySource[i].map((li) => xCol(li, k));
      rows.push({ cols, vals: cols.map(() => 1) });
      rowLower.push(mustShip[i] ? row[k] : 0);
      rowUpper.push(row[k]);
    }
  });
  demands.forEach((row, j) => {
    for (let k = 0; k < types; k++) {
      const cols = byDestination[j].map((li) => xCol(li, k));
      rows.push({ cols, vals: cols.map(() => 1) });
      rowLower.push(0);
      rowUpper.push(row[k]);
    }
  });
  for (let k = 0; k < types; k++) {
    const cols = lanes.map((_, li) => xCol(li, k));
    rows.push({ cols, vals: cols.map(() => 1) });
    rowLower.push(met[k]);
    rowUpper.push(met[k]);
  }
  // Σk x[lane][k] / capacity[k] ≤ y[lane]: the mix on a lane fits in its trucks. Written with whole
  // coefficients (× the least common multiple of the capacities, when it is small), which the solver's
  // integer-rounding cuts work with far better than with fractions.
  const scale = commonMultiple(capacity);
  lanes.forEach((_, li) => {
    const cols = [...capacity.map((_, k) => xCol(li, k)), yCol(li)];
    rows.push({ cols, vals: [...capacity.map((c) => scale / c), -scale] });
    rowLower.push(-highs.infinity);
    rowUpper.push(0);
  });
  // Valid inequalities that change no integer plan but tighten the LP relaxation a great deal (the usual
  // strong linking of fixed-charge network design): a lane without a truck carries nothing, so
  // x[lane][k] ≤ min(supply, demand) × y[lane] whenever that amount is under a full truck of type k.
  lanes.forEach((l, li) => {
    for (let k = 0; k < types; k++) {
      const most = Math.min(supplies[l.from][k], demands[l.to][k]);
      if (most > 0 && most < capacity[k]) {
        rows.push({ cols: [xCol(li, k), yCol(li)], vals: [1, -most] });
        rowLower.push(-highs.infinity);
        rowUpper.push(0);
      }
    }
  });
  // When all demand of every type is met, each destination receives all it asked for, in whole trucks:
  // at least ⌈Σk demand/capacity⌉ trucks arrive there. Likewise a source that sends everything.
  const totalOf = (m: number[][], k: number) => m.reduce((sum, row) => sum + row[k], 0);
  const allDemandMet = capacity.every((_, k) => met[k] === totalOf(demands, k));
  const allSupplyUsed = capacity.every((_, k) => met[k] === totalOf(supplies, k));
  const truckFloor = (amounts: number[]) => Math.ceil(amounts.reduce((sum, a, k) => sum + a / capacity[k], 0) - 1e-9);
  if (allDemandMet) {
    demands.forEach((row, j) => {
      const floor = truckFloor(row);
      if (floor > 0) {
        const cols = byDestination[j].map(yCol);
        rows.push({ cols, vals: cols.map(() => 1) });
        rowLower.push(floor);
        rowUpper.push(highs.infinity);
      }
    });
  }
  supplies.forEach((row, i) => {
    const floor = truckFloor(row);
    if ((mustShip[i] || allSupplyUsed) && floor > 0) {
      const cols = bySource[i].map(yCol);
      rows.push({ cols, vals: cols.map(() => 1) });
      rowLower.push(floor);
      rowUpper.push(highs.infinity);
    }
  });
  const colCost = new Float64Array(numCols);
  const colUpper = new Float64Array(numCols).fill(highs.infinity);
  lanes.forEach((l, li) => {
    colCost[yCol(li)] = l.cost;
    for (let k = 0; k < types; k++) colUpper[xCol(li, k)] = Math.min(supplies[l.from][k], demands[l.to][k]);
    // No more trucks than the lane could ever fill: a tighter bound helps the branch and bound.
    colUpper[yCol(li)] = Math.ceil(capacity.reduce((s, c, k) => s + colUpper[xCol(li, k)] / c, 0) - 1e-9);
  });
  // A first plan for the branch and bound to improve on: each bin type moved at its share of a truck's cost
  // (a transportation LP per type, whose vertices are whole numbers), then trucks rounded up per lane.
  const startLp = runModel(
    highs,
    {
      numCols: L * types,
      numRows: supplies.length * types + demands.length * types + types,
      colCost: Float64Array.from(lanes.flatMap((l) => capacity.map((c) => l.cost / c))),
      colLower: new Float64Array(L * types),
      colUpper: new Float64Array(L * types).fill(highs.infinity),
      rowLower: Float64Array.from(rowLower.slice(0, supplies.length * types + demands.length * types + types)),
      rowUpper: Float64Array.from(rowUpper.slice(0, supplies.length * types + demands.length * types + types)),
      matrix: csr(rows.slice(0, supplies.length * types + demands.length * types + types), L * types),
    },
    lpOpts,
    false,
  );
  let start: Float64Array | undefined;
  if (startLp.hasSolution) {
    const x = Array.from(startLp.colValue, snap);
    if (x.every(Number.isInteger)) {
      start = new Float64Array(numCols);
      x.forEach((v, c) => (start![c] = v));
      lanes.forEach((_, li) => {
        start![yCol(li)] = Math.ceil(capacity.reduce((sum, c, k) => sum + x[xCol(li, k)] / c, 0) - 1e-9);
      });
    }
  }
  const outcome = runModel(
    highs,
    {
      numCols,
      numRows: rows.length,
      colCost,
      colLower: new Float64Array(numCols),
      colUpper,
      rowLower: Float64Array.from(rowLower),
      rowUpper: Float64Array.from(rowUpper),
      matrix: csr(rows, numCols),
      integrality: new Int32Array(numCols).fill(highs.constants.variableType.integer),
    },
    // The time limit is for the whole plan: the MIP gets what the first steps left of it.
    { ...mipOpts, time_limit: Math.max(0.5, Number(mipOpts.time_limit) - step1.seconds - startLp.seconds) },
    true,
    start,
  );
  const seconds = step1.seconds + startLp.seconds + outcome.seconds;
  // Stopped before HiGHS took up any plan of its own (a very short limit on a busy machine): the first plan is
  // still a valid answer; its gap is measured against HiGHS's bound, HiGHS's way (|plan − bound| / |plan|).
  const usedFirstPlan = !outcome.hasSolution && start !== undefined;
  const values = usedFirstPlan ? start! : outcome.colValue;
  if (!outcome.hasSolution && !usedFirstPlan) {
    const reason =
      outcome.status === 'time_limit'
        ? 'the time limit ran out before the solver found a plan in whole trucks'
        : `the solver found no plan in whole trucks (status ${outcome.status})`;
    return noPlan(outcome.status, reason, seconds);
  }
  const planLanes: TruckLane[] = [];
  const unmetDemand = demands.map((r) => [...r]);
  const unusedSupply = supplies.map((r) => [...r]);
  lanes.forEach((l, li) => {
    const trucks = snap(values[yCol(li)]);
    const load = capacity.map((_, k) => snap(values[xCol(li, k)]));
    load.forEach((b, k) => {
      unmetDemand[l.to][k] -= b;
      unusedSupply[l.from][k] -= b;
    });
    if (trucks > 0 || load.some((b) => b > 0)) {
      planLanes.push({ from: l.from, to: l.to, trucks, costPerTruck: l.cost, cost: trucks * l.cost, load });
    }
  });
  const totalCost = snap(planLanes.reduce((s, l) => s + l.cost, 0));
  const bound = outcome.bound !== null && Number.isFinite(outcome.bound) ? outcome.bound : null;
  const firstPlanGap = bound === null ? null : totalCost === 0 ? 0 : Math.abs(totalCost - bound) / Math.abs(totalCost);
  return {
    status: outcome.status,
    hasPlan: true,
    firstPlanOnly: usedFirstPlan,
    totalCost,
    totalTrucks: planLanes.reduce((s, l) => s + l.trucks, 0),
    lanes: planLanes,
    unmetDemand: unmetDemand.map((r) => r.map(snap)),
    unusedSupply: unusedSupply.map((r) => r.map(snap)),
    mipGap: usedFirstPlan ? firstPlanGap : outcome.mipGap !== null && Number.isFinite(outcome.mipGap) ? outcome.mipGap : null,
    bound,
    solveSeconds: seconds,
  };
}
