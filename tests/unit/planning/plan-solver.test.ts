import { afterAll, describe, expect, it } from 'vitest';
import { solveTransportation, solveTruckPlan, PlanInputError } from '@/lib/planning/transport-plan';
import { solveTransportationOffThread, solveTruckPlanOffThread, stopPlanSolver } from '@/lib/planning/plan-solver.server';

// P&T Company case, Hillier & Lieberman (REFERENCES §7).
const PT = {
  supplies: [75, 125, 100],
  demands: [80, 65, 70, 85],
  costs: [
    [464, 513, 654, 867],
    [352, 416, 690, 791],
    [995, 682, 388, 685],
  ],
};

const strip = <T extends { solveSeconds: number }>(r: T) => ({ ...r, solveSeconds: 0 });

afterAll(() => stopPlanSolver());

describe('planning solver on a worker thread', () => {
  it('answers the P&T case exactly as the in-thread solver does (152,535)', async () => {
    const [direct, off] = await Promise.all([solveTransportation(PT), solveTransportationOffThread(PT)]);
    expect(off.totalCost).toBe(152_535);
    expect(strip(off)).toEqual(strip(direct));
  }, 60_000);

  it('answers a truck plan exactly as the in-thread solver does, with status and gap', async () => {
    const input = {
      supplies: [
        [10, 5],
        [0, 8],
      ],
      demands: [
        [6, 3],
        [4, 10],
      ],
      truckCosts: [
        [100, 150],
        [120, 90],
      ],
      truckCapacity: [10, 5],
    };
    const options = { timeLimit: 5, mipRelGap: 0 };
    const off = await solveTruckPlanOffThread(input, options);
    expect(strip(off)).toEqual(strip(await solveTruckPlan(input, options)));
    expect(off).toMatchObject({ status: 'optimal', totalCost: 530, mipGap: 0 });
  }, 60_000);

  it('passes bad input back as a PlanInputError with its message', async () => {
    await expect(solveTransportationOffThread({ supplies: [-1], demands: [1], costs: [[1]] })).rejects.toSatisfy(
      (e: unknown) => e instanceof PlanInputError && /supplies\[0\]/.test(e.message),
    );
  }, 60_000);

  it('keeps this thread free while it solves (timer ticks keep coming during a 40 × 400 LP)', async () => {
    const m = 40;
    const n = 400;
    let seed = 7;
    const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const input = {
      supplies: Array.from({ length: m }, () => 100 + Math.floor(rand() * 400)),
      demands: Array.from({ length: n }, () => 10 + Math.floor(rand() * 40)),
      costs: Array.from({ length: m }, () => Array.from({ length: n }, () => 1 + Math.floor(rand() * 1000))),
    };
    await solveTransportationOffThread(PT); // worker warm
    let last = performance.now();
    let worstGap = 0;
    const ticker = setInterval(() => {
      const now = performance.now();
      worstGap = Math.max(worstGap, now - last);
      last = now;
    }, 5);
    const t0 = performance.now();
    const r = await solveTransportationOffThread(input);
    const elapsed = performance.now() - t0;
    clearInterval(ticker);
    expect(r.status).toBe('optimal');
    expect(elapsed).toBeGreaterThan(50); // long enough for the check to mean something
    expect(worstGap).toBeLessThan(Math.max(100, elapsed / 2));
  }, 60_000);
});
