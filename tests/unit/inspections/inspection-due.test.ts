// Checks inspection-due.ts against:
// - UN Model Regulations / ADR / RID 6.5.4.4.1–2 [published]: inspections at intervals of no more than
//   2.5 years (30 months) and 5 years (60 months); 6.5.2.1 [published]: marks carry month and year only.
// - ADR 4.1.2.2 [published]: no filling after expiry; a bin filled before expiry may be carried for up to
//   3 months after it. US 49 CFR 180.352 [published]: same intervals, no such time limit.
// - Policy of this module (not published): a test due in a month may be done up to that month's last day;
//   the next due date runs from the test actually done; the 3-month allowance is counted by calendar months
//   with the day clamped to the end of a shorter month. The 30-day booking window is common practice.
// Dates below are worked by hand (working in the comments), and date-fns v4 addMonths / endOfMonth —
// a library the module does not use — gives a second opinion over a random sweep of months (fast-check).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addMonths, differenceInCalendarMonths, endOfMonth, format } from 'date-fns';
import {
  DEFAULT_UN_POLICY,
  US_DOT_POLICY,
  bookingWindowOpensOn,
  inspectionLabel,
  mayCarryFilled,
  mayFillAndDispatch,
  nextDue,
  policyProblems,
  testStatus,
  leakTestProblems,
  clocksRestartedBy,
  historyAfter,
  LEAK_TEST_MIN_KPA,
  LEAK_TEST_MIN_MINUTES,
} from '@/lib/inspections/inspection-due.ts';
import type { InspectionPolicy } from '@/lib/inspections/inspection-due.ts';

const ADR = DEFAULT_UN_POLICY;

/** date-fns: last day of the month `months` after 'YYYY-MM', built from numbers, formatted 'yyyy-MM-dd'. */
function dfDueDate(month: string, months: number): string {
  const [year, monthNumber] = month.split('-').map(Number) as [number, number];
  return format(endOfMonth(addMonths(new Date(year, monthNumber - 1, 1), months)), 'yyyy-MM-dd');
}

