// "Not scanned for N days" against dates worked by hand and date-fns differenceInCalendarDays (a library the
// module does not use).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as fnsAddDays, differenceInCalendarDays, format, parseISO } from 'date-fns';
import { firstRecentDay, isNotScannedFor, parseStaleDays } from '@/lib/fleet/scan-age.ts';

describe('not scanned for N days', () => {
  test('N = 30 on 1 Dec 2026: last scanned 1 Nov (30 days ago) counts, 2 Nov (29 days ago) does not', () => {
    expect(firstRecentDay('2026-12-01', 30)).toBe('2026-11-02');
    expect(isNotScannedFor('2026-11-01', '2026-12-01', 30)).toBe(true);
    expect(isNotScannedFor('2026-11-02', '2026-12-01', 30)).toBe(false);
  });

  test('never scanned always counts; N = 1 means "not today"', () => {
    expect(isNotScannedFor(null, '2026-12-01', 3650)).toBe(true);
    expect(isNotScannedFor('2026-11-30', '2026-12-01', 1)).toBe(true);
    expect(isNotScannedFor('2026-12-01', '2026-12-01', 1)).toBe(false);
    expect(firstRecentDay('2026-12-01', 1)).toBe('2026-12-01');
  });

  test('the cutoff and the rule agree with each other and with date-fns (random dates)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3000 }), fc.integer({ min: 1, max: 400 }), fc.integer({ min: 0, max: 800 }), (offset, days, ago) => {
        const today = fnsAddDays(parseISO('2024-01-01'), offset);
        const last = fnsAddDays(today, -ago);
        const iso = (d: Date) => format(d, 'yyyy-MM-dd');
        const stale = isNotScannedFor(iso(last), iso(today), days);
        expect(stale).toBe(differenceInCalendarDays(today, last) >= days);
        expect(stale).toBe(iso(last) < firstRecentDay(iso(today), days));
      }),
      { numRuns: 300 },
    );
  });

  test('N from the page: empty means 30; out of range or not a whole number falls back with a message', () => {
    expect(parseStaleDays(undefined)).toEqual({ ok: true, days: 30 });
    expect(parseStaleDays(' 90 ')).toEqual({ ok: true, days: 90 });
    for (const bad of ['0', '-5', '3651', '7.5', 'abc', '1e3']) expect(parseStaleDays(bad)).toMatchObject({ ok: false, days: 30 });
  });
});
