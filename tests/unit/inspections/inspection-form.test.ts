// Checks inspection-form.ts: the checklist per kind follows ADR/RID 6.5.4.4.1 [published] (2.5-year: external
// condition and service equipment; 5-year adds design type incl. marks and internal condition); the
// leakproofness test belongs to the 2.5-year inspection (6.5.4.4.2 [secondary]) and its minimum is 6.5.6.7.3
// [published]; marks carry month and year as "MM YY" (6.5.2.1.2 examples [published]).
import { describe, test, expect } from 'vitest';
import { CHECKLIST, inspectionProblems, leakTestRequired, testMark, initialsOf, type InspectionDraft } from '@/lib/inspections/inspection-form';

const allTrue = (kind: InspectionDraft['kind']) => Object.fromEntries(CHECKLIST[kind].map((i) => [i.key, true]));
const draft = (over: Partial<InspectionDraft> = {}): InspectionDraft => ({
  kind: 'intermediate',
  performedOn: '2026-12-03',
  checklist: allTrue('intermediate'),
  leakTest: { pressureKpa: 20, minutes: 10, passed: true },
  outcome: 'pass',
  inspectorId: 7,
  inspectionBody: null,
  remarks: null,
  ...over,
});
const fields = (d: InspectionDraft) => inspectionProblems(d, '2026-12-03', '2024-01').map((p) => p.field);

describe('checklist per kind (6.5.4.4.1)', () => {
  test('the items', () => {
    expect(CHECKLIST.intermediate.map((i) => i.key)).toEqual(['externalCondition', 'serviceEquipment', 'markingLegible']);
    expect(CHECKLIST.full.map((i) => i.key)).toEqual(['externalCondition', 'serviceEquipment', 'markingLegible', 'designTypeConformity', 'internalCondition']);
    expect(leakTestRequired('intermediate')).toBe(true);
    expect(leakTestRequired('after_repair')).toBe(true);
    expect(leakTestRequired('full')).toBe(false);
  });
});

describe('inspectionProblems', () => {
  test('a complete 2.5-year pass at exactly the minimum is fine', () => {
    expect(fields(draft())).toEqual([]);
  });
  test('below the leakproofness minimum (6.5.6.7.3) is refused on its field', () => {
    expect(fields(draft({ leakTest: { pressureKpa: 19, minutes: 10, passed: true } }))).toEqual(['leakTestPressureKpa']);
    expect(fields(draft({ leakTest: { pressureKpa: 20, minutes: 9, passed: true } }))).toEqual(['leakTestMinutes']);
  });
  test('the 2.5-year inspection needs its leakproofness test; a 5-year one may go without', () => {
    expect(fields(draft({ leakTest: null }))).toEqual(['leakTest']);
    expect(fields(draft({ kind: 'full', checklist: allTrue('full'), leakTest: null }))).toEqual([]);
  });
  test('every item answered; a failed item or a failed leak test cannot pass', () => {
    expect(fields(draft({ kind: 'full' }))).toEqual(['checklist']);
    expect(fields(draft({ checklist: { ...allTrue('intermediate'), serviceEquipment: false } }))).toEqual(['outcome']);
    expect(fields(draft({ leakTest: { pressureKpa: 20, minutes: 10, passed: false } }))).toEqual(['outcome']);
    expect(fields(draft({ outcome: 'repair', leakTest: { pressureKpa: 20, minutes: 10, passed: false }, remarks: 'Valve seat leaks at 20 kPa' }))).toEqual([]);
  });
  test('a repair or fail says what was found', () => {
    expect(fields(draft({ outcome: 'fail' }))).toEqual(['remarks']);
  });
  test('the inspector: a qualified person or an outside body, one of them', () => {
    expect(fields(draft({ inspectorId: null }))).toEqual(['inspector']);
    expect(fields(draft({ inspectorId: null, inspectionBody: 'Testing body North' }))).toEqual([]);
    expect(fields(draft({ inspectionBody: 'Testing body North' }))).toEqual(['inspector']);
  });
  test('the day: not in the future, not before manufacture', () => {
    expect(fields(draft({ performedOn: '2026-12-04' }))).toEqual(['performedOn']);
    expect(fields(draft({ performedOn: '2023-12-31' }))).toEqual(['performedOn']);
    expect(fields(draft({ performedOn: '2026-02-30' }))).toEqual(['performedOn']);
  });
});

describe('testMark (month and two-digit year, 6.5.2.1)', () => {
  test('literal', () => {
    expect(testMark('2026-12-03', 'JDV')).toBe('12 26 · JDV');
    expect(testMark('2028-02-29', 'AB')).toBe('02 28 · AB');
    expect(initialsOf('Jana de Vries')).toBe('JDV');
    expect(initialsOf('  Piet  ')).toBe('P');
  });
});
