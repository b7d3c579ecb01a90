/**
 * Periodic inspection and test schedule of IBCs, and the lapse rules that follow from it.
 *
 *   DEFAULT_UN_POLICY, US_DOT_POLICY             ready-made policies (below)
 *   policyProblems(policy)                       → string[]  (empty when the policy is usable)
 *   nextDue(history, policy)                     → { intermediateDue, fullDue, nextDue, nextKind }
 *   leakTestProblems(test)                       → [{ field, message }] (empty when the test meets 6.5.6.7.3)
 *   clocksRestartedBy(record)                    → { intermediate, full }: which clocks a recorded test restarts
 *   historyAfter(history, record)                → the history with the clocks that record restarts moved on
 *   inspectionLabel(kind, policy)                → "2.5-year" | "5-year" | "18-month" …
 *   testStatus(due, today, soonWithinDays = DUE_SOON_DAYS) → 'ok' | 'due_soon' | 'overdue'
 *   testDueSoonSql(dueColumn, today)             → testStatus(...) = 'due_soon' as SQL (fleet grid, digest)
 *   bookingWindowOpensOn(due, policy)            → first day the operator should book the test
 *   mayFillAndDispatch(dueDates, today, policy?) → { ok: true } | { ok: false, lapsedOn, reason }
 *   mayCarryFilled({ filledOn, nextDue, today, policy })
 *                                                → { ok: true, carryUntil } | { ok: false, lapsedOn, reason }
 *
 * What is published and what is this module's own reading:
 * - Published (UN Model Regulations / ADR / RID 6.5.4.4.1–2; US 49 CFR 180.352): inspections at intervals of
 *   no more than 2.5 years (external condition, service equipment, leakproofness for liquids) and no more than
 *   5 years (adds design-type conformity, marks and internal condition), counted from manufacture or from the
 *   last test. Marks carry month and year only (6.5.2.1), so intervals run from a month, not a day.
 * - Published (ADR 4.1.2.2): an IBC may not be filled and offered for carriage after its last periodic test
 *   or inspection has expired; one filled before expiry may be carried for up to 3 months after expiry.
 *   49 CFR 180.352 lets an IBC filled before its due date be transported with no such limit.
 * - Policy (end-of-month reading): a test "due in" a month may be done up to and including that month's last
 *   day. Due month = month of manufacture or of the test actually done + 30 (or 60) months. A stricter reader
 *   could stop at the end of the month before; this module does not.
 * - Policy: the next due date always runs from the test actually done, even when it was done early; no
 *   provision was found that lets an early test keep the old schedule.
 * - Each clock restarts only from the test that covers it. The 2.5-year clock of an IBC for liquids is the
 *   leakproofness test (6.5.4.4.2) with the external inspection: it restarts only from an inspection (of any
 *   kind) done with a passing leakproofness test at no less than 20 kPa gauge for no less than 10 minutes
 *   (6.5.6.7.3). The 5-year clock restarts only from a passed 5-year inspection (6.5.4.4.1(a): design type,
 *   marks, internal condition). A 5-year inspection done without a leakproofness test restarts the 5-year
 *   clock only; an after-repair test with one restarts the 2.5-year clock only (this module's reading).
 * - Policy: "up to 3 months after expiry" is counted from the due date by calendar months, clamped to the
 *   end of a shorter month (31 Mar + 3 months = 30 Jun; 28 Feb + 3 months = 28 May): the shorter reading.
 * - Not modelled here: an empty IBC travelling to its test after expiry (4.1.2.2 allows it) and the 5-year
 *   service life of rigid-plastics inner receptacles (ADR 4.1.1.15).
 */
import { addDays, addMonthsToDate, addMonthsToMonth, daysBetween, endOfMonth, isYearMonth } from '@/lib/calendar';
import type { LocalDate, YearMonth } from '@/lib/calendar';

export type InspectionKind = 'intermediate' | 'full';

export interface InspectionPolicy {
  /** 'un': a UN-marked IBC under the dangerous-goods rules; 'own': the operator's schedule for other bins. */
  kind: 'un' | 'own';
  /** 2.5-year inspection and leakproofness test: 30 months for UN-marked IBCs. */
  intermediateMonths: number;
  /** 5-year inspection: 60 months for UN-marked IBCs. */
  fullMonths: number;
  /**
   * How long an IBC filled before expiry may still be carried after it: 3 months under ADR/RID 4.1.2.2,
   * 'unlimited' under 49 CFR 180.352, 0 when a filled bin must not travel at all past its due date.
   */
  carriageAllowanceMonths: number | 'unlimited';
  /** Days before a due date when the booking aid starts reminding the operator (a practice, not a rule). */
  bookingWindowDays: number;
}

