// Invoice and credit-note numbers worked by hand. Gap-free sequential numbering is required of EU invoices
// (VAT Directive 2006/112/EC Art. 226(2), from memory); per-year and per-kind series are common practice.
import { describe, test, expect } from 'vitest';
import { DOCUMENT_SERIES, firstGap, formatDocumentNumber, numberingYear, parseDocumentNumber } from '@/lib/billing/document-number';

describe('document numbers', () => {
  test('one series per kind and year, padded to five digits, growing beyond', () => {
    expect(formatDocumentNumber('invoice', 2027, 42)).toBe('INV-2027-00042');
    expect(formatDocumentNumber('credit_note', 2027, 3)).toBe('CRN-2027-00003');
    expect(formatDocumentNumber('invoice', 2027, 123_456)).toBe('INV-2027-123456');
    expect(DOCUMENT_SERIES.invoice.prefix).not.toBe(DOCUMENT_SERIES.credit_note.prefix);
  });

  test('bad parts are refused', () => {
    expect(() => formatDocumentNumber('invoice', 2027, 0)).toThrow(RangeError);
    expect(() => formatDocumentNumber('invoice', 2027, 1.5)).toThrow(RangeError);
    expect(() => formatDocumentNumber('invoice', 1999, 1)).toThrow(RangeError);
    expect(() => formatDocumentNumber('receipt' as 'invoice', 2027, 1)).toThrow('Unknown document series');
  });

  test('parsing reads back only the canonical spelling', () => {
    expect(parseDocumentNumber('INV-2027-00042')).toEqual({ series: 'invoice', year: 2027, sequence: 42 });
    expect(parseDocumentNumber(' CRN-2028-00001 ')).toEqual({ series: 'credit_note', year: 2028, sequence: 1 });
    for (const bad of ['INV-2027-000042', 'INV-2027-00000', 'XYZ-2027-00001', 'inv-2027-00001', 'INV-27-00001', '', 'INV-2027-1']) {
      expect(parseDocumentNumber(bad)).toBeNull();
    }
  });

  test("the year is the operator's local year at issue: 31 Dec 2027 23:30 UTC is 1 Jan 2028 in Berlin (UTC+1)", () => {
    expect(numberingYear('2027-12-31T23:30:00Z', 'Europe/Berlin')).toBe(2028);
    expect(numberingYear('2027-12-31T22:30:00Z', 'Europe/Berlin')).toBe(2027);
    expect(numberingYear(new Date('2027-12-31T23:30:00Z'), 'America/New_York')).toBe(2027);
  });

  test('first gap of a series', () => {
    expect(firstGap([])).toBeNull();
    expect(firstGap([3, 1, 2])).toBeNull();
    expect(firstGap([1, 2, 4])).toBe(3);
    expect(firstGap([2])).toBe(1);
    expect(() => firstGap([1, 1])).toThrow('issued twice');
  });
});
