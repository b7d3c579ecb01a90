// Checks calendar.ts against (1) dates worked by hand and written out literally, with the working in the
// comments, and (2) date-fns v4, a general-purpose date library the module does not use (it uses luxon),
// as a second opinion over random sweeps (fast-check).
// Time-zone facts: EU summer time (Directive 2000/84/EC) starts on the last Sunday of March and ends on the
// last Sunday of October, both at 01:00 UTC; Berlin is UTC+1 in winter, UTC+2 in summer.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as dfAddDays, addMonths as dfAddMonths, differenceInCalendarDays, endOfMonth as dfEndOfMonth, format } from 'date-fns';
import {
  addDays,
  addMonthsToDate,
  addMonthsToMonth,
  daysBetween,
  endOfMonth,
  formatLongDate,
  formatDayCount,
  formatRelative,
  isLocalDate,
  isYearMonth,
  localDate,
  monthOf,
} from '@/lib/calendar.ts';
import { inProcessTimeZone } from './support/process-time-zone.ts';

const pad = (value: number, width = 2) => String(value).padStart(width, '0');
/** A date-fns Date at local midnight of a 'YYYY-MM-DD' (built from numbers, not parsed by the code under test). */
const dfDay = (date: string) => {
  const [year, month, day] = date.split('-').map(Number) as [number, number, number];
  return new Date(year, month - 1, day);
};
const dfFormat = (date: Date) => format(date, 'yyyy-MM-dd');

// Random real dates 1901–2199, built from numbers so the generator does not lean on the code under test.
const arbitraryDate = fc
  .record({ year: fc.integer({ min: 1901, max: 2199 }), month: fc.integer({ min: 1, max: 12 }), day: fc.integer({ min: 1, max: 31 }) })
  .map(({ year, month, day }) => `${year}-${pad(month)}-${pad(Math.min(day, new Date(year, month, 0).getDate()))}`);
const arbitraryMonth = fc.record({ year: fc.integer({ min: 1901, max: 2149 }), month: fc.integer({ min: 1, max: 12 }) }).map(({ year, month }) => `${year}-${pad(month)}`);

describe('localDate: the calendar date of an instant in a zone', () => {
  test.each([
    // 23:30Z on Sat 28 Mar 2026 is before the switch (Sun 29 Mar 01:00Z): CET, +1 → 00:30 on the 29th
    ['2026-03-28T23:30:00Z', 'Europe/Berlin', '2026-03-29'],
    // 22:30Z on the 29th is after the switch: CEST, +2 → 00:30 on the 30th (the UTC date is still the 29th)
    ['2026-03-29T22:30:00Z', 'Europe/Berlin', '2026-03-30'],
    // 25 Oct 2026 is the last Sunday of October: from 01:00Z back on CET, so 22:30Z → 23:30 on the 25th
    ['2026-10-25T22:30:00Z', 'Europe/Berlin', '2026-10-25'],
    // New York in winter is UTC−5: 23:30Z on New Year's Eve is 18:30 the same evening
    ['2026-12-31T23:30:00Z', 'America/New_York', '2026-12-31'],
    // Tokyo is UTC+9 all year: the same instant is 08:30 on 1 Jan 2027
    ['2026-12-31T23:30:00Z', 'Asia/Tokyo', '2027-01-01'],
    // An instant given with an offset: 00:30 at +02:00 is 22:30Z the day before
    ['2026-07-01T00:30:00+02:00', 'UTC', '2026-06-30'],
    // Kolkata is UTC+5:30: 18:29Z → 23:59, 18:30Z → 00:00 next day
    ['2026-01-15T18:29:00Z', 'Asia/Kolkata', '2026-01-15'],
    ['2026-01-15T18:30:00Z', 'Asia/Kolkata', '2026-01-16'],
  ])('%s in %s is %s (worked by hand)', (instant, zone, expected) => {
    expect(localDate(instant, zone)).toBe(expected);
  });

  test('an offset change in the middle of a UTC hour, near local midnight (Newfoundland, 14 Mar 2010)', () => {
    // From memory (tz database): St. John's moved from UTC−3:30 to UTC−2:30 at 00:01 local on 14 Mar 2010,
    // i.e. at 03:31Z — inside the UTC hour 03:00–04:00. 03:20Z at −3:30 is 23:50 on the 13th; 03:45Z at
    // −2:30 is 01:15 on the 14th. Asked in both orders, so no remembered offset leaks across the change.
    // date-fns in a process set to that zone confirms the transition (second opinion).
    const zone = 'America/St_Johns';
    expect(localDate('2010-03-14T03:45:00Z', zone)).toBe('2010-03-14');
    expect(localDate('2010-03-14T03:20:00Z', zone)).toBe('2010-03-13');
    expect(localDate('2010-03-14T03:45:00Z', zone)).toBe('2010-03-14');
    inProcessTimeZone(zone, () => {
      expect(format(new Date('2010-03-14T03:20:00Z'), 'yyyy-MM-dd HH:mm')).toBe('2010-03-13 23:50');
      expect(format(new Date('2010-03-14T03:45:00Z'), 'yyyy-MM-dd HH:mm')).toBe('2010-03-14 01:15');
    });
  });

  test('reads offsets in the forms ISO 8601 allows', () => {
    expect(localDate('2026-07-01T00:30:00+0200', 'UTC')).toBe('2026-06-30');
    expect(localDate('2026-07-01T00:30:00+02', 'UTC')).toBe('2026-06-30');
    expect(localDate('2026-07-01T00:30:00.123456+02:00', 'UTC')).toBe('2026-06-30');
    expect(() => localDate('2026-02-30T10:00:00Z', 'UTC')).toThrow(RangeError); // no 30 February
  });

  test('accepts a Date object', () => {
    expect(localDate(new Date('2026-12-31T23:30:00Z'), 'Asia/Tokyo')).toBe('2027-01-01');
  });

  test('refuses instants without an offset, unknown zones and invalid dates', () => {
    expect(() => localDate('2026-03-29T02:30:00', 'Europe/Berlin')).toThrow(RangeError);
    expect(() => localDate('2026-03-29', 'Europe/Berlin')).toThrow(RangeError);
    expect(() => localDate('2026-03-29T00:30:00Z', 'Mars/Olympus_Mons')).toThrow(RangeError);
    expect(() => localDate(new Date(Number.NaN), 'UTC')).toThrow(RangeError);
  });

  test.each(['Europe/Berlin', 'America/New_York', 'Asia/Kolkata', 'Australia/Lord_Howe', 'Pacific/Chatham'])(
    'agrees with date-fns formatting in a process running in %s (second opinion, random instants 1990–2040)',
    (zone) => {
      inProcessTimeZone(zone, () => {
        fc.assert(
          fc.property(fc.date({ min: new Date('1990-01-01T00:00:00Z'), max: new Date('2040-12-31T23:59:59Z'), noInvalidDate: true }), (instant) => {
            expect(localDate(instant.toISOString(), zone)).toBe(dfFormat(instant));
          }),
          { numRuns: 300 },
        );
      });
    },
  );
});

