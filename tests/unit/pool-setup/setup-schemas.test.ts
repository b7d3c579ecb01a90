// The set-up forms' rules, without a database.
import { describe, test, expect } from 'vitest';
import { binTypeCreateSchema, binTypeProblems, positionProblems, siteCreateSchema, sitePatchSchema, siteOwnerKind } from '@/lib/pool-setup/setup-schemas';

const ok = {
  code: 'FX1000',
  name: 'Folding IBC 1000 L',
  graiAssetType: '10010',
  nominalCapacityL: 1000,
  tareKg: 86,
  maxGrossKg: 1285,
  footprintLengthMm: 1200,
  footprintWidthMm: 1000,
  heightErectedMm: 1160,
  heightFoldedMm: 380,
  unCode: '31HA1',
  policyKind: 'un' as const,
  intermediateMonths: 30,
  fullMonths: 60,
};
const paths = (r: { success: boolean; error?: { issues: { path: (string | number)[] }[] } }) => r.error?.issues.map((i) => i.path.join('.')) ?? [];

describe('bin type', () => {
  test('a complete type passes', () => {
    expect(binTypeCreateSchema.safeParse(ok).success).toBe(true);
  });
  // ADR 2025, 6.5.4.4.1: every IBC for dangerous goods is inspected at least every 5 years (a) and
  // every 2.5 years (b); 30 and 60 months are the longest intervals a UN-marked type may carry.
  test('UN-marked: intermediate at most 30 months, full at most 60 (ADR 6.5.4.4.1)', () => {
    expect(binTypeProblems({ ...ok, intermediateMonths: 30, fullMonths: 60 })).toEqual([]);
    expect(binTypeProblems({ ...ok, intermediateMonths: 31 }).map((p) => p.path)).toContain('intermediateMonths');
    expect(binTypeProblems({ ...ok, fullMonths: 61 }).map((p) => p.path)).toEqual(['fullMonths']);
    // the operator's own policy for bins outside the dangerous-goods rules may be longer
    expect(binTypeProblems({ ...ok, unCode: null, policyKind: 'own', intermediateMonths: 36, fullMonths: 72 })).toEqual([]);
  });
  test('the UN policy needs a UN code', () => {
    expect(binTypeProblems({ ...ok, unCode: null }).map((p) => p.path)).toEqual(['unCode']);
  });
  // ADR 6.5.1.4.3 assigns 31HA1 (composite, rigid plastics inner, steel outer, liquids) and 11A
  // (steel, solids by gravity); "31HZ9" is no assigned code.
  test('UN codes are those ADR 6.5.1.4.3 assigns, written in capitals', () => {
    expect(binTypeCreateSchema.parse({ ...ok, unCode: '31ha1' }).unCode).toBe('31HA1');
    expect(binTypeCreateSchema.safeParse({ ...ok, unCode: '11A' }).success).toBe(true);
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, unCode: '31HZ9' }))).toEqual(['unCode']);
  });
  test('mass and height hold together: gross above tare, folded below erected', () => {
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, maxGrossKg: 86 }))).toEqual(['maxGrossKg']);
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, heightFoldedMm: 1160 }))).toEqual(['heightFoldedMm']);
  });
  test('numbers as numbers; one decimal of a kilogram; a control character refused', () => {
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, nominalCapacityL: '1000' }))).toEqual(['nominalCapacityL']);
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, tareKg: 86.25 }))).toEqual(['tareKg']);
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, name: 'Bin\u0007' }))).toEqual(['name']);
    expect(paths(binTypeCreateSchema.safeParse({ ...ok, extra: 1 }))).toEqual(['']);
  });
});

describe('site', () => {
  const site = { organisationId: 1, code: 'dep-north', name: 'North depot', kind: 'depot', latitude: 53.2, longitude: 6.56 };
  test('the code is written in capitals; coordinates come as a pair', () => {
    expect(siteCreateSchema.parse(site).code).toBe('DEP-NORTH');
    expect(siteCreateSchema.safeParse({ ...site, latitude: null, longitude: null }).success).toBe(true);
    expect(paths(siteCreateSchema.safeParse({ ...site, longitude: null }))).toEqual(['longitude']);
    expect(paths(siteCreateSchema.safeParse({ ...site, longitude: 181 }))).toEqual(['longitude']);
    expect(paths(siteCreateSchema.safeParse({ ...site, code: 'north depot' }))).toEqual(['code']);
  });
  test('an edit names only what changes (the pair is checked on the merged row)', () => {
    expect(sitePatchSchema.safeParse({ version: 0, latitude: 52 }).success).toBe(true);
    expect(paths(sitePatchSchema.safeParse({ version: 0, latitude: 95 }))).toEqual(['latitude']);
    expect(sitePatchSchema.safeParse({ version: 0, name: 'Renamed' }).success).toBe(true);
    expect(positionProblems({ latitude: 52, longitude: null }).map((p) => p.path)).toEqual(['longitude']);
    expect(positionProblems({ latitude: null, longitude: null })).toEqual([]);
  });
  test('who owns which kind', () => {
    expect(['depot', 'repair', 'recycling', 'customer'].map((k) => siteOwnerKind(k as 'depot'))).toEqual(['operator', 'operator', 'operator', 'customer']);
  });
});
