// The day-count rule shared by billing and the overdue-back rule, against dates worked by hand (the working is
// in each title or comment) and against date-fns v4 (differenceInCalendarDays, addDays), which the module does
// not use, as an independent second opinion. Which end of a hire counts is a tariff term (common practice in
// equipment hire, no single published source).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as fnsAddDays, differenceInCalendarDays, format, max as fnsMax, min as fnsMin, parseISO } from 'date-fns';
import { DEFAULT_DAY_COUNT, clipRange, firstHireDay, hireDayNumber, hireDayRange, hireDaysThrough, hireDaysThroughSql, lastFreeDay } from '@/lib/billing/hire-days';
import { overdueBack } from '@/lib/fleet/overdue-return';

const BOTH = { firstDayCounts: true, lastDayCounts: true };
const FIRST_ONLY = { firstDayCounts: true, lastDayCounts: false };
const NEITHER = { firstDayCounts: false, lastDayCounts: false };

describe('hire days: which dates of a hire count', () => {
  test('delivered 1 Mar 2027, collected 3 Mar: default 2 days (2, 3 Mar); both ends 3; start only 2 (1, 2 Mar); neither 1', () => {
    expect(hireDayRange('2027-03-01', '2027-03-03', '2027-03-31')).toEqual({ first: '2027-03-02', last: '2027-03-03', days: 2 });
    expect(hireDayRange('2027-03-01', '2027-03-03', '2027-03-31', BOTH)).toEqual({ first: '2027-03-01', last: '2027-03-03', days: 3 });
    expect(hireDayRange('2027-03-01', '2027-03-03', '2027-03-31', FIRST_ONLY)).toEqual({ first: '2027-03-01', last: '2027-03-02', days: 2 });
    expect(hireDayRange('2027-03-01', '2027-03-03', '2027-03-31', NEITHER)).toEqual({ first: '2027-03-02', last: '2027-03-02', days: 1 });
  });

  test('same-day delivery and collection: one day only when both ends count', () => {
    expect(hireDayRange('2027-03-01', '2027-03-01', '2027-03-31', BOTH).days).toBe(1);
    for (const terms of [DEFAULT_DAY_COUNT, FIRST_ONLY, NEITHER]) expect(hireDayRange('2027-03-01', '2027-03-01', '2027-03-31', terms).days).toBe(0);
  });

  test('a running hire counts through the day it is looked at, whichever end counts at the stop', () => {
    // Delivered 25 Feb 2027 (not a leap year), looked at on 2 Mar: 26, 27, 28 Feb, 1, 2 Mar = 5 days.
    expect(hireDayRange('2027-02-25', null, '2027-03-02')).toEqual({ first: '2027-02-26', last: '2027-03-02', days: 5 });
    expect(hireDayRange('2027-02-25', null, '2027-03-02', FIRST_ONLY).days).toBe(6);
    expect(hireDaysThrough('2027-02-25', '2027-02-25')).toBe(0);
    expect(hireDaysThrough('2027-02-25', '2027-02-20')).toBe(0); // looked at before the start: zero, never negative
  });

  test('a stop before the start counts zero days', () => {
    expect(hireDayRange('2027-03-05', '2027-03-01', '2027-03-31', BOTH)).toEqual({ first: null, last: null, days: 0 });
  });

  test('day numbers and the last free day: delivered 1 Mar, 14 free days → free through 15 Mar (default), 14 Mar (start counts)', () => {
    expect(firstHireDay('2027-03-01')).toBe('2027-03-02');
    expect(hireDayNumber('2027-03-01', '2027-03-15')).toBe(14);
    expect(lastFreeDay('2027-03-01', 14)).toBe('2027-03-15');
    expect(lastFreeDay('2027-03-01', 14, FIRST_ONLY)).toBe('2027-03-14');
    expect(lastFreeDay('2027-03-01', 0)).toBe('2027-03-01'); // no free day: the day before the first counted day
    expect(() => lastFreeDay('2027-03-01', -1)).toThrow(RangeError);
    expect(() => lastFreeDay('2027-03-01', 2.5)).toThrow(RangeError);
  });

  test('clipping to a period: 20 Jan – 10 Feb clipped to February is 1–10 Feb, 10 days', () => {
    const range = hireDayRange('2027-01-19', '2027-02-10', '2027-02-28'); // 20 Jan .. 10 Feb, 22 days
    expect(range.days).toBe(22);
    expect(clipRange(range, '2027-02-01', '2027-02-28')).toEqual({ first: '2027-02-01', last: '2027-02-10', days: 10 });
    expect(clipRange(range, '2027-03-01', '2027-03-31').days).toBe(0);
  });

  test('malformed dates are refused, not guessed', () => {
    expect(() => hireDayRange('2027-02-30', null, '2027-03-01')).toThrow(RangeError);
    expect(() => hireDayRange('2027-02-01', '1 Mar', '2027-03-01')).toThrow(RangeError);
  });

  test('the overdue rule counts through the same function: with both ends counting, the delivery day is day 1', () => {
    // Delivered 1 Mar, 14 free days, start day counts → days 1..14 are 1..14 Mar; on 15 Mar it is day 15, one over.
    const base = { status: 'on_hire' as const, deliveredOn: '2027-03-01', dispatchedOn: null, freeDays: 14, dayCount: BOTH };
    expect(overdueBack({ ...base, today: '2027-03-14' })).toMatchObject({ daysWithCustomer: 14, overdue: false, freeUntil: '2027-03-14' });
    expect(overdueBack({ ...base, today: '2027-03-15' })).toMatchObject({ daysWithCustomer: 15, daysOver: 1, overdue: true });
  });

  test('the SQL form of the running count (exact SQL; checked against PostgreSQL in tests/integration/billing)', () => {
    expect(hireDaysThroughSql('s.d', '$1::date')).toBe('GREATEST(0, ($1::date) - (s.d))');
    expect(hireDaysThroughSql('s.d', '$1::date', BOTH)).toBe('GREATEST(0, ($1::date) - (s.d) + 1)');
  });

  test('agrees with date-fns on random hires, terms and periods (second opinion)', () => {
    const iso = (d: Date) => format(d, 'yyyy-MM-dd');
    fc.assert(
      fc.property(
        fc.date({ min: new Date('2020-01-01T00:00:00Z'), max: new Date('2035-12-31T00:00:00Z'), noInvalidDate: true }),
        fc.integer({ min: 0, max: 400 }),
        fc.boolean(),
        fc.boolean(),
        fc.integer({ min: -30, max: 400 }),
        fc.integer({ min: 0, max: 60 }),
        (when, length, firstDayCounts, lastDayCounts, periodOffset, periodLength) => {
          const start = parseISO(when.toISOString().slice(0, 10));
          const stop = fnsAddDays(start, length);
          // date-fns working: counted dates are start+(first?0:1) .. stop−(last?0:1), except a same-day hire.
          const first = fnsAddDays(start, firstDayCounts ? 0 : 1);
          const last = fnsAddDays(stop, lastDayCounts ? 0 : -1);
          const expected = length === 0 ? (firstDayCounts && lastDayCounts ? 1 : 0) : Math.max(0, differenceInCalendarDays(last, first) + 1);
          const range = hireDayRange(iso(start), iso(stop), '2099-01-01', { firstDayCounts, lastDayCounts });
          expect(range.days).toBe(expected);
          if (expected > 0 && length > 0) expect([range.first, range.last]).toEqual([iso(first), iso(last)]);
          // Clipped to a period [pFrom, pTo]: the overlap of the two ranges, counted by date-fns.
          const pFrom = fnsAddDays(start, periodOffset);
          const pTo = fnsAddDays(pFrom, periodLength);
          const overlap = expected === 0 || length === 0 ? 0 : Math.max(0, differenceInCalendarDays(fnsMin([last, pTo]), fnsMax([first, pFrom])) + 1);
          if (length > 0) expect(clipRange(range, iso(pFrom), iso(pTo)).days).toBe(overlap);
        },
      ),
      { numRuns: 400 },
    );
  });
});
