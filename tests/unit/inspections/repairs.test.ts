// The repair order rules, checked against hand-worked cases: money as exact minor units (checked against
// plain integer arithmetic of cents, never floating point: 0.1 + 0.2 is 30 cents here), the strict "more than"
// of the retirement threshold (the operator's rule, common practice: equal to it still repairs), and which
// inspections open or close an order (after a repair the leakproofness test and the checks are done again
// before the bin is used, 49 CFR 180.352 counting the test interval from a qualifying repair).
import { describe, test, expect } from 'vitest';
import { closesRepair, fromMinor, opensRepair, repairCost, repairWorkProblems, retirementProposal, toMinor } from '@/lib/inspections/repairs';

describe('money in minor units', () => {
  test('exact for the usual ways of typing an amount', () => {
    expect(toMinor('12', 2)).toBe(1200);
    expect(toMinor('12.5', 2)).toBe(1250);
    expect(toMinor('12.50', 2)).toBe(1250);
    expect(toMinor('0.10', 2)! + toMinor('0.20', 2)!).toBe(30); // 0.1 + 0.2 in floating point is 0.30000000000000004
    expect(toMinor('12.500', 2)).toBe(1250); // trailing zeros beyond the cent are no precision
    expect(toMinor(' 400 ', 2)).toBe(40000);
    expect(toMinor('1250', 0)).toBe(1250); // a currency without minor unit
  });
  test('refuses what is not an amount, or more precise than the currency', () => {
    for (const bad of ['', '-5', '1,50', '12.505', 'abc', '1e3', '12.']) expect(toMinor(bad, 2), bad).toBeNull();
    expect(toMinor('12.5', 0)).toBeNull();
  });
  test('back to the column format', () => {
    expect(fromMinor(1250, 2)).toBe('12.50');
    expect(fromMinor(5, 2)).toBe('0.05');
    expect(fromMinor(0, 2)).toBe('0.00');
    expect(fromMinor(1250, 0)).toBe('1250');
  });
  test('the cost of an order is the sum of its entries', () => {
    expect(repairCost([{ costMinor: 8550 }, { costMinor: 1200 }, { costMinor: 0 }])).toBe(9750);
    expect(repairCost([])).toBe(0);
  });
});

describe('retirement proposal', () => {
  const T = 40000; // 400.00
  test('more than the threshold proposes it; equal does not', () => {
    expect(retirementProposal({ estimatedMinor: 40001, costMinor: 0 }, T)).toEqual({ proposed: true, amountMinor: 40001, basis: 'estimate' });
    expect(retirementProposal({ estimatedMinor: 40000, costMinor: 0 }, T).proposed).toBe(false);
  });
  test('the higher of estimate and cost so far decides', () => {
    expect(retirementProposal({ estimatedMinor: 20000, costMinor: 45000 }, T)).toEqual({ proposed: true, amountMinor: 45000, basis: 'cost' });
    expect(retirementProposal({ estimatedMinor: null, costMinor: 12000 }, T)).toEqual({ proposed: false, amountMinor: 12000, basis: 'cost' });
  });
  test('nothing known, or no threshold: never proposed', () => {
    expect(retirementProposal({ estimatedMinor: null, costMinor: 0 }, T)).toEqual({ proposed: false, amountMinor: 0, basis: 'none' });
    expect(retirementProposal({ estimatedMinor: 999999, costMinor: 0 }, null).proposed).toBe(false);
    expect(retirementProposal({ estimatedMinor: 1, costMinor: 0 }, 0).proposed).toBe(true); // a threshold of 0: every repair that costs anything
  });
});

describe('what opens and closes a repair order', () => {
  test('a failed inspection opens one; a pass does not', () => {
    expect([opensRepair('repair'), opensRepair('fail'), opensRepair('pass')]).toEqual([true, true, false]);
  });
  test('only a passed test after repair closes one', () => {
    expect(closesRepair('after_repair', 'pass')).toBe(true);
    expect(closesRepair('after_repair', 'fail')).toBe(false);
    expect(closesRepair('intermediate', 'pass')).toBe(false);
    expect(closesRepair('full', 'pass')).toBe(false);
  });
});

describe('a work entry', () => {
  const ok = { performedOn: '2026-12-03', description: 'Replaced the valve gasket', parts: 'Gasket DN50', labourHours: 1.5, cost: '85.50' };
  test('a complete entry has no problem', () => {
    expect(repairWorkProblems(ok, '2026-12-03', '2026-12-01', 2)).toEqual([]);
    // 1.15 × 100 is 114.99999999999999 in floating point: still two decimals.
    expect(repairWorkProblems({ ...ok, labourHours: 1.15 }, '2026-12-03', '2026-12-01', 2)).toEqual([]);
  });
  test('each missing or wrong field says what to do', () => {
    const fields = (e: Partial<typeof ok>) => repairWorkProblems({ ...ok, ...e }, '2026-12-03', '2026-12-01', 2).map((p) => p.field);
    expect(fields({ performedOn: '2026-12-04' })).toEqual(['performedOn']); // still to come
    expect(fields({ performedOn: '2026-11-30' })).toEqual(['performedOn']); // before the order was opened
    expect(fields({ performedOn: '2026-02-30' })).toEqual(['performedOn']); // no such day
    expect(fields({ description: '  ' })).toEqual(['description']);
    expect(fields({ labourHours: -1 })).toEqual(['labourHours']);
    expect(fields({ labourHours: 1.333 })).toEqual(['labourHours']);
    expect(fields({ labourHours: Number.NaN })).toEqual(['labourHours']);
    expect(fields({ cost: '85.555' })).toEqual(['cost']);
    expect(fields({ cost: '' })).toEqual(['cost']);
  });
});
