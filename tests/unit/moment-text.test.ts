import { describe, test, expect } from 'vitest';
import { formatMoment, formatMomentAbsolute, relativeHint } from '@/lib/moment-text';

describe('moments in the operator zone', () => {
  // EU summer time: clocks go from 02:00 CET to 03:00 CEST at 01:00 UTC on the
  // last Sunday of March (Directive 2000/84/EC, art. 1–2); in 2027 that is 28 March.
  test('just before and at the EU switch to summer time', () => {
    expect(formatMomentAbsolute('2027-03-28T00:59:00Z', 'Europe/Amsterdam')).toBe('28 Mar 2027, 01:59');
    expect(formatMomentAbsolute('2027-03-28T01:00:00Z', 'Europe/Amsterdam')).toBe('28 Mar 2027, 03:00');
  });
  test('the same instant on another continent falls on another day', () => {
    expect(formatMomentAbsolute(new Date('2027-01-01T03:30:00Z'), 'America/Chicago')).toBe('31 Dec 2026, 21:30');
  });
  test('September is "Sep" whatever the ICU version', () => {
    expect(formatMomentAbsolute('2027-09-09T12:00:00Z', 'UTC')).toBe('9 Sep 2027, 12:00');
  });
  test('bad input is refused', () => {
    expect(() => formatMomentAbsolute('yesterday', 'UTC')).toThrow(RangeError);
  });
});

describe('relative hints', () => {
  const now = new Date('2027-03-10T12:00:00Z');
  test.each([
    ['2027-03-10T11:59:30Z', 'just now'],
    ['2027-03-10T11:55:00Z', '5 minutes ago'],
    ['2027-03-10T15:00:00Z', 'in 3 hours'],
    ['2027-03-09T12:00:00Z', 'yesterday'],
    ['2027-03-17T12:00:00Z', 'in 7 days'],
    ['2026-03-10T12:00:00Z', 'last year'],
  ])('%s → %s', (when, words) => {
    expect(relativeHint(when, now)).toBe(words);
  });
  test('combined', () => {
    expect(formatMoment('2027-03-07T09:12:00Z', 'UTC', now)).toBe('7 Mar 2027, 09:12 · 3 days ago');
  });
});

describe('September is "Sep" on every ICU', () => {
  // Some ICU versions abbreviate September as "Sept" in en-GB; the yard's queue and offline card now print through
  // formatMomentAbsolute, whose month names come from a fixed list.
  test('formatMomentAbsolute', () => {
    expect(formatMomentAbsolute('2026-09-14T07:05:00Z', 'Europe/Amsterdam')).toBe('14 Sep 2026, 09:05');
  });
});
