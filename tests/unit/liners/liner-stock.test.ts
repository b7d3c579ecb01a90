// Checks liner-stock.ts against outside sources (shared REFERENCES.md §8) and against cases worked by hand,
// with the working written beside each. Second opinion for the normal quantile: @stdlib's normal quantile
// function, a statistics package the module does not use (it carries its own rational approximation).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import stdlibQuantile from '@stdlib/stats-base-dists-normal-quantile';
import {
  proposeTransfer,
  annualOrderingAndHoldingCost,
  daysOfCover,
  eoq,
  forecastFromDaily,
  knownDemandByDay,
  planReorder,
  projectFefo,
  reorderPoint,
  roundOrderQuantity,
  safetyStock,
  unplannedDaily,
  zForServiceLevel,
  type StockLot,
} from '@/lib/liners/liner-stock';

describe('economic order quantity', () => {
  // Heizer & Render, Operations Management, inventory chapter: D = 1,000 units/yr, S = $10/order,
  // H = $0.50/unit/yr → EOQ = √(2·1000·10/0.5) = 200 [published]; ordering + holding cost $100 [computed].
  test('Heizer & Render example: EOQ = 200', () => {
    expect(eoq(1000, 10, 0.5)).toBeCloseTo(200, 10);
  });
  test('Heizer & Render example: annual ordering + holding cost at the EOQ = $100', () => {
    expect(annualOrderingAndHoldingCost({ annualDemand: 1000, orderCost: 10, holdingCostPerUnitYear: 0.5, orderQuantity: 200 })).toBeCloseTo(100, 10);
  });
  test('the EOQ is where the annual cost is least (any other quantity costs more)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 100_000 }),
        fc.integer({ min: 1, max: 500 }),
        fc.double({ min: 0.05, max: 20, noNaN: true }),
        fc.double({ min: 0.5, max: 2, noNaN: true }),
        (d, s, h, f) => {
          const q = eoq(d, s, h);
          const cost = (x: number) => annualOrderingAndHoldingCost({ annualDemand: d, orderCost: s, holdingCostPerUnitYear: h, orderQuantity: x });
          expect(cost(q * f)).toBeGreaterThanOrEqual(cost(q) - 1e-9 * cost(q));
        },
      ),
    );
  });
  test('nonsense inputs are refused with a message', () => {
    expect(() => eoq(1000, 10, 0)).toThrow(/holding cost/);
    expect(() => eoq(-1, 10, 1)).toThrow(/annual demand/);
    expect(() => eoq(Number.NaN, 10, 1)).toThrow(RangeError);
  });
});

describe('z for a cycle service level', () => {
  // Standard normal table (REFERENCES.md §8): 95 % → 1.645 [published table]; 90 % → 1.2816 and
  // 99 % → 2.3263 [computed].
  test.each([
    [0.95, 1.645, 3],
    [0.9, 1.2816, 4],
    [0.99, 2.3263, 4],
    [0.5, 0, 12],
  ])('normal table: Φ⁻¹(%s) = %s', (p, z, digits) => {
    expect(zForServiceLevel(p)).toBeCloseTo(z, digits);
  });
  test('symmetric: z(1 − p) = −z(p)', () => {
    expect(zForServiceLevel(0.05)).toBeCloseTo(-1.645, 3);
    expect(zForServiceLevel(0.001)).toBeCloseTo(-zForServiceLevel(0.999), 7);
  });
  test('agrees with @stdlib/stats-base-dists-normal-quantile to 1e-8 relative for 1e-10 ≤ p ≤ 1 − 1e-10, both tails included', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-10, max: 1 - 1e-10, noNaN: true }), (p) => {
        const ours = zForServiceLevel(p);
        const theirs = stdlibQuantile(p, 0, 1);
        expect(Math.abs(ours - theirs)).toBeLessThanOrEqual(1e-8 * Math.max(1, Math.abs(theirs)));
      }),
      { numRuns: 2000 },
    );
    for (const p of [1e-10, 0.02425, 0.0242, 0.0243, 0.97575, 0.999999]) {
      expect(Math.abs(zForServiceLevel(p) - stdlibQuantile(p, 0, 1))).toBeLessThanOrEqual(1e-8 * Math.max(1, Math.abs(stdlibQuantile(p, 0, 1))));
    }
    // Further out the approximation loosens (measured: 4.4e-7 relative at 1e-12), far beyond any service level.
    expect(Math.abs(zForServiceLevel(1e-12) - stdlibQuantile(1e-12, 0, 1))).toBeLessThan(1e-5);
  });
  test('a service level of 0, 1 or outside is refused', () => {
    for (const p of [0, 1, -0.1, 1.5, Number.NaN, 95]) expect(() => zForServiceLevel(p)).toThrow(/strictly between 0 and 1/);
  });
});

