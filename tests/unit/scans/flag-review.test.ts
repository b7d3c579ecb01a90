import { describe, test, expect } from 'vitest';
import { ageWindow, bulkReview, bulkSummary, flagWords, parseFlagFilter, MAX_BULK_REVIEW } from '@/lib/scans/flag-review';

// Hand-written expectations: the queue's filters, the age bands' instants and the bulk body.

describe('the queue filter from the address', () => {
  test('known values are taken, unknown ones dropped (a stale link shows the whole queue)', () => {
    expect(parseFlagFilter(new URLSearchParams('depot=3&kind=seal_mismatch&age=week&page=2'))).toEqual({ depotId: 3, kind: 'seal_mismatch', age: 'week', page: 2 });
    expect(parseFlagFilter(new URLSearchParams('depot=x&kind=toString&age=year&page=-4'))).toEqual({ depotId: null, kind: null, age: null, page: 1 });
    expect(parseFlagFilter(new URLSearchParams('depot=0&kind=__proto__&page=99999999999'))).toEqual({ depotId: null, kind: null, age: null, page: 1 });
  });
});

describe('age bands', () => {
  const now = new Date('2026-12-03T12:00:00Z');
  test('1 to 7 days: occurred after 26 Nov 12:00 and at or before 2 Dec 12:00', () => {
    expect(ageWindow('week', now)).toEqual({ notBefore: new Date('2026-11-26T12:00:00Z'), before: new Date('2026-12-02T12:00:00Z') });
  });
  test('less than a day and 30 days or more', () => {
    expect(ageWindow('today', now)).toEqual({ notBefore: new Date('2026-12-02T12:00:00Z'), before: now });
    expect(ageWindow('older', now)).toEqual({ notBefore: null, before: new Date('2026-11-03T12:00:00Z') });
  });
});

describe('the bulk decision', () => {
  test('confirm needs no reason; void needs one of at least 3 characters', () => {
    expect(bulkReview.parse({ ids: [4, 9], decision: 'confirm' })).toEqual({ ids: [4, 9], decision: 'confirm' });
    expect(bulkReview.parse({ ids: [4], decision: 'void', reason: '  wrong label  ' })).toEqual({ ids: [4], decision: 'void', reason: 'wrong label' });
    const r = bulkReview.safeParse({ ids: [4], decision: 'void', reason: 'no' });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]).toMatchObject({ path: ['reason'] });
  });
  test.each([
    [{ ids: [], decision: 'confirm' }, 'Tick at least one scan.'],
    [{ ids: [3, 3], decision: 'confirm' }, 'A scan is ticked twice.'],
    [{ ids: Array.from({ length: MAX_BULK_REVIEW + 1 }, (_, i) => i + 1), decision: 'confirm' }, 'At most 50 scans at once (one page).'],
    [{ ids: [1], decision: 'delete' }, 'Choose confirm or void.'],
  ])('%o is refused: %s', (body, message) => {
    const r = bulkReview.safeParse(body);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.message).toBe(message);
  });
  test('unknown fields are refused', () => {
    expect(bulkReview.safeParse({ ids: [1], decision: 'confirm', all: true }).success).toBe(false);
  });
});

describe('words', () => {
  test('the summary after a decision, and a flag without words shown as stored', () => {
    expect(bulkSummary('confirm', [{ id: 1, ok: true }])).toBe('1 scan confirmed.');
    expect(
      bulkSummary('void', [
        { id: 1, ok: true },
        { id: 2, ok: true },
        { id: 3, ok: false, message: 'x' },
      ]),
    ).toBe('2 scans voided; 1 scan could not be: see each row.');
    expect(flagWords('seal_mismatch')).toBe('seal numbers did not match');
    expect(flagWords('new_kind')).toBe('new_kind');
  });
});
