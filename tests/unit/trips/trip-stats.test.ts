// Checks trip-stats.ts against trips worked by hand (working in the comments) and against date-fns v4
// (differenceInCalendarDays, eachDayOfInterval, run in a process set to the operator's zone), a library the
// module does not use. Zone facts: EU summer time (Directive 2000/84/EC) runs from the last Sunday of March
// to the last Sunday of October, switching at 01:00 UTC; Berlin is UTC+1 in winter and UTC+2 in summer.
// In 2026 those Sundays are 29 March and 25 October.
// Conventions under test (the module's own, see its header): durations are calendar-date differences; a bin
// is on hire from its dispatch day up to, not including, its return day; periods include both ends.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { differenceInCalendarDays, eachDayOfInterval, format } from 'date-fns';
import { cycleTimeDays, depotGaps, dwellAtCustomer, onHireDaysInPeriod, periodDays, rotationsPerYear, summarise, tripDates, utilisation } from '@/lib/trips/trip-stats.ts';
import type { Trip } from '@/lib/trips/trip-stats.ts';
import { inProcessTimeZone } from '../support/process-time-zone.ts';

const BERLIN = 'Europe/Berlin';
const APRIL_2026 = { from: '2026-04-01', to: '2026-04-30' }; // 30 days

function trip(fields: Partial<Trip> & Pick<Trip, 'dispatchedAt'>): Trip {
  return { assetId: 'bin-1', customerId: 'cust-1', depotId: 'depot-1', ...fields };
}

describe('cycle time: calendar days in the operator zone, across daylight-saving changes', () => {
  test('spring forward: dispatched 28 Mar 00:30 CET, returned 30 Mar 23:30 CEST → 2 days', () => {
    // 2026-03-27T23:30Z + 1 h (CET) = 28 Mar 00:30 local. 2026-03-30T21:30Z + 2 h (CEST) = 30 Mar 23:30 local.
    // Local dates 28 → 30 = 2 days. (UTC dates 27 → 30 would say 3; elapsed 70 h / 24 = 2.9 would round to 3.)
    const crossing = trip({ dispatchedAt: '2026-03-27T23:30:00Z', returnedAt: '2026-03-30T21:30:00Z' });
    expect(tripDates(crossing, BERLIN)).toMatchObject({ dispatched: '2026-03-28', returned: '2026-03-30' });
    expect(cycleTimeDays(crossing, BERLIN)).toBe(2);
    expect(cycleTimeDays(crossing, 'UTC')).toBe(3); // the same trip counted in another zone differs
  });

  test('fall back: dispatched 25 Oct 00:30 CEST, returned 26 Oct 23:59 CET → 1 day', () => {
    // 2026-10-24T22:30Z + 2 h (still CEST) = 25 Oct 00:30; 2026-10-26T22:59Z + 1 h (CET) = 26 Oct 23:59.
    // Local dates 25 → 26 = 1 day (UTC dates 24 → 26 = 2; elapsed 48.5 h).
    const crossing = trip({ dispatchedAt: '2026-10-24T22:30:00Z', returnedAt: '2026-10-26T22:59:00Z' });
    expect(cycleTimeDays(crossing, BERLIN)).toBe(1);
  });

  test('same-day return is 0 days; an open trip has no cycle time; a return before dispatch is rejected as null', () => {
    expect(cycleTimeDays(trip({ dispatchedAt: '2026-04-29T06:00:00Z', returnedAt: '2026-04-29T15:00:00Z' }), BERLIN)).toBe(0);
    expect(cycleTimeDays(trip({ dispatchedAt: '2026-04-29T06:00:00Z' }), BERLIN)).toBeNull();
    expect(cycleTimeDays(trip({ dispatchedAt: '2026-04-29T06:00:00Z', returnedAt: '2026-04-20T06:00:00Z' }), BERLIN)).toBeNull();
  });

  test.each([BERLIN, 'America/New_York', 'Australia/Sydney'])('agrees with date-fns differenceInCalendarDays in a process running in %s (second opinion, random trips)', (zone) => {
    inProcessTimeZone(zone, () => {
      fc.assert(
        fc.property(
          fc.date({ min: new Date('2015-01-01T00:00:00Z'), max: new Date('2035-12-31T00:00:00Z'), noInvalidDate: true }),
          fc.integer({ min: 0, max: 200 * 24 * 60 }), // trip length in minutes, up to 200 days
          (dispatched, minutes) => {
            const returned = new Date(dispatched.getTime() + minutes * 60_000);
            const sample = trip({ dispatchedAt: dispatched.toISOString(), returnedAt: returned.toISOString() });
            expect(cycleTimeDays(sample, zone)).toBe(differenceInCalendarDays(returned, dispatched));
          },
        ),
        { numRuns: 500 },
      );
    });
  });
});