describe('reorder point', () => {
  // Stevenson, Operations Management: ROP = d̄·L + z·σd·√L [published formula]. Worked here with
  // d̄ = 10/day, σd = 3/day, L = 9 days, 95 % (z = 1.645 from the table): 90 + 1.645·3·3 = 104.805 [computed].
  test('Stevenson formula, worked: d̄ 10, σd 3, L 9 days, 95 % → 104.8', () => {
    const rop = reorderPoint({ meanDailyDemand: 10, sdDailyDemand: 3, leadTimeDays: 9, serviceLevel: 0.95 });
    expect(rop).toBeCloseTo(104.805, 2);
    expect(safetyStock({ meanDailyDemand: 10, sdDailyDemand: 3, leadTimeDays: 9, serviceLevel: 0.95 })).toBeCloseTo(14.805, 2);
  });
  test('no spread: the reorder point is the lead-time demand', () => {
    expect(reorderPoint({ meanDailyDemand: 12, sdDailyDemand: 0, leadTimeDays: 14, serviceLevel: 0.99 })).toBe(168);
  });
  test('a negative lead time is refused', () => {
    expect(() => reorderPoint({ meanDailyDemand: 1, sdDailyDemand: 1, leadTimeDays: -2, serviceLevel: 0.95 })).toThrow(/lead time/);
  });
});

describe('rounding an order to packs and the minimum order', () => {
  // Hand-worked: 130 wanted, minimum 200 → 200 (4 packs of 50); 230 → 250 (5 packs); minimum 220 → 250.
  test.each([
    [130, 50, 200, 200],
    [230, 50, 200, 250],
    [1, 50, 220, 250],
    [240.0000000001, 40, 0, 240],
    [241, 40, 0, 280],
    [0, 50, 200, 0],
  ])('%s wanted, packs of %s, minimum %s → %s', (wanted, packSize, minimumOrder, expected) => {
    expect(roundOrderQuantity(wanted, { packSize, minimumOrder })).toBe(expected);
  });
  test('a pack of no liners is refused', () => {
    expect(() => roundOrderQuantity(10, { packSize: 0, minimumOrder: 0 })).toThrow(/pack size/);
  });
});

describe('days of cover (hand-worked)', () => {
  const steady = (mean: number, sd = 0) => ({ mean, sd });
  test('100 liners at 10 a day last 10 days', () => {
    expect(daysOfCover(100, { known: [], forecast: steady(10) })).toBe(10);
  });
  test('30 more known today: 100 − 40 = 60 after today, then 6 days at 10 → 7 days', () => {
    expect(daysOfCover(100, { known: [30], forecast: steady(10) })).toBe(7);
  });
  test('only the order book: 25 liners against 10, 10, 10 → 2 full days and half of the third = 2.5', () => {
    expect(daysOfCover(25, { known: [10, 10, 10], forecast: steady(0) })).toBe(2.5);
  });
  test('the order book ends before the stock and nothing else is used: never runs out', () => {
    expect(daysOfCover(35, { known: [10, 10, 10], forecast: steady(0) })).toBe(Infinity);
  });
  test('no stock: 0 days', () => {
    expect(daysOfCover(0, { known: [], forecast: steady(3) })).toBe(0);
  });
});

