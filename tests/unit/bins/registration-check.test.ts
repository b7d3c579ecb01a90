import { describe, test, expect } from 'vitest';
import { checkBinType, checkDepot, checkMarkAgainstType, checkRegistration, graiFromSerial, normaliseMonth, testColumns, testMonthsOf } from '@/lib/bins/registration-check';

// EPC Tag Data Standard translation test vector (REFERENCES §4).
const TDS_GRAI = '00614141123452400';
// Published example marks, UN Model Regulations 6.5.2.1.2 (REFERENCES §2).
const COMPOSITE_MARK = '31HA1/Y/05 01/D/Muller 1683/10800/1200';
const STEEL_MARK = '11A/Y/02 99/NL/Mulder 007/5500/1500';

describe('graiFromSerial', () => {
  test('prefix 0614141 + asset type 12345 + serial 400 gives the TDS vector, check digit 2 computed', () => {
    expect(graiFromSerial('0614141', '12345', '400')).toEqual({ ok: true, grai: TDS_GRAI });
  });
  test('a short asset type is padded with leading zeros to fill the 12 digits', () => {
    const built = graiFromSerial('0614141', '45', '7');
    expect(built.ok && built.grai.slice(0, 13)).toBe('0061414100045');
  });
  test('refuses an asset type too long for the prefix, an empty serial and a character outside set 82', () => {
    expect(graiFromSerial('0614141', '123456', '1')).toMatchObject({ ok: false, message: expect.stringContaining('may have 5') });
    expect(graiFromSerial('0614141', '12345', '  ')).toMatchObject({ ok: false, message: expect.stringContaining("Give the bin's serial") });
    expect(graiFromSerial('0614141', '12345', 'A#1')).toMatchObject({ ok: false, message: expect.stringContaining('character set 82') });
  });
});

describe('checkRegistration', () => {
  test('the month of manufacture comes from the mark when not given (published example: May 2001)', () => {
    const r = checkRegistration({ grai: TDS_GRAI, unMarking: COMPOSITE_MARK }, 7);
    expect(r).toEqual({ issues: [], grai: TDS_GRAI, serial: '400', manufactureMonth: '2001-05' });
  });
  test('a two-digit year 99 is read as 1999 (published steel example, made February 1999)', () => {
    expect(checkRegistration({ grai: TDS_GRAI, unMarking: STEEL_MARK }, 7).manufactureMonth).toBe('1999-02');
  });
  test('a wrong check digit is refused on the grai field', () => {
    expect(checkRegistration({ grai: '00614141123459400', manufactureMonth: '2024-01' }, 7).issues).toEqual([
      { field: 'grai', message: 'Wrong check digit: 9 given, 2 expected for 061414112345' },
    ]);
  });
});

describe('checkMarkAgainstType', () => {
  const type = { id: 1, code: 'T1000', unCode: '31HA1', active: true };
  test('the same type code passes, also written with W (equivalent specification)', () => {
    expect(checkMarkAgainstType(COMPOSITE_MARK, type)).toBeNull();
    expect(checkMarkAgainstType(COMPOSITE_MARK.replace('31HA1', '31HA1W'), type)).toBeNull();
  });
  test('another type code is refused, naming both', () => {
    expect(checkMarkAgainstType(STEEL_MARK, type)).toEqual({ field: 'unMarking', message: "The mark's type code is 11A, but bin type T1000 is 31HA1." });
  });
  test('a bin type without a UN code, or no mark, has nothing to compare', () => {
    expect(checkMarkAgainstType(STEEL_MARK, { ...type, unCode: null })).toBeNull();
    expect(checkMarkAgainstType(null, type)).toBeNull();
  });
});

describe('bin type and depot', () => {
  test('unknown, out of use, not a depot, closed', () => {
    expect(checkBinType(undefined, 'X9')?.message).toBe('Unknown bin type "X9".');
    expect(checkBinType({ id: 1, code: 'OLD', unCode: null, active: false }, 'OLD')?.message).toContain('no longer in use');
    expect(checkDepot({ id: 1, code: 'C1', kind: 'customer', active: true }, 'C1')?.message).toBe('C1 is a customer site; bins are registered at a depot.');
    expect(checkDepot({ id: 1, code: 'D1', kind: 'depot', active: false }, 'D1')?.message).toContain('closed');
    expect(checkDepot({ id: 1, code: 'D1', kind: 'depot', active: true }, 'D1')).toBeNull();
  });
});

describe('months and test columns', () => {
  test('normaliseMonth keeps YYYY-MM and reads a spreadsheet date as its month', () => {
    expect(normaliseMonth(' 2024-05 ')).toBe('2024-05');
    expect(normaliseMonth('2024-05-01')).toBe('2024-05');
    expect(normaliseMonth('05/2024')).toBe('05/2024');
    expect(normaliseMonth(null)).toBe('');
  });
  test('each clock keeps its own month (ADR 6.5.4.4.1–2); the last inspection is the later one; the form reads them back', () => {
    expect(testColumns('2026-02', '2024-08')).toEqual({ lastInspectionOn: '2026-02-01', lastLeakTestOn: '2026-02-01', lastFullInspectionOn: '2024-08-01' });
    // A 5-year inspection without a leakproofness test: the 2.5-year clock stays where it was (none here).
    expect(testColumns(null, '2024-08')).toEqual({ lastInspectionOn: '2024-08-01', lastLeakTestOn: null, lastFullInspectionOn: '2024-08-01' });
    expect(testColumns(null, null)).toEqual({ lastInspectionOn: null, lastLeakTestOn: null, lastFullInspectionOn: null });
    expect(testMonthsOf(testColumns('2026-02', '2024-08'))).toEqual({ lastIntermediateTestMonth: '2026-02', lastFullInspectionMonth: '2024-08' });
    expect(testMonthsOf(testColumns('2024-08', '2024-08'))).toEqual({ lastIntermediateTestMonth: '2024-08', lastFullInspectionMonth: '2024-08' });
    expect(testMonthsOf(testColumns(null, '2024-08'))).toEqual({ lastIntermediateTestMonth: null, lastFullInspectionMonth: '2024-08' });
    expect(testMonthsOf({ lastLeakTestOn: '2025-03-14', lastFullInspectionOn: null })).toEqual({ lastIntermediateTestMonth: '2025-03', lastFullInspectionMonth: null });
  });
});