/** ADR/RID and UN Model Regulations. The 30-day booking window is common practice, not a rule. */
export const DEFAULT_UN_POLICY: Readonly<InspectionPolicy> = Object.freeze({
  kind: 'un',
  intermediateMonths: 30,
  fullMonths: 60,
  carriageAllowanceMonths: 3,
  bookingWindowDays: 30,
});

/** US 49 CFR 180.352: same intervals, no time limit on carrying a bin filled before its due date. */
export const US_DOT_POLICY: Readonly<InspectionPolicy> = Object.freeze({
  ...DEFAULT_UN_POLICY,
  carriageAllowanceMonths: 'unlimited',
});

const UN_MAX_INTERMEDIATE_MONTHS = 30;
const UN_MAX_FULL_MONTHS = 60;
const ADR_CARRIAGE_ALLOWANCE_MONTHS = 3;

function isPositiveWhole(value: number): boolean {
  return Number.isInteger(value) && value > 0;
}

/** Everything wrong with a policy, in words an admin can act on; [] when it is usable. */
export function policyProblems(policy: InspectionPolicy): string[] {
  const problems: string[] = [];
  if (!isPositiveWhole(policy.intermediateMonths)) problems.push('the intermediate (2.5-year) interval must be a whole number of months above 0');
  if (!isPositiveWhole(policy.fullMonths)) problems.push('the full (5-year) interval must be a whole number of months above 0');
  if (policy.intermediateMonths > policy.fullMonths) problems.push('the intermediate interval cannot be longer than the full one');
  const allowance = policy.carriageAllowanceMonths;
  if (allowance !== 'unlimited' && !(Number.isInteger(allowance) && allowance >= 0)) {
    problems.push('the carriage allowance must be a whole number of months (0 or more) or unlimited');
  }
  if (!(Number.isInteger(policy.bookingWindowDays) && policy.bookingWindowDays >= 0)) {
    problems.push('the booking window must be a whole number of days (0 or more)');
  }
  if (policy.kind === 'un') {
    if (policy.intermediateMonths > UN_MAX_INTERMEDIATE_MONTHS) problems.push('UN-marked IBCs need the intermediate inspection at least every 30 months');
    if (policy.fullMonths > UN_MAX_FULL_MONTHS) problems.push('UN-marked IBCs need the full inspection at least every 60 months');
    if (typeof allowance === 'number' && allowance > ADR_CARRIAGE_ALLOWANCE_MONTHS) {
      problems.push('ADR allows at most 3 months of carriage after expiry');
    }
  }
  return problems;
}

export interface InspectionHistory {
  /** Month and year of manufacture, as marked on the IBC. */
  manufactureMonth: YearMonth;
  /**
   * Month of the last inspection done with a passing leakproofness test (a 2.5-year one, or a 5-year or
   * after-repair one that included the test), if any: the 2.5-year clock runs from it.
   */
  lastIntermediateTestMonth?: YearMonth | null;
  /** Month of the last 5-year inspection, if any. */
  lastFullInspectionMonth?: YearMonth | null;
}

export interface DueDates {
  intermediateDue: LocalDate;
  fullDue: LocalDate;
  /** The earlier of the two; the date after which the bin may not be filled. */
  nextDue: LocalDate;
  /** 'full' when the 5-year inspection falls due first or together with the 2.5-year one. */
  nextKind: InspectionKind;
}

function laterMonth(a: YearMonth, b: YearMonth | null | undefined): YearMonth {
  return b != null && b > a ? b : a;
}

function checkedTestMonth(label: string, month: YearMonth | null | undefined, manufactureMonth: YearMonth): YearMonth | null {
  if (month == null) return null;
  if (!isYearMonth(month)) throw new RangeError(`${label} is not a month (YYYY-MM): ${JSON.stringify(month)}`);
  if (month < manufactureMonth) throw new RangeError(`${label} ${month} is before manufacture ${manufactureMonth}`);
  return month;
}

/** Due dates from manufacture and the tests actually done (see the conventions at the top). */
export function nextDue(history: InspectionHistory, policy: InspectionPolicy): DueDates {
  const problems = policyProblems(policy);
  if (problems.length > 0) throw new RangeError(`Unusable inspection policy: ${problems.join('; ')}`);
  const made = history.manufactureMonth;
  if (!isYearMonth(made)) throw new RangeError(`Manufacture month is not a month (YYYY-MM): ${JSON.stringify(made)}`);
  const lastIntermediate = checkedTestMonth('Last 2.5-year test', history.lastIntermediateTestMonth, made);
  const lastFull = checkedTestMonth('Last 5-year inspection', history.lastFullInspectionMonth, made);

  // Each clock from the test that covers it (see the top): a 5-year inspection alone leaves the 2.5-year clock.
  const fullClockStart = laterMonth(made, lastFull);
  const intermediateClockStart = laterMonth(made, lastIntermediate);

  const intermediateDue = endOfMonth(addMonthsToMonth(intermediateClockStart, policy.intermediateMonths));
  const fullDue = endOfMonth(addMonthsToMonth(fullClockStart, policy.fullMonths));
  return dueDatesOf(intermediateDue, fullDue);
}