describe('known demand from the order book', () => {
  // today 1 Jan 2027, horizon 5 days. An overdue order of 4 bins counts today; 10 bins + 2 kits on 3 Jan
  // (index 2); an order on 10 Jan lies beyond the horizon. 6 bins already lined cover the overdue 4 and 2 of
  // the 10 → [0, 0, 8 + 2, 0, 0].
  test('one liner per bin still to go and per kit, lined bins serve the earliest orders', () => {
    const days = knownDemandByDay(
      [
        { neededBy: '2027-01-03', bins: 10, kits: 2 },
        { neededBy: '2026-12-30', bins: 4 },
        { neededBy: '2027-01-10', bins: 5 },
      ],
      { today: '2027-01-01', horizonDays: 5, linedReady: 6 },
    );
    expect(days).toEqual([0, 0, 10, 0, 0]);
  });
  test('without lined bins every bin counts', () => {
    expect(
      knownDemandByDay(
        [
          { neededBy: '2027-01-01', bins: 3 },
          { neededBy: '2027-01-02', bins: 2 },
        ],
        { today: '2027-01-01', horizonDays: 2 },
      ),
    ).toEqual([3, 2]);
  });
  test('a malformed day is refused', () => {
    expect(() => knownDemandByDay([{ neededBy: '3 Jan', bins: 1 }], { today: '2027-01-01', horizonDays: 2 })).toThrow(/YYYY-MM-DD/);
  });
});

