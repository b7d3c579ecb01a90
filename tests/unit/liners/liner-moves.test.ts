import { describe, test, expect } from 'vitest';
import { movesForScan, reversalOf, shortOfStock, countAdjustment, LedgerBalance } from '@/lib/liners/liner-moves';

const AT = new Date('2026-12-01T08:00:00Z');
const lined = { linerLotId: 7, currentTripId: null, siteId: 3, filled: false };
const unlined = { linerLotId: null, currentTripId: null, siteId: 3, filled: false };

describe('the moves a scan writes', () => {
  test('a fit takes one liner of the lot off the depot’s shelf', () => {
    expect(movesForScan({ action: 'fit_liner', before: unlined, after: { linerLotId: 7 }, assetId: 1, siteId: 3, userId: 9, occurredAt: AT })).toEqual([
      { lot_id: 7, site_id: 3, kind: 'fitted', quantity: -1, asset_id: 1, user_id: 9, occurred_at: AT },
    ]);
  });

  test.each(['fold', 'quarantine', 'prep_check'] as const)('%s of a lined bin at the depot records the liner as discarded, stock unchanged', (action) => {
    const [m] = movesForScan({ action, before: lined, after: { linerLotId: null }, assetId: 1, siteId: 3, userId: 9, occurredAt: AT });
    expect(m).toMatchObject({ kind: 'fitted_discarded', quantity: 0, lot_id: 7, site_id: 3 });
    expect(m!.reason).toBeTruthy();
  });

  test('a liner that left on a trip was used there: no move when it comes out', () => {
    expect(movesForScan({ action: 'fold', before: { ...lined, currentTripId: 4 }, after: { linerLotId: null }, assetId: 1, siteId: 8, userId: 9, occurredAt: AT })).toEqual([]);
    expect(
      movesForScan({ action: 'collect', before: { ...lined, currentTripId: 4, filled: true }, after: { linerLotId: null }, assetId: 1, siteId: null, userId: 9, occurredAt: AT }),
    ).toEqual([]);
  });

  test('scans that leave the liner alone write nothing', () => {
    expect(movesForScan({ action: 'dispatch', before: lined, after: { linerLotId: 7 }, assetId: 1, siteId: 3, userId: 9, occurredAt: AT })).toEqual([]);
    expect(movesForScan({ action: 'prep_check', before: unlined, after: { linerLotId: null }, assetId: 1, siteId: 3, userId: 9, occurredAt: AT })).toEqual([]);
  });

  test('a reversal has the opposite quantity and names the move it undoes (a voided fit puts its liner back)', () => {
    expect(reversalOf({ id: 12, lot_id: 7, site_id: 3, quantity: -1, asset_id: 1 }, AT, 9, 'Scan voided')).toEqual({
      lot_id: 7,
      site_id: 3,
      kind: 'reversal',
      quantity: 1,
      occurred_at: AT,
      user_id: 9,
      asset_id: 1,
      reverses_move_id: 12,
      reason: 'Scan voided',
    });
  });
});

describe('stock rules', () => {
  test('a take is refused beyond what is on hand, with the figures', () => {
    expect(shortOfStock('A1', 5, 5)).toBeNull();
    expect(shortOfStock('A1', 0, 1)).toMatch(/No liners of lot A1 are left/);
    expect(shortOfStock('A1', 1, 2)).toBe('Only 1 liner of lot A1 is left at this depot; 2 asked for.');
    expect(shortOfStock('A1', 9, 0)).toMatch(/at least 1/);
    expect(shortOfStock('A1', 9, 1.5)).toMatch(/whole number/);
  });

  test('a count adjusts by counted − expected and keeps both (hand-worked: 52 counted, 55 expected → −3)', () => {
    expect(countAdjustment(52, 55)).toEqual({ quantity: -3, counted: 52, expected: 55 });
    expect(countAdjustment(10, 10)).toEqual({ quantity: 0, counted: 10, expected: 10 });
    expect(() => countAdjustment(-1, 3)).toThrow(RangeError);
  });

  test('the running balance refuses to go below zero and keeps depots apart', () => {
    const b = new LedgerBalance();
    b.apply({ lot_id: 1, site_id: 1, quantity: 2 });
    b.apply({ lot_id: 1, site_id: 1, quantity: -2 });
    expect(b.onHand(1, 1)).toBe(0);
    expect(() => b.apply({ lot_id: 1, site_id: 2, quantity: -1 })).toThrow(RangeError);
    expect(b.onHand(1, 2)).toBe(0);
  });
});