/** ADR/RID 6.5.6.7.3: the leakproofness test is done at a gauge pressure of at least 20 kPa (0.2 bar) ... */
export const LEAK_TEST_MIN_KPA = 20;
/** ... for at least 10 minutes. */
export const LEAK_TEST_MIN_MINUTES = 10;

export interface LeakTest {
  /** Gauge pressure held, in kPa. */
  pressureKpa: number;
  /** How long it was held, in minutes. */
  minutes: number;
  /** No air leakage seen over the whole time. */
  passed: boolean;
}

export interface FieldProblem {
  field: 'leakTestPressureKpa' | 'leakTestMinutes';
  message: string;
}

/**
 * What keeps a leakproofness test from counting (ADR/RID 6.5.6.7.3): less than 20 kPa gauge or less than
 * 10 minutes. A test below the minimum is not a leakproofness test at all, so the form refuses it rather than
 * recording it as a fail. Whether it passed is the `passed` flag, checked by clocksRestartedBy().
 */
export function leakTestProblems(test: Pick<LeakTest, 'pressureKpa' | 'minutes'>): FieldProblem[] {
  const problems: FieldProblem[] = [];
  if (typeof test.pressureKpa !== 'number' || !Number.isFinite(test.pressureKpa)) {
    problems.push({ field: 'leakTestPressureKpa', message: 'Enter the gauge pressure held, in kPa.' });
  } else if (test.pressureKpa < LEAK_TEST_MIN_KPA) {
    problems.push({ field: 'leakTestPressureKpa', message: `The test pressure must be at least ${LEAK_TEST_MIN_KPA} kPa gauge (0.2 bar); ${test.pressureKpa} kPa is not enough.` });
  }
  if (typeof test.minutes !== 'number' || !Number.isFinite(test.minutes)) {
    problems.push({ field: 'leakTestMinutes', message: 'Enter how long the pressure was held, in minutes.' });
  } else if (test.minutes < LEAK_TEST_MIN_MINUTES) {
    problems.push({ field: 'leakTestMinutes', message: `The pressure must be held for at least ${LEAK_TEST_MIN_MINUTES} minutes; ${test.minutes} is not enough.` });
  }
  return problems;
}

/** The kinds of record an inspection can be: the prep check before lining, the two periodic ones, and the test after a repair. */
export type RecordedKind = 'prep_check' | 'intermediate' | 'full' | 'after_repair';
export type TestOutcome = 'pass' | 'repair' | 'fail';

export interface TestRecord {
  kind: RecordedKind;
  outcome: TestOutcome;
  /** The leakproofness test done with it, or null when none was done. */
  leakTest: LeakTest | null;
}

/** Which clocks a recorded test restarts (see the top): only a pass counts, and each clock only from the test covering it. */
export function clocksRestartedBy(record: TestRecord): { intermediate: boolean; full: boolean } {
  if (record.outcome !== 'pass' || record.kind === 'prep_check') return { intermediate: false, full: false };
  const t = record.leakTest;
  const leakTestCounts = t !== null && t.passed && leakTestProblems(t).length === 0;
  return { intermediate: leakTestCounts, full: record.kind === 'full' };
}

/** The history after a test done in `month`: the clocks it restarts move to that month (never backwards), the others stay. */
export function historyAfter(history: InspectionHistory, record: TestRecord & { month: YearMonth }): InspectionHistory {
  if (!isYearMonth(record.month)) throw new RangeError(`Test month is not a month (YYYY-MM): ${JSON.stringify(record.month)}`);
  const restarted = clocksRestartedBy(record);
  // A record entered late, for a test older than the clock's last one, never moves that clock backwards.
  const moves = (last: YearMonth | null | undefined) => last == null || record.month >= last;
  const lastIntermediate = history.lastIntermediateTestMonth ?? null;
  const lastFull = history.lastFullInspectionMonth ?? null;
  return {
    manufactureMonth: history.manufactureMonth,
    lastIntermediateTestMonth: restarted.intermediate && moves(lastIntermediate) ? record.month : lastIntermediate,
    lastFullInspectionMonth: restarted.full && moves(lastFull) ? record.month : lastFull,
  };
}

