// `npm run bench:plan`: the repositioning solvers at the sizes the planning issue asks for, raw timings.
//
//   1. a 50 × 500 transportation LP to optimality (goal: under 2 s), in this thread and on the solver worker;
//   2. the integer-truck version, 20 sources × 100 destinations with two bin types (two instances: small drops
//      and larger loads), time limit 10 s,
//      relative gap target 1 % (goal: gap under 1 % within 10 s), on the solver worker, while this thread's
//      timer lag is sampled every 10 ms (the worker must leave the event loop free).
//
//   npm run bench:plan                 3 runs of each (after one warm-up LP)
//   npm run bench:plan -- --runs 5
//
// Not part of `npm test`. Instances come from a fixed seed, so every run solves the same problems.
import { performance } from 'node:perf_hooks';
import { cpus, loadavg } from 'node:os';
import { seededRandom } from '@/lib/random';
import { solveTransportation } from '@/lib/planning/transport-plan';
import type { TransportationInput, TruckPlanInput } from '@/lib/planning/transport-plan';
import { solveTransportationOffThread, solveTruckPlanOffThread, stopPlanSolver } from '@/lib/planning/plan-solver.server';

const args = process.argv.slice(2);
const runsArg = args.indexOf('--runs');
const RUNS = runsArg >= 0 ? Number(args[runsArg + 1]) : 3;

/** Sites scattered over a 600 km square; lane cost grows with the distance (cost per bin or per truck). */
function places(rand: ReturnType<typeof seededRandom>, n: number) {
  return Array.from({ length: n }, () => ({ x: rand.next() * 600, y: rand.next() * 600 }));
}
const km = (a: { x: number; y: number }, b: { x: number; y: number }) => Math.hypot(a.x - b.x, a.y - b.y) * 1.3;

function transportationInstance(m: number, n: number, seed: number): TransportationInput {
  const rand = seededRandom(seed);
  const from = places(rand, m);
  const to = places(rand, n);
  return {
    supplies: from.map(() => rand.int(100, 500)),
    demands: to.map(() => rand.int(10, 50)),
    costs: from.map((a) => to.map((b) => Math.round(km(a, b) * 0.08 * 100) / 100)),
  };
}

/**
 * 'drops': every destination short of less than one truck (up to 18 + 10 bins);
 * 'loads': destinations short of up to about 2.3 trucks (60 + 30 bins), so lanes split and trucks mix.
 * Supply of each type exceeds demand, so some depots keep a surplus.
 */
function truckInstance(m: number, n: number, seed: number, size: 'drops' | 'loads'): TruckPlanInput {
  const rand = seededRandom(seed);
  const from = places(rand, m);
  const to = places(rand, n);
  const big = size === 'loads';
  return {
    supplies: from.map(() => (big ? [rand.int(100, 300), rand.int(50, 150)] : [rand.int(40, 160), rand.int(20, 90)])),
    demands: to.map(() => (big ? [rand.int(0, 60), rand.int(0, 30)] : [rand.int(0, 18), rand.int(0, 10)])),
    truckCosts: from.map((a) => to.map((b) => Math.round(120 + km(a, b) * 1.6))),
    truckCapacity: [52, 26], // folded bins of each type filling one truck (bench figures)
  };
}

const ms = (t: number) => `${t.toFixed(0)} ms`;
const pct = (values: number[], p: number) => {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] ?? 0;
};

async function main() {
  console.log(
    `bench:plan  ${cpus().length} cores, load average ${loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')}, node ${process.version}`,
  );

  const lp = transportationInstance(50, 500, 14);
  const supply = lp.supplies.reduce((a, b) => a + b, 0);
  const demand = lp.demands.reduce((a, b) => a + b, 0);
  console.log(`\n1. transportation LP 50 × 500 (25,000 lanes), supply ${supply}, demand ${demand}`);
  const warm = performance.now();
  await solveTransportation({ supplies: [1], demands: [1], costs: [[1]] });
  console.log(`   warm-up (load HiGHS WebAssembly): ${ms(performance.now() - warm)}`);
  for (let r = 1; r <= RUNS; r++) {
    const t0 = performance.now();
    const res = await solveTransportation(lp);
    const wall = performance.now() - t0;
    console.log(
      `   in thread run ${r}: ${ms(wall)} wall, HiGHS ${ms(res.solveSeconds * 1000)}, status ${res.status}, cost ${res.totalCost.toFixed(2)}, lanes used ${res.flows.length}, unused supply ${res.unusedSupply.reduce((a, b) => a + b, 0)}  ${wall < 2000 && res.status === 'optimal' ? 'OK (< 2 s)' : 'OVER GOAL'}`,
    );
  }
  const start = performance.now();
  await solveTransportationOffThread({ supplies: [1], demands: [1], costs: [[1]] });
  console.log(`   worker start (tsx + WebAssembly): ${ms(performance.now() - start)}`);
  for (let r = 1; r <= RUNS; r++) {
    const t0 = performance.now();
    const res = await solveTransportationOffThread(lp);
    const wall = performance.now() - t0;
    console.log(
      `   on worker run ${r}: ${ms(wall)} wall (with copying), HiGHS ${ms(res.solveSeconds * 1000)}, status ${res.status}, cost ${res.totalCost.toFixed(2)}  ${wall < 2000 && res.status === 'optimal' ? 'OK (< 2 s)' : 'OVER GOAL'}`,
    );
  }

  for (const size of ['drops', 'loads'] as const) {
    const mip = truckInstance(20, 100, 15, size);
    const totals = (rows: readonly (readonly number[])[]) => [0, 1].map((k) => rows.reduce((s, r) => s + r[k], 0));
    console.log(
      `\n2${size === 'drops' ? 'a' : 'b'}. integer trucks 20 × 100, two bin types, '${size}' (capacity ${mip.truckCapacity.join(' / ')} per truck), supply ${totals(mip.supplies).join(' / ')}, demand ${totals(mip.demands).join(' / ')}`,
    );
    console.log('   options: time_limit 10 s (whole plan), mip_rel_gap 0.01');
    for (let r = 1; r <= RUNS; r++) {
      const lags: number[] = [];
      let last = performance.now();
      const ticker = setInterval(() => {
        const now = performance.now();
        lags.push(now - last - 10);
        last = now;
      }, 10);
      const t0 = performance.now();
      const res = await solveTruckPlanOffThread(mip, { timeLimit: 10, mipRelGap: 0.01 });
      const wall = performance.now() - t0;
      clearInterval(ticker);
      const gap = res.mipGap === null ? 'none' : `${(res.mipGap * 100).toFixed(3)} %`;
      const ok = res.hasPlan && res.mipGap !== null && res.mipGap < 0.01 && res.solveSeconds <= 10.5;
      console.log(
        `   run ${r}: ${ms(wall)} wall, HiGHS ${ms(res.solveSeconds * 1000)}, status ${res.status}, gap ${gap}, cost ${res.totalCost} (bound ${res.bound?.toFixed(1)}), trucks ${res.totalTrucks} on ${res.lanes.length} lanes; ` +
          `this thread's timer lag p50 ${pct(lags, 50).toFixed(1)} ms, p99 ${pct(lags, 99).toFixed(1)} ms, max ${Math.max(0, ...lags).toFixed(1)} ms  ${ok ? 'OK (gap < 1 %)' : 'OVER GOAL'}`,
      );
    }
  }
  await stopPlanSolver();
}

main().catch(async (error) => {
  console.error(error);
  await stopPlanSolver();
  process.exit(1);
});