describe('month arithmetic', () => {
  test.each([
    ['2024-01', 30, '2026-07'], // 24 months → 2026-01, 6 more → 2026-07
    ['2024-01', 60, '2029-01'], // 5 whole years
    ['2024-11', 2, '2025-01'], // across the year end
    ['2025-01', -1, '2024-12'],
    ['2024-01', -13, '2022-12'],
    ['2024-05', 0, '2024-05'],
  ])('%s + %i months = %s (by hand)', (month, months, expected) => {
    expect(addMonthsToMonth(month, months)).toBe(expected);
  });

  test.each([
    ['2024-02', '2024-02-29'], // 2024 divisible by 4: leap
    ['2023-02', '2023-02-28'],
    ['2000-02', '2000-02-29'], // divisible by 400: leap
    ['2100-02', '2100-02-28'], // divisible by 100, not by 400: common year
    ['2026-04', '2026-04-30'],
    ['2026-12', '2026-12-31'],
  ])('the last day of %s is %s (Gregorian leap-year rule)', (month, expected) => {
    expect(endOfMonth(month)).toBe(expected);
  });

  test.each([
    ['2024-01-31', 1, '2024-02-29'], // no 31 Feb: clamp to the last day of a leap February
    ['2023-01-31', 1, '2023-02-28'],
    ['2026-03-31', 3, '2026-06-30'],
    ['2026-02-28', 3, '2026-05-28'], // the day is kept when it exists
    ['2024-02-29', 12, '2025-02-28'],
  ])('%s + %i months = %s (by hand)', (date, months, expected) => {
    expect(addMonthsToDate(date, months)).toBe(expected);
  });

  test('monthOf takes the month of a date', () => {
    expect(monthOf('2026-07-31')).toBe('2026-07');
  });

  test('end of (month + n) agrees with date-fns endOfMonth(addMonths) (second opinion, random sweep)', () => {
    fc.assert(
      fc.property(arbitraryMonth, fc.integer({ min: -600, max: 600 }), (month, months) => {
        const expected = dfFormat(dfEndOfMonth(dfAddMonths(dfDay(`${month}-01`), months)));
        expect(endOfMonth(addMonthsToMonth(month, months))).toBe(expected);
      }),
      { numRuns: 2000 },
    );
  });

  test('addMonthsToDate clamps the day like date-fns addMonths (second opinion, random sweep)', () => {
    fc.assert(
      fc.property(arbitraryDate, fc.integer({ min: -120, max: 120 }), (date, months) => {
        expect(addMonthsToDate(date, months)).toBe(dfFormat(dfAddMonths(dfDay(date), months)));
      }),
      { numRuns: 2000 },
    );
  });
});