/** The name of an inspection as the yard says it: 30 months → "2.5-year", 60 → "5-year", 18 → "18-month". */
export function inspectionLabel(kind: InspectionKind, policy: Pick<InspectionPolicy, 'intermediateMonths' | 'fullMonths'>): string {
  const months = kind === 'full' ? policy.fullMonths : policy.intermediateMonths;
  const wholeOrHalfYears = months % 12 === 0 || (months % 6 === 0 && months > 24);
  return wholeOrHalfYears ? `${months / 12}-year` : `${months}-month`;
}

export type TestStatus = 'ok' | 'due_soon' | 'overdue';

/**
 * How many days ahead a periodic test counts as "due soon": the bin page, the fleet grid's flag, the yard's list
 * and the planners' digest all use this one number (a month to book the test: common practice, not a rule).
 */
export const DUE_SOON_DAYS = 30;

/** 'overdue' after the due date; 'due_soon' from `soonWithinDays` before it up to and including the due date. */
export function testStatus(due: LocalDate, today: LocalDate, soonWithinDays = DUE_SOON_DAYS): TestStatus {
  const daysLeft = daysBetween(today, due);
  if (daysLeft < 0) return 'overdue';
  return daysLeft <= soonWithinDays ? 'due_soon' : 'ok';
}

/**
 * testStatus(due, today) = 'due_soon' as SQL: `dueColumn` (a DATE) from today up to DUE_SOON_DAYS ahead, both
 * included; `today` is an SQL expression of type date. Checked against testStatus() in
 * tests/integration/fleet/due-soon-drift.test.ts.
 */
export function testDueSoonSql(dueColumn: string, today: string): string {
  return `${dueColumn} BETWEEN ${today} AND ${today} + ${DUE_SOON_DAYS}`;
}

/** A booking aid only: booking early never moves the due date; the next one runs from the test done. */
export function bookingWindowOpensOn(due: LocalDate, policy: InspectionPolicy): LocalDate {
  return addDays(due, -policy.bookingWindowDays);
}

/** Which inspection puts a lapsed bin back in service: past the 5-year date as well, only the full one. */
export function inspectionNeeded(due: Pick<DueDates, 'nextKind' | 'fullDue'>, today: LocalDate): InspectionKind {
  return due.nextKind === 'full' || today > due.fullDue ? 'full' : 'intermediate';
}

/** The two due dates as a bin row stores them, read back into DueDates (the earlier one is next; a tie is 'full'). */
export function dueDatesOf(intermediateDue: LocalDate, fullDue: LocalDate): DueDates {
  return fullDue <= intermediateDue
    ? { intermediateDue, fullDue, nextDue: fullDue, nextKind: 'full' }
    : { intermediateDue, fullDue, nextDue: intermediateDue, nextKind: 'intermediate' };
}

export type LapseCheck = { ok: true } | { ok: false; lapsedOn: LocalDate; reason: string };

/** ADR 4.1.2.2 / 49 CFR 180.352: no filling and dispatch once the periodic test or inspection has lapsed. */
export function mayFillAndDispatch(due: DueDates, today: LocalDate, policy: InspectionPolicy = DEFAULT_UN_POLICY): LapseCheck {
  if (today <= due.nextDue) return { ok: true };
  const needed = inspectionNeeded(due, today);
  return {
    ok: false,
    lapsedOn: due.nextDue,
    reason: `periodic test lapsed on ${due.nextDue}; book a ${inspectionLabel(needed, policy)} inspection`,
  };
}

export interface CarryCheckInput {
  filledOn: LocalDate;
  nextDue: LocalDate;
  today: LocalDate;
  policy: InspectionPolicy;
}

export type CarryCheck =
  /** carryUntil: last day a bin filled before expiry may still travel; null when there is no limit. */
  { ok: true; carryUntil: LocalDate | null } | { ok: false; lapsedOn: LocalDate; reason: string };

/** May a filled bin travel today? Filled before expiry: yes, within the policy's carriage allowance. */
export function mayCarryFilled({ filledOn, nextDue, today, policy }: CarryCheckInput): CarryCheck {
  if (filledOn > nextDue) {
    return {
      ok: false,
      lapsedOn: nextDue,
      reason: `filled on ${filledOn}, after the periodic test lapsed on ${nextDue}; it may not be offered for carriage`,
    };
  }
  const allowance = policy.carriageAllowanceMonths;
  const carryUntil = allowance === 'unlimited' ? null : addMonthsToDate(nextDue, allowance);
  if (carryUntil === null || today <= carryUntil) return { ok: true, carryUntil };
  const allowed = allowance === 0 ? 'no carriage is allowed' : `carriage was allowed until ${carryUntil}`;
  return {
    ok: false,
    lapsedOn: nextDue,
    reason: `periodic test lapsed on ${nextDue} and ${allowed}; discharge the bin and book its inspection`,
  };
}
