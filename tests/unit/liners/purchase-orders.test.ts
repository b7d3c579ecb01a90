// Purchase-order rules against hand-worked cases.
import { describe, test, expect } from 'vitest';
import { orderQuantityProblem, poProgress, poReference, reorderAlertStep, wantedBy } from '@/lib/liners/purchase-orders';

describe('purchase orders', () => {
  test('reference and wanted-by day', () => {
    expect(poReference(7)).toBe('LPO-00007');
    expect(poReference(123456)).toBe('LPO-123456');
    // 1 Dec + 10 days = 11 Dec; 25 Dec + 14 days crosses the year: 8 Jan.
    expect(wantedBy('2026-12-01', 10)).toBe('2026-12-11');
    expect(wantedBy('2026-12-25', 14)).toBe('2027-01-08');
  });

  test.each([
    [
      { status: 'open', quantity: 100, received: 0 },
      { remaining: 100, state: 'open', complete: false },
    ],
    [
      { status: 'open', quantity: 100, received: 60 },
      { remaining: 40, state: 'part_received', complete: false },
    ],
    [
      { status: 'open', quantity: 100, received: 104 },
      { remaining: 0, state: 'part_received', complete: true },
    ], // the job's caller closes it
    [
      { status: 'closed', quantity: 100, received: 100 },
      { remaining: 0, state: 'received', complete: true },
    ],
    [
      { status: 'closed', quantity: 100, received: 70 },
      { remaining: 0, state: 'closed_short', complete: false },
    ],
    [
      { status: 'cancelled', quantity: 100, received: 0 },
      { remaining: 0, state: 'cancelled', complete: false },
    ],
  ] as const)('progress of %o', (p, expected) => {
    expect(poProgress(p)).toEqual(expected);
  });

  test('quantities the supplier can deliver: whole cartons of 50, at least 100', () => {
    const pack = { packSize: 50, minimumOrder: 100 };
    expect(orderQuantityProblem(150, pack)).toBeNull();
    expect(orderQuantityProblem(100, pack)).toBeNull();
    expect(orderQuantityProblem(50, pack)).toMatch(/minimum order is 100/);
    expect(orderQuantityProblem(120, pack)).toMatch(/order 150 \(or 100\)/);
    expect(orderQuantityProblem(0, pack)).toMatch(/at least one/);
    expect(orderQuantityProblem(1.5, pack)).toMatch(/whole number/);
  });

  test('an alert opens below the reorder point, stays quiet while below, clears at or above it', () => {
    // A run of positions against a reorder point of 24: 30, 20 (opens), 18 (still open), 24 (clears), 23 (opens again).
    let open = false;
    const steps = [30, 20, 18, 24, 23].map((position) => {
      const s = reorderAlertStep(open, position, 24);
      if (s === 'raise') open = true;
      if (s === 'clear') open = false;
      return s;
    });
    expect(steps).toEqual(['keep', 'raise', 'keep', 'clear', 'raise']);
  });
});
