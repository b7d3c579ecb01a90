/**
 * What an inspection record must hold before it is written, and the mark to apply after a pass. Pure.
 *
 *   CHECKLIST[kind]                      → the items to answer for that kind (key, label)
 *   leakTestRequired(kind)               → is the leakproofness test part of this kind?
 *   inspectionProblems(record, today)    → [{ field, message }] (empty when it can be recorded)
 *   testMark(performedOn, mark)          → "Tested 12 26 · JD" — month and two-digit year, as marks are made
 *
 * Sources: ADR/RID 6.5.4.4.1 [published] — the 2.5-year inspection covers external condition and service
 * equipment; the 5-year one adds design-type conformity including the marks, and internal condition.
 * 6.5.4.4.2 [secondary] — IBCs for liquids get a leakproofness test at least every 2.5 years, so it is part of
 * the 2.5-year inspection here; with a 5-year inspection it is optional (without it only the 5-year clock
 * restarts). 6.5.6.7.3 [published] — at least 20 kPa gauge for at least 10 minutes. After a repair the
 * leakproofness test and the condition checks are done again before the bin goes back in service (common
 * practice; 49 CFR 180.352 counts the test interval from a qualifying repair [published]).
 * Marks carry month and year (6.5.2.1 [published]); the two-digit month and year format "MM YY" follows the
 * published examples of 6.5.2.1.2 ("02 99"). The inspector's own mark beside it is this product's choice.
 */
import { isLocalDate, type LocalDate } from '@/lib/calendar';
import { leakTestProblems, type RecordedKind, type TestOutcome } from './inspection-due';

export type PeriodicKind = Exclude<RecordedKind, 'prep_check'>;
export const PERIODIC_KINDS: readonly PeriodicKind[] = ['intermediate', 'full', 'after_repair'];

const EXTERNAL = { key: 'externalCondition', label: 'External condition: no damage, corrosion, cracks or deformation that impairs it' } as const;
const EQUIPMENT = { key: 'serviceEquipment', label: 'Service equipment works: valve, closures, gaskets, frame locks' } as const;
const MARKS = { key: 'markingLegible', label: 'Marks legible and complete' } as const;
const DESIGN = { key: 'designTypeConformity', label: 'Conforms to its design type, marks included' } as const;
const INTERNAL = { key: 'internalCondition', label: 'Internal condition: inner walls and floor sound' } as const;

export const CHECKLIST: Record<PeriodicKind, ReadonlyArray<{ key: string; label: string }>> = {
  intermediate: [EXTERNAL, EQUIPMENT, MARKS],
  full: [EXTERNAL, EQUIPMENT, MARKS, DESIGN, INTERNAL],
  after_repair: [EXTERNAL, EQUIPMENT, MARKS, INTERNAL],
};

export const KIND_LABELS: Record<RecordedKind, string> = {
  prep_check: 'Prep check',
  intermediate: '2.5-year inspection with leakproofness test',
  full: '5-year inspection',
  after_repair: 'Test after repair',
};

export const OUTCOME_LABELS: Record<TestOutcome, string> = { pass: 'Pass', repair: 'Needs repair', fail: 'Fail' };

export function leakTestRequired(kind: PeriodicKind): boolean {
  return kind !== 'full';
}

export interface InspectionDraft {
  kind: PeriodicKind;
  performedOn: LocalDate;
  checklist: Record<string, boolean>;
  leakTest: { pressureKpa: number; minutes: number; passed: boolean } | null;
  outcome: TestOutcome;
  inspectorId: number | null;
  inspectionBody: string | null;
  remarks: string | null;
}

export type DraftField = 'kind' | 'performedOn' | 'checklist' | 'leakTest' | 'leakTestPressureKpa' | 'leakTestMinutes' | 'outcome' | 'inspector' | 'remarks';
export interface DraftProblem {
  field: DraftField;
  message: string;
}

/** Everything that keeps a draft from being recorded, in words for the person at the test bench. */
export function inspectionProblems(d: InspectionDraft, today: LocalDate, manufactureMonth?: string): DraftProblem[] {
  const problems: DraftProblem[] = [];
  if (!PERIODIC_KINDS.includes(d.kind)) return [{ field: 'kind', message: 'Choose the kind of inspection.' }];
  if (!isLocalDate(d.performedOn)) problems.push({ field: 'performedOn', message: 'Enter the day of the inspection.' });
  else if (d.performedOn > today) problems.push({ field: 'performedOn', message: 'The inspection day cannot be in the future.' });
  else if (manufactureMonth && d.performedOn.slice(0, 7) < manufactureMonth)
    problems.push({ field: 'performedOn', message: `The bin was made in ${manufactureMonth}; the inspection cannot be earlier.` });
  const items = CHECKLIST[d.kind];
  const unanswered = items.filter((i) => typeof d.checklist[i.key] !== 'boolean');
  if (unanswered.length) problems.push({ field: 'checklist', message: `Answer every item of the checklist (${unanswered.length} left).` });
  const failedItems = items.filter((i) => d.checklist[i.key] === false);
  if (d.leakTest === null) {
    if (leakTestRequired(d.kind)) problems.push({ field: 'leakTest', message: 'This inspection includes the leakproofness test: enter its pressure, time and result.' });
  } else {
    problems.push(...leakTestProblems(d.leakTest));
    if (typeof d.leakTest.passed !== 'boolean') problems.push({ field: 'leakTest', message: 'Say whether the leakproofness test passed.' });
  }
  if (d.outcome === 'pass') {
    if (failedItems.length)
      problems.push({ field: 'outcome', message: `A bin with a failed item (${failedItems[0]!.label.split(':')[0]}) cannot pass: choose needs repair or fail.` });
    if (d.leakTest && d.leakTest.passed === false)
      problems.push({ field: 'outcome', message: 'The leakproofness test failed, so the inspection cannot pass: choose needs repair or fail.' });
  } else if (!['repair', 'fail'].includes(d.outcome)) {
    problems.push({ field: 'outcome', message: 'Choose pass, needs repair or fail.' });
  } else if (!d.remarks?.trim()) {
    problems.push({ field: 'remarks', message: 'Say what was found, so the repair can start from it.' });
  }
  const body = d.inspectionBody?.trim() ?? '';
  if (d.inspectorId === null && body.length < 2) problems.push({ field: 'inspector', message: 'Name the inspector: a qualified person here, or the outside inspection body.' });
  if (d.inspectorId !== null && body.length > 0) problems.push({ field: 'inspector', message: 'Name either a qualified person here or an outside inspection body, not both.' });
  return problems;
}

/** The mark to apply after a pass: month and two-digit year of the test, and who tested it. */
export function testMark(performedOn: LocalDate, mark: string): string {
  if (!isLocalDate(performedOn)) throw new RangeError(`Not a date: ${performedOn}`);
  return `${performedOn.slice(5, 7)} ${performedOn.slice(2, 4)} · ${mark}`;
}

/** An inspector's mark from a name: the initials, "Jana de Vries" → "JDV". An outside body's mark is its name. */
export function initialsOf(name: string): string {
  const letters = name
    .trim()
    .split(/\s+/)
    .map((w) => w[0]!.toUpperCase())
    .join('');
  return letters.slice(0, 4) || '?';
}
