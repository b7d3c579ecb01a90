// Checks dispatch-check.ts: ADR/RID 4.1.2.2 and 49 CFR 180.352 [published]: no filling after the periodic
// test has expired (so a bin lapsing before the wanted fill date is never sent); the margin for the days on
// hire is the operator's own policy. The nearest-rank percentile is checked against the worked example of the
// nearest-rank method ({15, 20, 35, 40, 50}: 30th → 20, 40th → 20, 50th → 35, 100th → 50) [memory], and
// against date-fns for the expected-back dates. Kaplan–Meier values are worked by hand.
import { describe, test, expect } from 'vitest';
import { addDays as dfAddDays, format } from 'date-fns';
import { checkDispatch, daysOnHireFromCurve, daysOnHireFromTrips, overrideAccepted } from '@/lib/inspections/dispatch-check';
import { DEFAULT_UN_POLICY, US_DOT_POLICY } from '@/lib/inspections/inspection-due';
import { kaplanMeier } from '@/lib/planning/returns-forecast';

const test_ = { because: 'test' as const };

describe('usual days on hire (90th percentile)', () => {
  test('nearest rank: the textbook list', () => {
    const list = [15, 20, 35, 40, 50];
    expect(daysOnHireFromTrips(list, 0.3)).toBe(20);
    expect(daysOnHireFromTrips(list, 0.4)).toBe(20);
    expect(daysOnHireFromTrips(list, 0.5)).toBe(35);
    expect(daysOnHireFromTrips(list, 1)).toBe(50);
  });

  test('90th percentile of ten trips is the 9th smallest; none is null', () => {
    // Sorted: 10 12 14 20 21 25 30 33 41 90; rank ⌈0.9 × 10⌉ = 9 → 41.
    expect(daysOnHireFromTrips([30, 10, 90, 21, 12, 41, 14, 25, 33, 20])).toBe(41);
    expect(daysOnHireFromTrips([])).toBeNull();
    expect(() => daysOnHireFromTrips([3.5])).toThrow(RangeError);
  });

  test('from the Kaplan–Meier curve: the first day S(t) ≤ 0.1', () => {
    // Ten returned trips, no censoring: S drops by 0.1 at each; S(33) = 0.2, S(41) = 0.1 → 41 (same as nearest rank).
    const curve = kaplanMeier([30, 10, 90, 21, 12, 41, 14, 25, 33, 20].map((days) => ({ days, returned: true })));
    expect(daysOnHireFromCurve(curve)).toBe(41);
    // Five back after 10, 12, 14, 16, 18 days and five still out after 30: S falls 0.9, 0.8, 0.7, 0.6, 0.5 and
    // stays there (the open trips outlast every return), so it never reaches 0.1 → null.
    const open = kaplanMeier([10, 12, 14, 16, 18].map((days) => ({ days, returned: true })).concat([...Array(5)].map(() => ({ days: 30, returned: false }))));
    expect(daysOnHireFromCurve(open)).toBeNull();
  });
});

describe('checkDispatch (ADR 4.1.2.2; the margin is policy)', () => {
  const base = { today: '2026-12-03', wantedOn: '2026-12-10', usualDaysOnHire: 45, policy: DEFAULT_UN_POLICY };

  test('already lapsed: refused, not overridable', () => {
    const c = checkDispatch({ ...base, limit: { lastDay: '2026-11-30', ...test_ } });
    expect(c).toMatchObject({ ok: false, code: 'inspection_lapsed', overridable: false });
  });

  test('lapses before the wanted fill date: refused, never overridable', () => {
    // Due 2026-12-09, wanted 2026-12-10: it could not be filled on the 10th.
    const c = checkDispatch({ ...base, limit: { lastDay: '2026-12-09', ...test_ } });
    expect(c).toMatchObject({ ok: false, code: 'lapses_before_fill', overridable: false, lastDay: '2026-12-09' });
    expect(overrideAccepted(c, 'customer insists, planner agrees')).toBe(false);
    // Due on the wanted day itself: it may be filled that day; then the margin decides.
    expect(checkDispatch({ ...base, limit: { lastDay: '2026-12-10', ...test_ } })).toMatchObject({ code: 'lapses_while_out' });
  });

  test('lapses while likely out: refused, overridable with a reason', () => {
    // Wanted 2026-12-10 + 45 days = 2027-01-24 (21 days to 31 Dec, 24 into January). Due 2027-01-23: one day short.
    const c = checkDispatch({ ...base, limit: { lastDay: '2027-01-23', ...test_ } });
    expect(c).toMatchObject({ ok: false, code: 'lapses_while_out', overridable: true, expectedBackOn: '2027-01-24' });
    expect(format(dfAddDays(new Date(2026, 11, 10), 45), 'yyyy-MM-dd')).toBe('2027-01-24'); // date-fns agrees
    expect((c as { reason: string }).reason).toMatch(/carried until 2027-04-23 \(ADR 4\.1\.2\.2\)/);
    expect(overrideAccepted(c, 'back in 2 weeks, agreed')).toBe(true);
    expect(overrideAccepted(c, '  ')).toBe(false);
    expect(overrideAccepted(c, undefined)).toBe(false);
    // Due on the expected-back day: fine.
    expect(checkDispatch({ ...base, limit: { lastDay: '2027-01-24', ...test_ } })).toEqual({ ok: true, marginChecked: true });
  });

  test('across a leap day and a month end', () => {
    // Wanted 2028-02-10 + 20 days = 2028-03-01 (2028-02 has 29 days: 19 days to the 29th, +1).
    const c = checkDispatch({ ...base, today: '2028-02-01', wantedOn: '2028-02-10', usualDaysOnHire: 20, limit: { lastDay: '2028-02-29', ...test_ } });
    expect(c).toMatchObject({ code: 'lapses_while_out', expectedBackOn: '2028-03-01' });
    expect(format(dfAddDays(new Date(2028, 1, 10), 20), 'yyyy-MM-dd')).toBe('2028-03-01');
    // 3 months after 31 Jan clamps to 30 Apr? No: 2028-02-29 + 3 months = 2028-05-29.
    expect((c as { reason: string }).reason).toMatch(/until 2028-05-29/);
  });

  test('US regime: the words say a bin filled before may still be carried', () => {
    const c = checkDispatch({ ...base, policy: US_DOT_POLICY, limit: { lastDay: '2027-01-01', ...test_ } });
    expect((c as { reason: string }).reason).toMatch(/49 CFR 180\.352/);
  });

  test('an order wanted in the past is filled today at the earliest; no history means no margin check', () => {
    expect(checkDispatch({ ...base, wantedOn: '2026-11-20', limit: { lastDay: '2026-12-03', ...test_ }, usualDaysOnHire: null })).toEqual({ ok: true, marginChecked: false });
    expect(checkDispatch({ ...base, limit: null })).toEqual({ ok: true, marginChecked: false });
  });

  test('the end of the period of use (ADR 4.1.1.15) is named as such', () => {
    const c = checkDispatch({ ...base, limit: { lastDay: '2026-12-05', because: 'service_life' } });
    expect((c as { reason: string }).reason).toMatch(/period of use \(ADR 4\.1\.1\.15\)/);
  });
});