describe('dwell at the customer', () => {
  // April 2026 is CEST (UTC+2) throughout; all instants below are daytime, so local date = UTC date
  // except where noted.
  const full = trip({
    dispatchedAt: '2026-04-06T06:00:00Z', // 6 Apr
    deliveredAt: '2026-04-07T12:00:00Z', // 7 Apr
    collectedAt: '2026-04-21T08:00:00Z', // 21 Apr
    returnedAt: '2026-04-22T15:00:00Z', // 22 Apr
  });

  test('delivered → collected: 7 → 21 Apr = 14 days, cycle 6 → 22 Apr = 16 days', () => {
    expect(dwellAtCustomer(full, BERLIN)).toEqual({ days: 14, estimated: false });
    expect(cycleTimeDays(full, BERLIN)).toBe(16);
  });

  test('a missed delivery scan falls back to the dispatch (6 → 21 = 15), a missed collection to the return (7 → 22 = 15)', () => {
    expect(dwellAtCustomer({ ...full, deliveredAt: null }, BERLIN)).toEqual({ days: 15, estimated: true });
    expect(dwellAtCustomer({ ...full, collectedAt: null }, BERLIN)).toEqual({ days: 15, estimated: true });
    expect(dwellAtCustomer({ ...full, deliveredAt: null, collectedAt: null }, BERLIN)).toEqual({ days: 16, estimated: true });
  });

  test('collected but not yet back: dwell known, cycle not; neither collected nor back: unknown', () => {
    expect(dwellAtCustomer({ ...full, returnedAt: null }, BERLIN)).toEqual({ days: 14, estimated: false });
    expect(dwellAtCustomer({ ...full, collectedAt: null, returnedAt: null }, BERLIN)).toBeNull();
  });

  test('a late-evening delivery counts on the next local day', () => {
    // 2026-04-07T22:30Z + 2 h = 8 Apr 00:30 in Berlin → 8 → 21 Apr = 13 days.
    expect(dwellAtCustomer({ ...full, deliveredAt: '2026-04-07T22:30:00Z' }, BERLIN)).toEqual({ days: 13, estimated: false });
  });
});

describe('time at the depot between trips of one bin', () => {
  const first = trip({ dispatchedAt: '2026-04-06T06:00:00Z', returnedAt: '2026-04-22T15:00:00Z' }); // 6 → 22 Apr: 16 days
  const second = trip({ depotId: 'depot-2', dispatchedAt: '2026-04-27T05:00:00Z', returnedAt: '2026-05-15T10:00:00Z' }); // 27 Apr → 15 May: 3 + 15 = 18 days
  const third = trip({ depotId: 'depot-2', dispatchedAt: '2026-05-15T16:00:00Z' }); // out again the day it came back

  test('return → next dispatch, in any input order: 22 → 27 Apr = 5 days, 15 → 15 May = 0 days', () => {
    expect(depotGaps([third, first, second], BERLIN)).toEqual([
      { assetId: 'bin-1', depotId: 'depot-2', returnedOn: '2026-04-22', dispatchedOn: '2026-04-27', days: 5 },
      { assetId: 'bin-1', depotId: 'depot-2', returnedOn: '2026-05-15', dispatchedOn: '2026-05-15', days: 0 },
    ]);
  });

  test('cycle times plus depot gaps add up to first dispatch → last return (6 Apr → 15 May = 24 + 15 = 39 days)', () => {
    const cycles = [first, second].map((item) => cycleTimeDays(item, BERLIN)!);
    const gaps = depotGaps([first, second], BERLIN).map((gap) => gap.days);
    expect(cycles).toEqual([16, 18]);
    expect([...cycles, ...gaps].reduce((sum, days) => sum + days, 0)).toBe(39);
    expect(differenceInCalendarDays(new Date(2026, 4, 15), new Date(2026, 3, 6))).toBe(39); // date-fns agrees
  });

  test('bins are kept apart; a trip never returned (missed scan) gives no gap', () => {
    const otherBin = trip({ assetId: 'bin-2', dispatchedAt: '2026-04-23T06:00:00Z' });
    expect(depotGaps([first, otherBin], BERLIN)).toEqual([]);
    expect(depotGaps([{ ...first, returnedAt: null }, second], BERLIN)).toEqual([]);
  });
});