describe('nextDue: hand-worked schedules', () => {
  test('new bin made 2024-01: 2.5-year due 2026-07-31, 5-year due 2029-01-31', () => {
    // 2024-01 + 30 months = 2026-07 (24 → 2026-01, +6 → 2026-07); end of month → 2026-07-31.
    // 2024-01 + 60 months = 2029-01 (five whole years); end of month → 2029-01-31. (Not 2028-12-31:
    // that would be 59 months.)
    expect(nextDue({ manufactureMonth: '2024-01' }, ADR)).toEqual({
      intermediateDue: '2026-07-31',
      fullDue: '2029-01-31',
      nextDue: '2026-07-31',
      nextKind: 'intermediate',
    });
  });

  test('null and missing test months mean the same thing', () => {
    expect(nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: null, lastFullInspectionMonth: null }, ADR)).toEqual(nextDue({ manufactureMonth: '2024-01' }, ADR));
  });

  test('leap years: a due month of February ends on the 29th only in a leap year', () => {
    // 2021-08 + 30 = 2024-02 (24 → 2023-08, +6 → 2024-02); 2024 is a leap year → 2024-02-29.
    expect(nextDue({ manufactureMonth: '2021-08' }, ADR).intermediateDue).toBe('2024-02-29');
    // 2020-08 + 30 = 2023-02 → 2023-02-28.
    expect(nextDue({ manufactureMonth: '2020-08' }, ADR).intermediateDue).toBe('2023-02-28');
    // 2097-08 + 30 = 2100-02; 2100 is divisible by 100 but not by 400, so not a leap year → 2100-02-28.
    expect(nextDue({ manufactureMonth: '2097-08' }, ADR).intermediateDue).toBe('2100-02-28');
    // 2019-02 + 60 = 2024-02 → 2024-02-29.
    expect(nextDue({ manufactureMonth: '2019-02' }, ADR).fullDue).toBe('2024-02-29');
  });

  test('a 2.5-year test done on time: the 5-year one falls due in the same month and comes first', () => {
    // Made 2024-01, tested 2026-07: next 2.5-year 2026-07 + 30 = 2029-01; 5-year 2024-01 + 60 = 2029-01.
    // Same day: the full inspection covers the intermediate one, so it is the one to book.
    expect(nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2026-07' }, ADR)).toEqual({
      intermediateDue: '2029-01-31',
      fullDue: '2029-01-31',
      nextDue: '2029-01-31',
      nextKind: 'full',
    });
  });

  test('a 2.5-year test done early: the next one runs from the test done, not from the old schedule', () => {
    // Made 2024-01 (old schedule: 2026-07), tested early in 2026-04 → 2026-04 + 30 = 2028-10 → 2028-10-31.
    const due = nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2026-04' }, ADR);
    expect(due.intermediateDue).toBe('2028-10-31');
    expect(due.fullDue).toBe('2029-01-31');
    expect(due).toMatchObject({ nextDue: '2028-10-31', nextKind: 'intermediate' });
  });

  test('after the second 2.5-year test the 5-year date is next', () => {
    // Tested 2028-10 → 2028-10 + 30 = 2031-04 → 2031-04-30; the 5-year date 2029-01-31 is earlier.
    expect(nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2028-10' }, ADR)).toEqual({
      intermediateDue: '2031-04-30',
      fullDue: '2029-01-31',
      nextDue: '2029-01-31',
      nextKind: 'full',
    });
  });

  test('a 5-year inspection restarts only the 5-year clock; the 2.5-year one runs from the last leakproofness test', () => {
    // ADR 6.5.4.4.1(a) / 6.5.4.4.2: the 5-year inspection is design type, marks and internal condition; the
    // 2.5-year clock is the leakproofness test. Full inspection 2029-01 without a leakproofness test, last
    // leakproofness test 2028-10: 2.5-year 2028-10 + 30 = 2031-04 → 2031-04-30; 5-year 2029-01 + 60 = 2034-01 → 2034-01-31.
    expect(nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2028-10', lastFullInspectionMonth: '2029-01' }, ADR)).toEqual({
      intermediateDue: '2031-04-30',
      fullDue: '2034-01-31',
      nextDue: '2031-04-30',
      nextKind: 'intermediate',
    });
    // Done with a leakproofness test, the same inspection counts for both clocks (both months 2029-01):
    // 2029-01 + 30 = 2031-07 → 2031-07-31.
    expect(nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2029-01', lastFullInspectionMonth: '2029-01' }, ADR)).toEqual({
      intermediateDue: '2031-07-31',
      fullDue: '2034-01-31',
      nextDue: '2031-07-31',
      nextKind: 'intermediate',
    });
    // A 5-year inspection alone on a bin never leak-tested since manufacture 2020-05: the 2.5-year clock still
    // runs from manufacture, 2020-05 + 30 = 2022-11 → 2022-11-30, and that is what falls due next.
    expect(nextDue({ manufactureMonth: '2020-05', lastFullInspectionMonth: '2024-03' }, ADR)).toEqual({
      intermediateDue: '2022-11-30',
      fullDue: '2029-03-31',
      nextDue: '2022-11-30',
      nextKind: 'intermediate',
    });
  });

  test('US 49 CFR 180.352 uses the same 2.5- and 5-year intervals', () => {
    expect(nextDue({ manufactureMonth: '2024-01' }, US_DOT_POLICY)).toEqual(nextDue({ manufactureMonth: '2024-01' }, ADR));
  });

  test("an operator's own policy for non-UN bins", () => {
    const ownPolicy: InspectionPolicy = { kind: 'own', intermediateMonths: 12, fullMonths: 24, carriageAllowanceMonths: 0, bookingWindowDays: 14 };
    // 2025-06 + 12 = 2026-06 → 2026-06-30; 2025-06 + 24 = 2027-06 → 2027-06-30.
    expect(nextDue({ manufactureMonth: '2025-06' }, ownPolicy)).toEqual({
      intermediateDue: '2026-06-30',
      fullDue: '2027-06-30',
      nextDue: '2026-06-30',
      nextKind: 'intermediate',
    });
  });

  test('refuses impossible histories and unusable policies', () => {
    expect(() => nextDue({ manufactureMonth: '2024-1' }, ADR)).toThrow(RangeError);
    expect(() => nextDue({ manufactureMonth: '2024-05', lastIntermediateTestMonth: '2024-04' }, ADR)).toThrow(/before manufacture/);
    expect(() => nextDue({ manufactureMonth: '2024-05', lastFullInspectionMonth: '2024-13' }, ADR)).toThrow(RangeError);
    expect(() => nextDue({ manufactureMonth: '2024-05' }, { ...ADR, intermediateMonths: 36 })).toThrow(/30 months/);
  });
});

