// Number formatting on the planner pages, against strings written out by hand. Rounding is half away from
// zero on the decimal digits (the school rule), so 1.005 at two decimals is 1.01 — binary floating point
// holds 1.005 as 1.00499999999999989…, which a plain toFixed(2) would turn into "1.00".
import { describe, test, expect } from 'vitest';
import { formatCount, formatDays, formatDecimal, formatPercent, plainDecimal } from '@/lib/figures.ts';

describe('figures', () => {
  test('counts group thousands with commas', () => {
    expect(formatCount(0)).toBe('0');
    expect(formatCount(1234567)).toBe('1,234,567');
  });

  test('decimals round half away from zero on the written digits', () => {
    expect(formatDecimal(2.345, 1)).toBe('2.3');
    expect(formatDecimal(2.35, 1)).toBe('2.4');
    expect(formatDecimal(1.005, 2)).toBe('1.01');
    expect(formatDecimal(-2.5, 0)).toBe('-3');
    expect(formatDecimal(-0.04, 1)).toBe('0.0'); // no "-0.0"
    expect(formatDecimal(1e-7, 2)).toBe('0.00');
    expect(formatDecimal(12345.678, 1)).toBe('12,345.7');
  });

  test('percentages from fractions, with a space before the sign', () => {
    expect(formatPercent(0.0083752)).toBe('0.8 %');
    expect(formatPercent(0.4, 0)).toBe('40 %');
    expect(formatPercent(1)).toBe('100.0 %');
  });

  test('days with a unit, singular for exactly one', () => {
    expect(formatDays(14.25, 1)).toBe('14.3 days');
    expect(formatDays(1)).toBe('1 day');
    expect(formatDays(0)).toBe('0 days');
  });

  test('no value is a dash on the page and an empty cell in a file', () => {
    for (const f of [formatCount, formatPercent, formatDays, (v: number | null) => formatDecimal(v, 1)]) {
      expect(f(null)).toBe('—');
      expect(f(Number.NaN)).toBe('—');
    }
    expect(plainDecimal(null)).toBe('');
  });

  test('plain decimals for CSV: point, no grouping', () => {
    expect(plainDecimal(12345.678, 2)).toBe('12345.68');
    expect(plainDecimal(1.005, 2)).toBe('1.01');
    expect(plainDecimal(3, 2)).toBe('3.00');
  });
});