describe('forecast from recent unplanned use', () => {
  // Hand-worked: 2, 4, 4, 4, 5, 5, 7, 9 → mean 40/8 = 5; squared deviations 9+1+1+1+0+0+4+16 = 32;
  // sample sd √(32/7) = 2.13809.
  test('mean and sample standard deviation', () => {
    const f = forecastFromDaily([2, 4, 4, 4, 5, 5, 7, 9]);
    expect(f.mean).toBe(5);
    expect(f.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
  });
  test('no days: no forecast; one day: no spread', () => {
    expect(forecastFromDaily([])).toEqual({ mean: 0, sd: 0 });
    expect(forecastFromDaily([7])).toEqual({ mean: 7, sd: 0 });
  });
  test('unplanned is what was used beyond what the order book asked for, never below zero', () => {
    expect(
      unplannedDaily([
        { consumed: 12, planned: 10 },
        { consumed: 3, planned: 8 },
        { consumed: 5, planned: 0 },
      ]),
    ).toEqual([2, 0, 5]);
  });
});

describe('reorder plan with a known and a forecast part (hand-worked)', () => {
  // Known [10, 0, 20, 0 …] (10 days), forecast 4 ± 2 a day, lead time 4 days, 95 %:
  //   known in lead time 10 + 0 + 20 + 0 = 30; forecast 4·4 = 16; safety 1.6449·2·√4 = 6.5794; ROP 52.579.
  //   annual demand (30/10 + 4)·365 = 2,555; EOQ √(2·2555·50/2) = √127,750 = 357.42.
  //   position 40 ≤ ROP → want 52.58 + 357.42 − 40 = 370.0 → packs of 25 → 375.
  const input = {
    demand: { known: [10, 0, 20, 0, 0, 0, 0, 0, 0, 0], forecast: { mean: 4, sd: 2 } },
    leadTimeDays: 4,
    serviceLevel: 0.95,
    orderCost: 50,
    holdingCostPerUnitYear: 2,
    pack: { packSize: 25, minimumOrder: 100 },
  };
  test('order due: the parts, the reorder point and the rounded quantity', () => {
    const plan = planReorder({ ...input, inventoryPosition: 40 });
    expect(plan.knownInLeadTime).toBe(30);
    expect(plan.forecastInLeadTime).toBe(16);
    expect(plan.safetyStock).toBeCloseTo(6.5794, 3);
    expect(plan.reorderPoint).toBeCloseTo(52.579, 2);
    expect(plan.annualDemand).toBeCloseTo(2555, 9);
    expect(plan.eoq).toBeCloseTo(357.42, 2);
    expect(plan.reorderNow).toBe(true);
    expect(plan.suggestedQuantity).toBe(375);
  });
  test('above the reorder point: no order', () => {
    const plan = planReorder({ ...input, inventoryPosition: 60 });
    expect(plan.reorderNow).toBe(false);
    expect(plan.suggestedQuantity).toBe(0);
  });
  test('a lead time of 2.5 days takes half of the third day of the order book: 10 + 0 + 20/2 = 20', () => {
    expect(planReorder({ ...input, leadTimeDays: 2.5, inventoryPosition: 0 }).knownInLeadTime).toBe(20);
  });
  test('a small need is raised to the supplier minimum', () => {
    const plan = planReorder({ ...input, demand: { known: [], forecast: { mean: 0.1, sd: 0 } }, orderCost: 1, holdingCostPerUnitYear: 10, inventoryPosition: 0 });
    // ROP 0.4, EOQ √(2·36.5·1/10) = 2.70 → want 3.1 → minimum 100.
    expect(plan.suggestedQuantity).toBe(100);
  });
});

describe('first expiry, first out (hand-worked)', () => {
  const lot = (lotId: number, onHand: number, expiryDate: string): StockLot => ({ lotId, lotNumber: `L${lotId}`, onHand, expiryDate });

  // Today 1 Jan 2027, 10 a day. A: 50, expires 3 Jan; B: 100, expires 20 Jan; C: 100, expires 10 Jan.
  // FEFO order A, C, B. A serves 1–3 Jan (30) and expires with 20. C serves 4–10 Jan (7 days, 70) and
  // expires with 30. B serves 11–20 Jan (10 days, 100) and is used up on its expiry day.
  test('lots in expiry order, the day each is used up, liners at risk', () => {
    const p = projectFefo([lot(1, 50, '2027-01-03'), lot(2, 100, '2027-01-20'), lot(3, 100, '2027-01-10')], { known: [], forecast: { mean: 10, sd: 0 } }, { today: '2027-01-01' });
    expect(p.map((l) => [l.lotNumber, l.rank, l.usedUpOn, l.atRisk])).toEqual([
      ['L1', 1, null, 20],
      ['L3', 2, null, 30],
      ['L2', 3, '2027-01-20', 0],
    ]);
  });

  // Today 1 Mar 2027, 2 a day plus 20 known tomorrow. X: 15, expires 2 Mar; Y: 10, expires 31 Mar.
  // 1 Mar: X 15 → 13. 2 Mar: 22 wanted, X gives 13 (used up 2 Mar), Y 9 → 1. 3 Mar: Y's last (used up 3 Mar).
  test('a known order spike uses the expiring lot up in time', () => {
    const p = projectFefo([lot(7, 10, '2027-03-31'), lot(6, 15, '2027-03-02')], { known: [0, 20], forecast: { mean: 2, sd: 0 } }, { today: '2027-03-01', soonDays: 60 });
    expect(p.map((l) => [l.lotNumber, l.usedUpOn, l.atRisk, l.expiresSoon])).toEqual([
      ['L6', '2027-03-02', 0, true],
      ['L7', '2027-03-03', 0, true],
    ]);
  });

  // 3.5 a day from 1 Jun. P: 10, expires 3 Jun (three days want 10.5) → 6.5, 3, then used up on 3 Jun, which
  // still wants 0.5 more; Q: 20, expires 4 Jun, gives that 0.5 on 3 Jun and 3.5 on 4 Jun → 16 left at risk.
  test('fractional rates: whole liners at risk', () => {
    const p = projectFefo([lot(1, 10, '2027-06-03'), lot(2, 20, '2027-06-04')], { known: [], forecast: { mean: 3.5, sd: 0 } }, { today: '2027-06-01' });
    expect(p.map((l) => [l.usedUpOn, l.atRisk])).toEqual([
      ['2027-06-03', 0],
      [null, 16],
    ]);
  });

  test('no use at all: every liner is at risk; an already expired lot is at risk in full; 60 days is "soon"', () => {
    const p = projectFefo([lot(1, 40, '2027-03-02'), lot(2, 5, '2026-12-31')], { known: [], forecast: { mean: 0, sd: 0 } }, { today: '2027-01-01' });
    expect(p.map((l) => [l.lotNumber, l.atRisk, l.expiresSoon])).toEqual([
      ['L2', 5, true],
      ['L1', 40, true],
    ]);
    expect(projectFefo([lot(1, 40, '2027-03-03')], { known: [], forecast: { mean: 0, sd: 0 } }, { today: '2027-01-01' })[0]!.expiresSoon).toBe(false);
  });

  test('ties in expiry go to the lower lot id first', () => {
    const p = projectFefo([lot(9, 5, '2027-01-05'), lot(4, 5, '2027-01-05')], { known: [], forecast: { mean: 5, sd: 0 } }, { today: '2027-01-01' });
    expect(p.map((l) => [l.lotId, l.usedUpOn])).toEqual([
      [4, '2027-01-01'],
      [9, '2027-01-02'],
    ]);
  });

  test('property: nothing is used after its expiry, and used + at risk never exceeds what was on hand', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ onHand: fc.integer({ min: 0, max: 300 }), days: fc.integer({ min: -5, max: 120 }) }), { maxLength: 6 }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        (raw, mean) => {
          const lots = raw.map((r, i) => {
            const d = new Date(Date.UTC(2027, 0, 1 + r.days)).toISOString().slice(0, 10);
            return lot(i + 1, r.onHand, d);
          });
          const p = projectFefo(lots, { known: [], forecast: { mean, sd: 0 } }, { today: '2027-01-01' });
          for (const l of p) {
            expect(l.atRisk).toBeLessThanOrEqual(l.onHand);
            if (l.usedUpOn) expect(l.usedUpOn <= l.expiryDate).toBe(true);
            if (l.usedUpOn) expect(l.atRisk).toBe(0);
          }
        },
      ),
    );
  });
});

