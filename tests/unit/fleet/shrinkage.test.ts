// Shrinkage rate against arithmetic worked by hand (the definition is the operator's own measure, printed on
// the pool overview: lost / average pool × 365 / window days), and the window against date-fns subDays,
// a date library the module does not use.
import { describe, test, expect } from 'vitest';
import { differenceInCalendarDays, parseISO, subDays, format } from 'date-fns';
import { shrinkage, shrinkageWindow } from '@/lib/fleet/shrinkage.ts';

describe('the window: the last 365 days, today included', () => {
  test('1 Dec 2026 → 2 Dec 2025 … 1 Dec 2026 (365 days both ends included)', () => {
    expect(shrinkageWindow('2026-12-01')).toEqual({ from: '2025-12-02', to: '2026-12-01' });
    expect(differenceInCalendarDays(parseISO('2026-12-01'), parseISO('2025-12-02')) + 1).toBe(365); // date-fns agrees
  });

  test('across 29 Feb 2028 the window still holds 365 days (so it starts on 1 Mar 2027 for 28 Feb 2028)', () => {
    expect(shrinkageWindow('2028-02-28')).toEqual({ from: format(subDays(parseISO('2028-02-28'), 364), 'yyyy-MM-dd'), to: '2028-02-28' });
    expect(shrinkageWindow('2028-02-28').from).toBe('2027-03-01');
  });

  test('other lengths; zero days is refused', () => {
    expect(shrinkageWindow('2026-03-31', 31)).toEqual({ from: '2026-03-01', to: '2026-03-31' });
    expect(() => shrinkageWindow('2026-03-31', 0)).toThrow(RangeError);
  });
});

describe('the rate', () => {
  const window = { from: '2025-12-02', to: '2026-12-01' };

  test('6 declared missing, 1 found again, pool 600 → 594: 5 / 597 = 0.8375 % a year', () => {
    // (600 + 594) / 2 = 597; 5 / 597 = 0.0083752…; 365 / 365 = 1.
    const r = shrinkage({ window, declaredMissing: 6, foundAgain: 1, poolAtStart: 600, poolAtEnd: 594 });
    expect(r).toMatchObject({ windowDays: 365, lost: 5, averagePool: 597 });
    expect(r.ratePerYear).toBeCloseTo(5 / 597, 12);
    expect(r.ratePerYear).toBeCloseTo(0.0083752, 7);
  });

  test('a 73-day window scales by 365 / 73 = 5: 2 lost of an average pool of 400 → 2.5 % a year', () => {
    // 2 / 400 = 0.005; × 5 = 0.025.
    const r = shrinkage({ window: { from: '2026-01-01', to: '2026-03-14' }, declaredMissing: 2, foundAgain: 0, poolAtStart: 390, poolAtEnd: 410 });
    expect(r.windowDays).toBe(73); // 31 + 28 + 14
    expect(r.ratePerYear).toBeCloseTo(0.025, 12);
  });

  test('nothing lost: 0; an empty pool: no rate rather than a division by zero', () => {
    expect(shrinkage({ window, declaredMissing: 0, foundAgain: 0, poolAtStart: 10, poolAtEnd: 10 }).ratePerYear).toBe(0);
    expect(shrinkage({ window, declaredMissing: 0, foundAgain: 0, poolAtStart: 0, poolAtEnd: 0 }).ratePerYear).toBeNull();
  });

  test('impossible counts are refused', () => {
    expect(() => shrinkage({ window, declaredMissing: 1, foundAgain: 2, poolAtStart: 5, poolAtEnd: 5 })).toThrow(RangeError);
    expect(() => shrinkage({ window, declaredMissing: -1, foundAgain: 0, poolAtStart: 5, poolAtEnd: 5 })).toThrow(RangeError);
    expect(() => shrinkage({ window: { from: '2026-02-01', to: '2026-01-01' }, declaredMissing: 0, foundAgain: 0, poolAtStart: 5, poolAtEnd: 5 })).toThrow(RangeError);
  });
});
