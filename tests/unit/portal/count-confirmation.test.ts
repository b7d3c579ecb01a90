// The monthly count rule, with hand-worked dates and lists (no outside standard governs it: the grace of the first
// week is common practice, named DEFAULT_COUNT_GRACE_DAYS).
import { describe, test, expect } from 'vitest';
import { checkResolution, compareCount, countMonthFor, countStanding, DEFAULT_COUNT_GRACE_DAYS, disputeOutcome, disputeStanding } from '@/lib/portal/count-confirmation';

describe('when a count is due', () => {
  test('the month to count is the calendar month of today', () => {
    expect(countMonthFor('2026-12-03')).toBe('2026-12');
    expect(countMonthFor('2027-01-01')).toBe('2027-01');
  });
  test('due from the 1st, overdue from the day after the grace, counted once this month is in', () => {
    expect(DEFAULT_COUNT_GRACE_DAYS).toBe(7);
    expect(countStanding('2026-12-01', '2026-11')).toBe('due');
    expect(countStanding('2026-12-07', '2026-11')).toBe('due'); // day 7 of 7
    expect(countStanding('2026-12-08', '2026-11')).toBe('overdue'); // day 8
    expect(countStanding('2026-12-08', null)).toBe('overdue');
    expect(countStanding('2026-12-20', '2026-12')).toBe('counted');
    expect(countStanding('2027-01-02', '2026-12')).toBe('due'); // a new month, a new count
    expect(countStanding('2026-12-03', '2026-11', 2)).toBe('overdue');
  });
});

describe('comparing a count with the pool', () => {
  test('one bin missing and one found unexpected make a dispute; duplicates count once', () => {
    const r = compareCount(['G3', 'G1', 'G2'], ['G1', 'G2', 'G2', 'G9']);
    expect(r).toEqual({ matched: ['G1', 'G2'], missing: ['G3'], unexpected: ['G9'], disputed: true });
  });
  test('everything ticked: no dispute; nothing expected and nothing seen: none either', () => {
    expect(compareCount(['G1', 'G2'], ['G2', 'G1']).disputed).toBe(false);
    expect(compareCount([], []).disputed).toBe(false);
  });
});

describe('resolving a dispute bin by bin', () => {
  test('moved needs a place; only moved has one; a bin the customer saw is not lost', () => {
    expect(checkResolution({ kind: 'missing' }, 'moved', null)).toEqual({ ok: false, reason: 'Say where the bin was moved to.' });
    expect(checkResolution({ kind: 'missing' }, 'moved', 'Moerdijk blending')).toEqual({ ok: true });
    expect(checkResolution({ kind: 'missing' }, 'found', 'x').ok).toBe(false);
    expect(checkResolution({ kind: 'missing' }, 'lost', null)).toEqual({ ok: true });
    expect(checkResolution({ kind: 'unexpected' }, 'lost', null).ok).toBe(false);
    expect(checkResolution({ kind: 'unexpected' }, 'found', null)).toEqual({ ok: true });
  });
  test('open until every bin is resolved; the outcome counts each resolution', () => {
    const lines = [
      { grai: 'G3', kind: 'missing' as const, resolution: 'lost' as const },
      { grai: 'G4', kind: 'missing' as const, resolution: null },
      { grai: 'G9', kind: 'unexpected' as const, resolution: 'found' as const },
    ];
    expect(disputeStanding(lines)).toBe('open');
    expect(disputeOutcome(lines)).toEqual({ found: 1, moved: 0, lost: 1, open: 1 });
    expect(disputeStanding(lines.map((l) => ({ ...l, resolution: l.resolution ?? ('moved' as const) })))).toBe('resolved');
  });
});