describe('a transfer for liners at risk (hand-worked)', () => {
  // Lot L: 40 liners at risk, expires 31 Jan 2027; today 1 Jan; they arrive a day later, so the receiver reads
  // them as expiring 30 Jan. A uses 1 a day and holds nothing: 30 of them in time (1–30 Jan), 10 expire.
  // B uses 2 a day but holds 100 expiring 1 Mar: without L those last 1 Jan–19 Feb (all used); with L first
  // (20 days), its own run 21 Jan–1 Mar = 40 days × 2 = 80, so 20 of its own expire: a net saving of 20 only.
  // E uses 2 a day and holds nothing: all 40 in 20 days.
  const lot = { lotId: 7, lotNumber: 'L', onHand: 40, expiryDate: '2027-01-31' };
  const flat = (mean: number) => ({ known: [], forecast: { mean, sd: 0 } });
  const a = { siteId: 1, name: 'A', lots: [], demand: flat(1) };
  const b = { siteId: 2, name: 'B', lots: [{ lotId: 9, lotNumber: 'B1', onHand: 100, expiryDate: '2027-03-01' }], demand: flat(2) };
  const e = { siteId: 4, name: 'E', lots: [], demand: flat(2) };
  test('the depot where the fewest liners expire across both wins, with what it would use in time', () => {
    expect(proposeTransfer(lot, 40, [a, b], { today: '2027-01-01' })).toEqual({ toSiteId: 1, toName: 'A', quantity: 30, saved: 30 });
    expect(proposeTransfer(lot, 40, [a, b, e], { today: '2027-01-01' })).toEqual({ toSiteId: 4, toName: 'E', quantity: 40, saved: 40 });
  });
  test('a depot that would only let its own liners expire instead is not proposed; none at risk, none proposed', () => {
    // C holds 500 expiring 15 Feb at 1 a day: 454 of its own expire anyway; taking L first pushes 40 more past expiry.
    const c = { siteId: 3, name: 'C', lots: [{ lotId: 10, lotNumber: 'C1', onHand: 500, expiryDate: '2027-02-15' }], demand: flat(1) };
    expect(proposeTransfer(lot, 40, [c], { today: '2027-01-01' })).toBeNull();
    expect(proposeTransfer(lot, 0, [c], { today: '2027-01-01' })).toBeNull();
  });
});