describe('day arithmetic', () => {
  test.each([
    ['2026-03-28', '2026-03-30', 2], // across the spring-forward Sunday: dates, not hours
    ['2024-02-28', '2024-03-01', 2], // 29 Feb 2024 lies between
    ['2023-02-28', '2023-03-01', 1],
    ['2026-12-01', '2027-03-14', 103], // 30 (to 31 Dec) + 31 (Jan) + 28 (Feb) + 14 = 103
    ['2027-03-14', '2026-12-01', -103],
    ['2026-05-05', '2026-05-05', 0],
  ])('from %s to %s is %i days (by hand)', (from, to, expected) => {
    expect(daysBetween(from, to)).toBe(expected);
  });

  test.each([
    ['2024-02-28', 1, '2024-02-29'],
    ['2026-12-31', 1, '2027-01-01'],
    ['2026-03-01', -1, '2026-02-28'],
    ['2026-12-01', 103, '2027-03-14'],
  ])('%s + %i days = %s (by hand)', (date, days, expected) => {
    expect(addDays(date, days)).toBe(expected);
  });

  test('agrees with date-fns differenceInCalendarDays and addDays (second opinion, random sweep)', () => {
    inProcessTimeZone('Europe/Berlin', () => {
      fc.assert(
        fc.property(arbitraryDate, arbitraryDate, fc.integer({ min: -5000, max: 5000 }), (from, to, days) => {
          expect(daysBetween(from, to)).toBe(differenceInCalendarDays(dfDay(to), dfDay(from)));
          expect(addDays(from, days)).toBe(dfFormat(dfAddDays(dfDay(from), days)));
        }),
        { numRuns: 2000 },
      );
    });
  });
});

describe('formatting', () => {
  // The hint format of the design brief: "14 Mar 2027 · in 103 days" on 1 Dec 2026 (103 worked above).
  test('formatLongDate and formatRelative', () => {
    expect(formatLongDate('2027-03-14')).toBe('14 Mar 2027');
    expect(formatLongDate('2026-09-05')).toBe('5 Sep 2026');
    expect(formatRelative('2027-03-14', '2026-12-01')).toBe('in 103 days');
    expect(formatRelative('2026-11-28', '2026-12-01')).toBe('3 days ago');
    expect(formatRelative('2026-12-01', '2026-12-01')).toBe('today');
    expect(formatRelative('2026-12-02', '2026-12-01')).toBe('in 1 day');
    expect(formatRelative('2026-11-30', '2026-12-01')).toBe('1 day ago');
  });

  test('formatLongDate agrees with date-fns format "d MMM yyyy" (second opinion, random sweep)', () => {
    fc.assert(
      fc.property(arbitraryDate, (date) => {
        expect(formatLongDate(date)).toBe(format(dfDay(date), 'd MMM yyyy'));
      }),
      { numRuns: 1000 },
    );
  });
});

describe('validation', () => {
  test('only real dates and months pass', () => {
    expect(isLocalDate('2024-02-29')).toBe(true);
    expect(isLocalDate('2023-02-29')).toBe(false);
    expect(isLocalDate('2026-04-31')).toBe(false);
    expect(isLocalDate('26-04-01')).toBe(false);
    expect(isLocalDate('2026-4-1')).toBe(false);
    expect(isYearMonth('2026-12')).toBe(true);
    expect(isYearMonth('2026-13')).toBe(false);
    expect(isYearMonth('2026-00')).toBe(false);
  });

  test('functions throw RangeError on malformed input instead of guessing', () => {
    expect(() => daysBetween('2026-02-30', '2026-03-01')).toThrow(RangeError);
    expect(() => endOfMonth('2026-13')).toThrow(RangeError);
    expect(() => addDays('2026-01-01', 1.5)).toThrow(RangeError);
    expect(() => addMonthsToMonth('2026-01', Number.NaN)).toThrow(RangeError);
    expect(() => formatLongDate('14 Mar 2027')).toThrow(RangeError);
  });
});

describe('formatDayCount: the one day/days wording', () => {
  test.each([
    [0, '0 days'],
    [1, '1 day'],
    [2, '2 days'],
    [-1, '-1 days'],
    ['1', '1 day'],
    ['1.0', '1.0 days'],
    ['14.3', '14.3 days'],
    ['1,204', '1,204 days'],
  ] as const)('%s → %s', (n, text) => {
    expect(formatDayCount(n)).toBe(text);
  });
});
