// The overdue-back rule against dates worked by hand (the working is in each test's title or comment) and
// against date-fns v4 (addDays, differenceInCalendarDays), a date library the module does not use, as a
// second opinion on random dates. The rule itself — more days since delivery than the free days — is the
// operator's hire term (common practice for hire pools, no single published source).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as fnsAddDays, differenceInCalendarDays, format, parseISO } from 'date-fns';
import { lastFreeDay, overdueBack, isWithCustomer, tripTermsOf, WITH_CUSTOMER_STATUSES } from '@/lib/fleet/overdue-return.ts';
import { STATUSES } from '@/lib/scans/lifecycle.ts';

describe('overdue back: more days since delivery than the free days', () => {
  const base = { status: 'on_hire' as const, deliveredOn: '2026-03-01', dispatchedOn: '2026-02-27', freeDays: 14 };

  test('delivered 1 Mar, 14 free days: 15 Mar is day 14 (still free), 16 Mar is one day over', () => {
    expect(lastFreeDay('2026-03-01', 14)).toBe('2026-03-15');
    expect(overdueBack({ ...base, today: '2026-03-15' })).toEqual({
      applies: true,
      daysWithCustomer: 14,
      daysOver: 0,
      overdue: false,
      estimated: false,
      freeUntil: '2026-03-15',
    });
    expect(overdueBack({ ...base, today: '2026-03-16' })).toMatchObject({ daysWithCustomer: 15, daysOver: 1, overdue: true });
  });

  test('across the end of February in a leap year: delivered 20 Feb 2028, 21 free days → free until 12 Mar 2028', () => {
    // 20 Feb + 9 days = 29 Feb (2028 is a leap year), + 12 more = 12 Mar.
    expect(lastFreeDay('2028-02-20', 21)).toBe('2028-03-12');
    expect(overdueBack({ ...base, deliveredOn: '2028-02-20', freeDays: 21, today: '2028-03-13' })).toMatchObject({ daysOver: 1, overdue: true });
  });

  test('awaiting collection counts like on hire; zero free days means overdue from the next day', () => {
    expect(overdueBack({ ...base, status: 'awaiting_collection', freeDays: 0, today: '2026-03-01' })).toMatchObject({ overdue: false, daysWithCustomer: 0 });
    expect(overdueBack({ ...base, status: 'awaiting_collection', freeDays: 0, today: '2026-03-02' })).toMatchObject({ overdue: true, daysOver: 1 });
  });

  test('a missed delivery scan counts from the dispatch and says so', () => {
    // Dispatched 27 Feb 2026; 14 free days → free until 13 Mar; 16 Mar is 17 days, 3 over.
    expect(overdueBack({ ...base, deliveredOn: null, today: '2026-03-16' })).toEqual({
      applies: true,
      daysWithCustomer: 17,
      daysOver: 3,
      overdue: true,
      estimated: true,
      freeUntil: '2026-03-13',
    });
  });

  test('the rule applies only while the bin is with the customer', () => {
    expect([...WITH_CUSTOMER_STATUSES]).toEqual(['on_hire', 'awaiting_collection']);
    for (const status of STATUSES.filter((s) => !isWithCustomer(s))) {
      expect(overdueBack({ ...base, status, today: '2027-01-01' })).toMatchObject({ applies: false, overdue: false, daysOver: 0 });
    }
    expect(overdueBack({ ...base, deliveredOn: null, dispatchedOn: null, today: '2027-01-01' }).applies).toBe(false);
  });

  test('a delivery date after today (a phone clock off) is zero days, never negative', () => {
    expect(overdueBack({ ...base, today: '2026-02-25' })).toMatchObject({ daysWithCustomer: 0, daysOver: 0, overdue: false });
  });

  test('negative or fractional free days are refused', () => {
    expect(() => lastFreeDay('2026-03-01', -1)).toThrow(RangeError);
    expect(() => lastFreeDay('2026-03-01', 1.5)).toThrow(RangeError);
  });

  test('agrees with date-fns on random deliveries and free days (second opinion)', () => {
    fc.assert(
      fc.property(
        fc.date({ min: new Date('2020-01-01T00:00:00Z'), max: new Date('2035-12-31T00:00:00Z'), noInvalidDate: true }),
        fc.integer({ min: 0, max: 365 }),
        fc.integer({ min: 0, max: 800 }),
        (when, freeDays, later) => {
          const delivered = parseISO(when.toISOString().slice(0, 10));
          const today = fnsAddDays(delivered, later);
          const iso = (d: Date) => format(d, 'yyyy-MM-dd');
          const check = overdueBack({ status: 'on_hire', deliveredOn: iso(delivered), dispatchedOn: null, freeDays, today: iso(today) });
          expect(check.freeUntil).toBe(iso(fnsAddDays(delivered, freeDays)));
          expect(check.daysWithCustomer).toBe(differenceInCalendarDays(today, delivered));
          expect(check.overdue).toBe(differenceInCalendarDays(today, delivered) > freeDays);
        },
      ),
      { numRuns: 300 },
    );
  });

  test('a tariff that starts hire at the dispatch and counts the first day (worked by hand)', () => {
    // dispatched 19 Nov, delivered 20 Nov, 12 free days; today 1 Dec.
    const trip = { status: 'on_hire' as const, deliveredOn: '2026-11-20', dispatchedOn: '2026-11-19', freeDays: 12, today: '2026-12-01' };
    // default terms: from the delivery, the first day free → 21 Nov … 1 Dec = 11 days, 1 under
    expect(overdueBack(trip)).toMatchObject({ daysWithCustomer: 11, daysOver: 0, overdue: false, freeUntil: '2026-12-02' });
    // from the dispatch, the first day counted → 19 Nov … 1 Dec = 13 days, 1 over; the 12th counted day is 30 Nov
    const strict = overdueBack({ ...trip, hireStartsAt: 'dispatch', dayCount: { firstDayCounts: true, lastDayCounts: true } });
    expect(strict).toMatchObject({ daysWithCustomer: 13, daysOver: 1, overdue: true, estimated: false, freeUntil: '2026-11-30' });
    // from the dispatch, a delivery never scanned is no estimate: the dispatch is the start the tariff names
    expect(overdueBack({ ...trip, deliveredOn: null, hireStartsAt: 'dispatch' }).estimated).toBe(false);
    expect(overdueBack({ ...trip, deliveredOn: null }).estimated).toBe(true);
  });

  test('the terms read from a row: the tariff version where there is one, the defaults for what is missing', () => {
    expect(tripTermsOf({ terms_free_days: 12, terms_first_day_counts: true, terms_last_day_counts: false, terms_hire_starts_at: 'dispatch' })).toEqual({
      freeDays: 12,
      dayCount: { firstDayCounts: true, lastDayCounts: false },
      hireStartsAt: 'dispatch',
    });
    expect(tripTermsOf({ terms_free_days: null, terms_first_day_counts: null, terms_last_day_counts: null, terms_hire_starts_at: null })).toEqual({
      freeDays: 0,
      dayCount: { firstDayCounts: false, lastDayCounts: true },
      hireStartsAt: 'delivery',
    });
  });
});
