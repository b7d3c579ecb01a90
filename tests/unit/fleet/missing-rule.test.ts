import { describe, test, expect } from 'vitest';
import { isSilentTooLong, MISSING_AFTER_DAYS } from '@/lib/fleet/missing-rule';

// Operator policy (common practice for hire pools, no published source): 120 days without a scan outside a depot.
const now = new Date('2026-12-01T06:00:00Z');
const daysAgo = (d: number) => new Date(now.getTime() - d * 86_400_000);

describe('missing-bin rule', () => {
  test.each([
    ['on_hire', 121, true],
    ['on_hire', 120, false],
    ['awaiting_collection', 200, true],
    ['in_transit', 130, true],
    ['available', 400, false], // at a depot: found by stocktake, not chased
    ['quarantine', 400, false],
    ['missing', 400, false],
  ] as const)('%s, last scan %i days ago → %s', (status, days, expected) => {
    expect(isSilentTooLong({ status, lastScanAt: daysAgo(days) }, now)).toBe(expected);
  });
  test('the default threshold is 120 days', () => expect(MISSING_AFTER_DAYS).toBe(120));
  test('a bin never scanned is not marked by the rule', () => expect(isSilentTooLong({ status: 'on_hire', lastScanAt: null }, now)).toBe(false));
});