describe('on-hire days, utilisation and rotations in a period', () => {
  // Bin A in April 2026 (30 days):
  //  t1 dispatched 20 Mar (CET: 09:00Z → 10:00), back 10 Apr → on hire 1–9 Apr = 9 days in April; cycle
  //     20 Mar → 10 Apr = 11 + 10 = 21 days; returned inside April → completed.
  //  t2 dispatched 25 Apr, still out → on hire 25–30 Apr = 6 days (up to the period end), not completed.
  const t1 = trip({ assetId: 'A', dispatchedAt: '2026-03-20T09:00:00Z', returnedAt: '2026-04-10T08:00:00Z' });
  const t2 = trip({ assetId: 'A', dispatchedAt: '2026-04-25T07:00:00Z' });

  test('a trip is clipped to the period', () => {
    expect(periodDays(APRIL_2026)).toBe(30);
    expect(onHireDaysInPeriod(t1, APRIL_2026, BERLIN)).toBe(9);
    expect(onHireDaysInPeriod(t2, APRIL_2026, BERLIN)).toBe(6);
    expect(onHireDaysInPeriod(t1, { from: '2026-05-01', to: '2026-05-31' }, BERLIN)).toBe(0);
  });

  test('utilisation (9 + 6) / 30 = 0.5; rotations 1 completed × 365 / 30 = 12.17 per year', () => {
    expect(utilisation([t1, t2], APRIL_2026, BERLIN)).toBe(0.5);
    expect(rotationsPerYear([t1, t2], APRIL_2026, BERLIN)).toBeCloseTo(365 / 30, 10);
  });

  test('a return at 00:30 local on 1 May belongs to May: on hire through 30 Apr, not completed in April', () => {
    // 2026-04-30T22:30Z + 2 h = 1 May 00:30 in Berlin (the UTC date is still 30 April).
    const lateReturn = trip({ dispatchedAt: '2026-04-21T06:00:00Z', returnedAt: '2026-04-30T22:30:00Z' });
    expect(onHireDaysInPeriod(lateReturn, APRIL_2026, BERLIN)).toBe(10); // 21–30 Apr
    expect(rotationsPerYear([lateReturn], APRIL_2026, BERLIN)).toBe(0);
    expect(rotationsPerYear([lateReturn], { from: '2026-05-01', to: '2026-05-31' }, BERLIN)).toBeCloseTo(365 / 31, 10);
  });

  test('a trip across the spring-forward night inside a period: 27 Mar → 2 Apr', () => {
    // Period 23–31 Mar 2026 (9 days). Dispatched 2026-03-26T23:30Z = 27 Mar 00:30 CET; back
    // 2026-04-01T22:30Z = 2 Apr 00:30 CEST. On hire 27–31 Mar = 5 days of 9.
    const crossing = trip({ dispatchedAt: '2026-03-26T23:30:00Z', returnedAt: '2026-04-01T22:30:00Z' });
    const lateMarch = { from: '2026-03-23', to: '2026-03-31' };
    expect(onHireDaysInPeriod(crossing, lateMarch, BERLIN)).toBe(5);
    expect(utilisation([crossing], lateMarch, BERLIN)).toBeCloseTo(5 / 9, 12);
    expect(cycleTimeDays(crossing, BERLIN)).toBe(6); // 27 Mar → 2 Apr: 4 + 2
  });

  test('overlapping trips of one bin (bad scans) count each day once', () => {
    const twin = { ...t1, customerId: 'cust-2' };
    expect(utilisation([t1, twin], APRIL_2026, BERLIN)).toBe(9 / 30);
  });

  test('no trips: 0; a reversed period is refused', () => {
    expect(utilisation([], APRIL_2026, BERLIN)).toBe(0);
    expect(rotationsPerYear([], APRIL_2026, BERLIN)).toBe(0);
    expect(() => periodDays({ from: '2026-04-30', to: '2026-04-01' })).toThrow(RangeError);
  });

  test('on-hire days agree with a day-by-day count done with date-fns (second opinion, random trips)', () => {
    // The independent count walks every day of the period with date-fns eachDayOfInterval and asks whether
    // the bin was out that day (dispatch day ≤ day < return day), with local days taken by date-fns in a
    // process running in Berlin time.
    inProcessTimeZone(BERLIN, () => {
      const dayOf = (date: Date) => format(date, 'yyyy-MM-dd');
      fc.assert(
        fc.property(
          fc.date({ min: new Date('2026-01-01T00:00:00Z'), max: new Date('2026-12-31T00:00:00Z'), noInvalidDate: true }),
          fc.option(fc.integer({ min: 0, max: 120 * 24 * 60 }), { nil: null }),
          fc.integer({ min: 0, max: 300 }),
          fc.integer({ min: 0, max: 90 }),
          (dispatched, minutesOut, periodStartOffset, periodLength) => {
            const returned = minutesOut === null ? null : new Date(dispatched.getTime() + minutesOut * 60_000);
            const sample = trip({ dispatchedAt: dispatched.toISOString(), returnedAt: returned?.toISOString() ?? null });
            const periodStart = new Date(2026, 0, 1 + periodStartOffset);
            const periodEnd = new Date(2026, 0, 1 + periodStartOffset + periodLength);
            const period = { from: dayOf(periodStart), to: dayOf(periodEnd) };
            const outDay = dayOf(dispatched);
            const backDay = returned === null ? null : dayOf(returned);
            const expected = eachDayOfInterval({ start: periodStart, end: periodEnd })
              .map(dayOf)
              .filter((day) => outDay <= day && (backDay === null || day < backDay)).length;
            expect(onHireDaysInPeriod(sample, period, BERLIN)).toBe(expected);
            expect(periodDays(period)).toBe(periodLength + 1);
          },
        ),
        { numRuns: 1000 },
      );
    });
  });
});