describe('nextDue: second opinion from date-fns over a sweep of months', () => {
  const month = fc
    .record({ year: fc.integer({ min: 1950, max: 2150 }), month: fc.integer({ min: 1, max: 12 }) })
    .map(({ year, month }) => `${year}-${String(month).padStart(2, '0')}`);

  test('a new bin: due dates are the ends of the months 30 and 60 months after manufacture', () => {
    fc.assert(
      fc.property(month, (made) => {
        const due = nextDue({ manufactureMonth: made }, ADR);
        expect(due.intermediateDue).toBe(dfDueDate(made, 30));
        expect(due.fullDue).toBe(dfDueDate(made, 60));
        expect(due.nextDue).toBe(due.intermediateDue);
      }),
      { numRuns: 2000 },
    );
  });

  test('after a 2.5-year test in any later month, the next one is 30 months after that month', () => {
    fc.assert(
      fc.property(month, fc.integer({ min: 0, max: 59 }), (made, testedAfterMonths) => {
        const tested = format(addMonths(new Date(`${made}-01T12:00:00`), testedAfterMonths), 'yyyy-MM');
        const due = nextDue({ manufactureMonth: made, lastIntermediateTestMonth: tested }, ADR);
        expect(due.intermediateDue).toBe(dfDueDate(tested, 30));
        expect(due.fullDue).toBe(dfDueDate(made, 60));
        // date-fns counts the months back: the due month is exactly 30 months after the test month.
        expect(differenceInCalendarMonths(new Date(`${due.intermediateDue}T12:00:00`), new Date(`${tested}-01T12:00:00`))).toBe(30);
        expect(due.nextDue <= due.intermediateDue && due.nextDue <= due.fullDue).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('testStatus and the booking window', () => {
  test.each([
    ['2026-06-30', 'ok'], // 31 days left
    ['2026-07-01', 'due_soon'], // 30 days left
    ['2026-07-31', 'due_soon'], // the due day itself: the test may still be done today
    ['2026-08-01', 'overdue'],
  ])('due 2026-07-31, on %s → %s', (today, expected) => {
    expect(testStatus('2026-07-31', today)).toBe(expected);
  });

  test('the "soon" threshold can be the policy booking window', () => {
    expect(testStatus('2026-07-31', '2026-07-10', 14)).toBe('ok'); // 21 days left
    expect(testStatus('2026-07-31', '2026-07-17', 14)).toBe('due_soon'); // 14 days left
  });

  test('the booking window opens 30 days before the due date under the default policy', () => {
    // 31 Jul − 30 days = 1 Jul.
    expect(bookingWindowOpensOn('2026-07-31', ADR)).toBe('2026-07-01');
    // 31 Mar 2024 − 30 days = 1 Mar 2024 (February 2024 has 29 days, not involved).
    expect(bookingWindowOpensOn('2024-03-31', ADR)).toBe('2024-03-01');
  });
});

describe('mayFillAndDispatch (ADR 4.1.2.2, 49 CFR 180.352)', () => {
  // Made 2023-09: 2023-09 + 30 = 2026-03 → 2026-03-31; 2023-09 + 60 = 2028-09 → 2028-09-30.
  const due = nextDue({ manufactureMonth: '2023-09' }, ADR);

  test('allowed up to and including the due date', () => {
    expect(due.nextDue).toBe('2026-03-31');
    expect(mayFillAndDispatch(due, '2026-03-31')).toEqual({ ok: true });
  });

  test('refused the day after, with the reason and the inspection to book', () => {
    expect(mayFillAndDispatch(due, '2026-04-01')).toEqual({
      ok: false,
      lapsedOn: '2026-03-31',
      reason: 'periodic test lapsed on 2026-03-31; book a 2.5-year inspection',
    });
  });

  test('when the 5-year date is due or passed too, the 5-year inspection is the one to book', () => {
    // Made 2020-01, never tested: 2.5-year lapsed 2022-07-31, 5-year lapsed 2025-01-31.
    const longLapsed = nextDue({ manufactureMonth: '2020-01' }, ADR);
    expect(mayFillAndDispatch(longLapsed, '2025-02-01')).toEqual({
      ok: false,
      lapsedOn: '2022-07-31',
      reason: 'periodic test lapsed on 2022-07-31; book a 5-year inspection',
    });
    // Made 2024-01, tested 2028-10: next is the 5-year on 2029-01-31.
    const fullNext = nextDue({ manufactureMonth: '2024-01', lastIntermediateTestMonth: '2028-10' }, ADR);
    expect(mayFillAndDispatch(fullNext, '2029-02-01')).toMatchObject({ ok: false, reason: expect.stringContaining('book a 5-year inspection') });
  });
});

describe('mayCarryFilled (ADR 4.1.2.2: up to 3 months after expiry if filled before it)', () => {
  test('filled before expiry: may travel until 3 months after the due date, inclusive', () => {
    // 31 Mar + 3 months = 30 Jun (no 31 Jun: clamped).
    const base = { filledOn: '2026-03-20', nextDue: '2026-03-31', policy: ADR };
    expect(mayCarryFilled({ ...base, today: '2026-03-25' })).toEqual({ ok: true, carryUntil: '2026-06-30' });
    expect(mayCarryFilled({ ...base, today: '2026-06-30' })).toEqual({ ok: true, carryUntil: '2026-06-30' });
    expect(mayCarryFilled({ ...base, today: '2026-07-01' })).toEqual({
      ok: false,
      lapsedOn: '2026-03-31',
      reason: 'periodic test lapsed on 2026-03-31 and carriage was allowed until 2026-06-30; discharge the bin and book its inspection',
    });
  });

  test('filled on the due day itself still counts as before expiry', () => {
    expect(mayCarryFilled({ filledOn: '2026-03-31', nextDue: '2026-03-31', today: '2026-04-15', policy: ADR })).toMatchObject({ ok: true });
  });

  test('filled after expiry: never', () => {
    expect(mayCarryFilled({ filledOn: '2026-04-01', nextDue: '2026-03-31', today: '2026-04-01', policy: ADR })).toEqual({
      ok: false,
      lapsedOn: '2026-03-31',
      reason: 'filled on 2026-04-01, after the periodic test lapsed on 2026-03-31; it may not be offered for carriage',
    });
  });

  test.each([
    ['2026-02-28', '2026-05-28'], // the 28th exists in May: kept (the shorter reading; policy)
    ['2024-02-29', '2024-05-29'], // leap day
    ['2025-11-30', '2026-02-28'], // no 30 Feb: clamped to 28 Feb 2026 (a common year)
    ['2027-11-30', '2028-02-29'], // clamped to 29 Feb 2028 (a leap year)
  ])('due %s: allowance ends %s (by hand; date-fns addMonths agrees)', (dueDate, expected) => {
    const result = mayCarryFilled({ filledOn: dueDate, nextDue: dueDate, today: dueDate, policy: ADR });
    expect(result).toEqual({ ok: true, carryUntil: expected });
    const [year, month, day] = dueDate.split('-').map(Number) as [number, number, number];
    expect(format(addMonths(new Date(year, month - 1, day), 3), 'yyyy-MM-dd')).toBe(expected);
  });

  test('49 CFR 180.352: filled before the due date, no time limit', () => {
    expect(mayCarryFilled({ filledOn: '2026-03-20', nextDue: '2026-03-31', today: '2027-12-31', policy: US_DOT_POLICY })).toEqual({
      ok: true,
      carryUntil: null,
    });
  });

  test('an allowance of 0 months: no carriage after the due date', () => {
    const noAllowance = { ...ADR, carriageAllowanceMonths: 0 };
    expect(mayCarryFilled({ filledOn: '2026-03-20', nextDue: '2026-03-31', today: '2026-03-31', policy: noAllowance })).toEqual({
      ok: true,
      carryUntil: '2026-03-31',
    });
    expect(mayCarryFilled({ filledOn: '2026-03-20', nextDue: '2026-03-31', today: '2026-04-01', policy: noAllowance })).toMatchObject({
      ok: false,
      reason: expect.stringContaining('no carriage is allowed'),
    });
  });
});

describe('policies and labels', () => {
  test('the ready-made policies are usable', () => {
    expect(policyProblems(DEFAULT_UN_POLICY)).toEqual([]);
    expect(policyProblems(US_DOT_POLICY)).toEqual([]);
  });

  test('a UN policy may not stretch the published intervals or the ADR allowance', () => {
    expect(policyProblems({ ...ADR, fullMonths: 72 })).toEqual(['UN-marked IBCs need the full inspection at least every 60 months']);
    expect(policyProblems({ ...ADR, carriageAllowanceMonths: 6 })).toEqual(['ADR allows at most 3 months of carriage after expiry']);
    expect(policyProblems({ ...ADR, kind: 'own', fullMonths: 72, carriageAllowanceMonths: 6 })).toEqual([]);
    expect(policyProblems({ ...ADR, kind: 'own', intermediateMonths: 0, bookingWindowDays: -1 })).toHaveLength(2);
  });

  test('labels follow the intervals', () => {
    expect(inspectionLabel('intermediate', ADR)).toBe('2.5-year');
    expect(inspectionLabel('full', ADR)).toBe('5-year');
    const ownPolicy: InspectionPolicy = { ...ADR, kind: 'own', intermediateMonths: 18, fullMonths: 24 };
    expect(inspectionLabel('intermediate', ownPolicy)).toBe('18-month');
    expect(inspectionLabel('full', ownPolicy)).toBe('2-year');
  });
});

describe('leakproofness test minimum (ADR/RID 6.5.6.7.3: at least 20 kPa gauge for at least 10 minutes)', () => {
  test('the published minimum', () => {
    expect(LEAK_TEST_MIN_KPA).toBe(20); // 6.5.6.7.3: 20 kPa (0.2 bar)
    expect(LEAK_TEST_MIN_MINUTES).toBe(10);
  });

  test('exactly the minimum is enough; less of either is refused, each on its own field', () => {
    expect(leakTestProblems({ pressureKpa: 20, minutes: 10 })).toEqual([]);
    expect(leakTestProblems({ pressureKpa: 25, minutes: 15 })).toEqual([]);
    expect(leakTestProblems({ pressureKpa: 19.9, minutes: 10 }).map((p) => p.field)).toEqual(['leakTestPressureKpa']);
    expect(leakTestProblems({ pressureKpa: 20, minutes: 9.5 }).map((p) => p.field)).toEqual(['leakTestMinutes']);
    expect(leakTestProblems({ pressureKpa: 10, minutes: 5 }).map((p) => p.field)).toEqual(['leakTestPressureKpa', 'leakTestMinutes']);
    // 0.2 bar = 20 kPa: a gauge read in bar and typed as 0.2 is far below and says so.
    expect(leakTestProblems({ pressureKpa: 0.2, minutes: 10 })[0]!.message).toMatch(/at least 20 kPa/);
    expect(leakTestProblems({ pressureKpa: Number.NaN, minutes: 10 })[0]!.message).toMatch(/Enter the gauge pressure/);
  });
});

describe('clocksRestartedBy: each clock only from the test that covers it (6.5.4.4.1, 6.5.4.4.2)', () => {
  const good = { pressureKpa: 20, minutes: 10, passed: true };
  test('literal table', () => {
    const rows: Array<[Parameters<typeof clocksRestartedBy>[0], { intermediate: boolean; full: boolean }]> = [
      [
        { kind: 'intermediate', outcome: 'pass', leakTest: good },
        { intermediate: true, full: false },
      ],
      [
        { kind: 'intermediate', outcome: 'pass', leakTest: null },
        { intermediate: false, full: false },
      ],
      [
        { kind: 'full', outcome: 'pass', leakTest: good },
        { intermediate: true, full: true },
      ],
      [
        { kind: 'full', outcome: 'pass', leakTest: null },
        { intermediate: false, full: true },
      ],
      [
        { kind: 'full', outcome: 'pass', leakTest: { ...good, passed: false } },
        { intermediate: false, full: true },
      ],
      [
        { kind: 'after_repair', outcome: 'pass', leakTest: good },
        { intermediate: true, full: false },
      ],
      [
        { kind: 'intermediate', outcome: 'pass', leakTest: { pressureKpa: 15, minutes: 10, passed: true } },
        { intermediate: false, full: false },
      ],
      [
        { kind: 'intermediate', outcome: 'pass', leakTest: { pressureKpa: 20, minutes: 5, passed: true } },
        { intermediate: false, full: false },
      ],
      [
        { kind: 'intermediate', outcome: 'fail', leakTest: good },
        { intermediate: false, full: false },
      ],
      [
        { kind: 'full', outcome: 'repair', leakTest: good },
        { intermediate: false, full: false },
      ],
      [
        { kind: 'prep_check', outcome: 'pass', leakTest: good },
        { intermediate: false, full: false },
      ],
    ];
    for (const [record, expected] of rows) expect(clocksRestartedBy(record), JSON.stringify(record)).toEqual(expected);
  });

  test('historyAfter moves only the restarted clocks; due dates follow (hand-worked, month ends and a leap day)', () => {
    const made = { manufactureMonth: '2021-08', lastIntermediateTestMonth: null, lastFullInspectionMonth: null };
    // 2.5-year test with a leakproofness test in 2023-08: 2023-08 + 30 = 2026-02 → 2026-02-28 (2026 not a leap year).
    const after = historyAfter(made, { kind: 'intermediate', outcome: 'pass', leakTest: good, month: '2023-08' });
    expect(after).toEqual({ manufactureMonth: '2021-08', lastIntermediateTestMonth: '2023-08', lastFullInspectionMonth: null });
    expect(nextDue(after, ADR).intermediateDue).toBe('2026-02-28');
    // 5-year inspection alone in 2026-02: the 5-year clock 2026-02 + 60 = 2031-02 → 2031-02-28; 2.5-year unchanged.
    const full = historyAfter(after, { kind: 'full', outcome: 'pass', leakTest: null, month: '2026-02' });
    expect(nextDue(full, ADR)).toMatchObject({ intermediateDue: '2026-02-28', fullDue: '2031-02-28' });
    // The next leakproofness test in 2025-08 (done early): 2025-08 + 30 = 2028-02 → 2028-02-29 (2028 is a leap year).
    const early = historyAfter(made, { kind: 'intermediate', outcome: 'pass', leakTest: good, month: '2025-08' });
    expect(nextDue(early, ADR).intermediateDue).toBe('2028-02-29');
    expect(dfDueDate('2025-08', 30)).toBe('2028-02-29'); // date-fns agrees
    // A record entered late, for a test older than the clock's last one, does not move the clock back.
    expect(historyAfter(after, { kind: 'intermediate', outcome: 'pass', leakTest: good, month: '2023-02' })).toEqual(after);
    // A fail restarts nothing.
    expect(historyAfter(after, { kind: 'intermediate', outcome: 'fail', leakTest: good, month: '2025-01' })).toEqual(after);
    expect(() => historyAfter(after, { kind: 'full', outcome: 'pass', leakTest: null, month: '2025-1' })).toThrow(RangeError);
  });

  test('date-fns second opinion: after any passing test month, each restarted clock is 30 / 60 months on', () => {
    const month = fc
      .record({ year: fc.integer({ min: 1990, max: 2120 }), month: fc.integer({ min: 1, max: 12 }) })
      .map(({ year, month }) => `${year}-${String(month).padStart(2, '0')}`);
    fc.assert(
      fc.property(month, fc.integer({ min: 0, max: 70 }), fc.boolean(), fc.boolean(), (made, later, full, withLeak) => {
        const tested = format(addMonths(new Date(`${made}-01T12:00:00`), later), 'yyyy-MM');
        const h = historyAfter({ manufactureMonth: made }, { kind: full ? 'full' : 'intermediate', outcome: 'pass', leakTest: withLeak ? good : null, month: tested });
        const due = nextDue(h, ADR);
        expect(due.intermediateDue).toBe(dfDueDate(withLeak ? tested : made, 30));
        expect(due.fullDue).toBe(dfDueDate(full ? tested : made, 60));
      }),
      { numRuns: 1000 },
    );
  });
});