describe('summarise by asset, customer and depot (April 2026, Berlin)', () => {
  // Local dates in Berlin; April is CEST (UTC+2), March 20 and February/March 15 are CET (UTC+1).
  const trips: Trip[] = [
    // t1 A/C1/D1: out 20 Mar, delivered 21 Mar, collected 8 Apr, back 10 Apr.
    //    cycle 20 Mar → 10 Apr = 21; dwell 21 Mar → 8 Apr = 10 + 8 = 18; April on hire 1–9 = 9 days; completed.
    {
      assetId: 'A',
      customerId: 'C1',
      depotId: 'D1',
      dispatchedAt: '2026-03-20T09:00:00Z',
      deliveredAt: '2026-03-21T09:00:00Z',
      collectedAt: '2026-04-08T09:00:00Z',
      returnedAt: '2026-04-10T08:00:00Z',
    },
    // t2 A/C2/D2: out 25 Apr, open → on hire 25–30 Apr = 6 days; not completed.
    { assetId: 'A', customerId: 'C2', depotId: 'D2', dispatchedAt: '2026-04-25T07:00:00Z' },
    // t3 B/C1/D1: out 2 Apr, delivered 3 Apr, collection not scanned, back 16 Apr.
    //    cycle 2 → 16 = 14; dwell 3 → 16 = 13 (estimated: falls back to the return); on hire 2–15 Apr = 14 days.
    { assetId: 'B', customerId: 'C1', depotId: 'D1', dispatchedAt: '2026-04-02T06:00:00Z', deliveredAt: '2026-04-03T10:00:00Z', returnedAt: '2026-04-16T12:00:00Z' },
    // t4 B/C2/D1: out 2026-04-20T22:30Z = 21 Apr 00:30; back 2026-04-30T22:30Z = 1 May 00:30 → not completed in
    //    April; on hire 21–30 Apr = 10 days.
    { assetId: 'B', customerId: 'C2', depotId: 'D1', dispatchedAt: '2026-04-20T22:30:00Z', collectedAt: '2026-04-27T08:00:00Z', returnedAt: '2026-04-30T22:30:00Z' },
    // t5 C/C2/D2: 1 Feb → 15 Mar, wholly before April → left out.
    { assetId: 'C', customerId: 'C2', depotId: 'D2', dispatchedAt: '2026-02-01T08:00:00Z', returnedAt: '2026-03-15T10:00:00Z' },
    // t6 C/C1/D2: out and back on 29 Apr → cycle 0, dwell 0 (estimated), 0 days on hire, but completed in April.
    { assetId: 'C', customerId: 'C1', depotId: 'D2', dispatchedAt: '2026-04-29T08:00:00Z', returnedAt: '2026-04-29T15:00:00Z' },
    // t7 C/C1/D1: out 2 May, after April → left out.
    { assetId: 'C', customerId: 'C1', depotId: 'D1', dispatchedAt: '2026-05-02T08:00:00Z' },
  ];
  const options = { period: APRIL_2026, timeZone: BERLIN };
  const perYear = 365 / 30; // one completed trip per bin in a 30-day period

  test('by asset', () => {
    const rows = summarise(trips, { ...options, groupBy: 'asset' });
    expect(rows.map((row) => row.key)).toEqual(['A', 'B', 'C']);
    // A: t1, t2. Utilisation (9 + 6) / 30 = 0.5.
    expect(rows[0]).toEqual({
      key: 'A',
      trips: 2,
      completedTrips: 1,
      bins: 1,
      meanCycleDays: 21,
      medianCycleDays: 21,
      meanDwellDays: 18,
      utilisation: 0.5,
      rotationsPerBinPerYear: perYear,
    });
    // B: t3, t4. Utilisation (14 + 10) / 30 = 0.8.
    expect(rows[1]).toEqual({
      key: 'B',
      trips: 2,
      completedTrips: 1,
      bins: 1,
      meanCycleDays: 14,
      medianCycleDays: 14,
      meanDwellDays: 13,
      utilisation: 0.8,
      rotationsPerBinPerYear: perYear,
    });
    // C: t6 only. Utilisation 0 / 30.
    expect(rows[2]).toEqual({
      key: 'C',
      trips: 1,
      completedTrips: 1,
      bins: 1,
      meanCycleDays: 0,
      medianCycleDays: 0,
      meanDwellDays: 0,
      utilisation: 0,
      rotationsPerBinPerYear: perYear,
    });
  });

  test('by customer', () => {
    const [c1, c2] = summarise(trips, { ...options, groupBy: 'customer' });
    // C1: t1 (A), t3 (B), t6 (C). Cycles 21, 14, 0 → mean 35/3, median 14. Dwell 18, 13, 0 → mean 31/3.
    //     On hire 9 + 14 + 0 = 23 bin-days of 3 bins × 30 days = 90 → 0.2556. 3 completed / 3 bins × 365/30.
    expect(c1).toMatchObject({ key: 'C1', trips: 3, completedTrips: 3, bins: 3, medianCycleDays: 14 });
    expect(c1!.meanCycleDays).toBeCloseTo(35 / 3, 12);
    expect(c1!.meanDwellDays).toBeCloseTo(31 / 3, 12);
    expect(c1!.utilisation).toBeCloseTo(23 / 90, 12);
    expect(c1!.rotationsPerBinPerYear).toBeCloseTo(perYear, 12);
    // C2: t2 (A), t4 (B); none completed in April. On hire 6 + 10 = 16 of 2 × 30 = 60 → 0.2667.
    expect(c2).toMatchObject({ key: 'C2', trips: 2, completedTrips: 0, bins: 2, meanCycleDays: null, medianCycleDays: null, meanDwellDays: null, rotationsPerBinPerYear: 0 });
    expect(c2!.utilisation).toBeCloseTo(16 / 60, 12);
  });

  test('by dispatching depot', () => {
    const [d1, d2] = summarise(trips, { ...options, groupBy: 'depot' });
    // D1: t1 (A), t3 (B), t4 (B); completed t1, t3 → cycles 21, 14: mean = median = 17.5; dwell 18, 13 → 15.5.
    //     On hire A 9, B 14 + 10 = 24 → 33 of 2 bins × 30 = 60 → 0.55. 2 completed / 2 bins × 365/30.
    expect(d1).toMatchObject({ key: 'D1', trips: 3, completedTrips: 2, bins: 2, meanCycleDays: 17.5, medianCycleDays: 17.5, meanDwellDays: 15.5 });
    expect(d1!.utilisation).toBeCloseTo(0.55, 12);
    expect(d1!.rotationsPerBinPerYear).toBeCloseTo(perYear, 12);
    // D2: t2 (A), t6 (C); completed t6 → cycle 0. On hire 6 + 0 of 60 → 0.1. 1 completed / 2 bins × 365/30.
    expect(d2).toMatchObject({ key: 'D2', trips: 2, completedTrips: 1, bins: 2, meanCycleDays: 0, medianCycleDays: 0, meanDwellDays: 0 });
    expect(d2!.utilisation).toBeCloseTo(0.1, 12);
    expect(d2!.rotationsPerBinPerYear).toBeCloseTo(perYear / 2, 12);
  });

  test('median of an even count is the mean of the middle two', () => {
    // Cycles 2, 4, 10, 30 days (all returned in April) → median (4 + 10) / 2 = 7, mean 46 / 4 = 11.5.
    const lengths = [2, 4, 10, 30];
    const sample = lengths.map((days, index) =>
      trip({ assetId: `bin-${index}`, dispatchedAt: `2026-03-${String(31 - days + 1).padStart(2, '0')}T08:00:00Z`, returnedAt: '2026-04-01T08:00:00Z' }),
    );
    const [row] = summarise(sample, { ...options, groupBy: 'customer' });
    expect(row).toMatchObject({ completedTrips: 4, medianCycleDays: 7, meanCycleDays: 11.5 });
  });

  test('no trips in the period: no rows', () => {
    expect(summarise(trips, { groupBy: 'asset', period: { from: '2025-01-01', to: '2025-01-31' }, timeZone: BERLIN })).toEqual([]);
  });
});
