import { describe, test, expect } from 'vitest';
import { LABEL_STOCKS, LABEL_STOCK_IDS, MM_PER_INCH, labelRect, labelsPerSheet, planSheets, qrBox, stockProblems } from '@/lib/labels/label-stock';

// Sources:
// - Paper sizes: ISO 216 A4 = 210 × 297 mm [published]; US Letter = 8½ × 11 in (ANSI/ASME Y14.1) [published].
// - 1 in = 25.4 mm exactly (international yard and pound agreement, 1959) [published].
// - Stock layouts (A4 3 × 8 of 70 × 37 mm, 0.5 mm top margin; Letter 3 × 10 of 2⅝ × 1 in, ½ in top,
//   3⁄16 in side margins, 2¾ in column pitch) are the usual office label sheets [practice; margins from memory],
//   and are checked below by adding up to the paper size.
// Expected positions are worked by hand from those numbers, not computed with the module's own formula.
const a4 = LABEL_STOCKS['a4-3x8'];
const letter = LABEL_STOCKS['letter-3x10'];

describe('stock geometry adds up to the paper', () => {
  test('A4: 3 × 70 mm = 210 mm across; 0.5 + 8 × 37 + 0.5 mm = 297 mm down (ISO 216)', () => {
    expect(a4.pageWidthMm).toBe(210);
    expect(a4.pageHeightMm).toBe(297);
    expect(a4.marginLeftMm * 2 + 3 * a4.labelWidthMm).toBe(210);
    expect(a4.marginTopMm * 2 + 8 * a4.labelHeightMm).toBe(297);
    expect(labelsPerSheet(a4)).toBe(24);
  });

  test('Letter: 3⁄16 + 3 × 2⅝ + 2 × ⅛ + 3⁄16 in = 8½ in; ½ + 10 × 1 + ½ in = 11 in', () => {
    expect(letter.pageWidthMm).toBeCloseTo(215.9, 9);
    expect(letter.pageHeightMm).toBeCloseTo(279.4, 9);
    expect((2 * letter.marginLeftMm + 3 * letter.labelWidthMm + 2 * (letter.pitchXMm - letter.labelWidthMm)) / MM_PER_INCH).toBeCloseTo(8.5, 9);
    expect((2 * letter.marginTopMm + 10 * letter.labelHeightMm) / MM_PER_INCH).toBeCloseTo(11, 9);
    expect(labelsPerSheet(letter)).toBe(30);
  });

  test('no stock has labels off the paper, overlapping, or a QR wider than its label', () => {
    for (const id of LABEL_STOCK_IDS) expect(stockProblems(LABEL_STOCKS[id]), id).toEqual([]);
  });

  test('a stock with a row too many is caught', () => {
    expect(stockProblems({ ...a4, rows: 9 })).toContain('the last row runs off the paper');
  });
});

describe('label positions in mm from the top-left corner of the sheet', () => {
  test('A4 label 1 is at (0, 0.5), 70 × 37 mm', () => {
    expect(labelRect(a4, 1)).toEqual({ position: 1, column: 0, row: 0, xMm: 0, yMm: 0.5, widthMm: 70, heightMm: 37 });
  });
  test('A4 label 3 ends the first row at (140, 0.5)', () => {
    expect(labelRect(a4, 3)).toMatchObject({ column: 2, row: 0, xMm: 140, yMm: 0.5 });
  });
  test('A4 label 4 starts the second row at (0, 37.5)', () => {
    expect(labelRect(a4, 4)).toMatchObject({ column: 0, row: 1, xMm: 0, yMm: 37.5 });
  });
  test('A4 label 24 is the last one, at (140, 259.5), ending 0.5 mm above the bottom edge', () => {
    const r = labelRect(a4, 24);
    expect(r).toMatchObject({ column: 2, row: 7, xMm: 140, yMm: 259.5 });
    expect(297 - (r.yMm + r.heightMm)).toBeCloseTo(0.5, 9);
  });
  test('Letter label 1 is at (3⁄16 in, ½ in) = (4.7625, 12.7) mm, 66.675 × 25.4 mm', () => {
    const r = labelRect(letter, 1);
    expect(r.xMm).toBeCloseTo(4.7625, 9);
    expect(r.yMm).toBeCloseTo(12.7, 9);
    expect(r.widthMm).toBeCloseTo(66.675, 9);
    expect(r.heightMm).toBeCloseTo(25.4, 9);
  });
  test('Letter label 30 is at (3⁄16 + 2 × 2¾ in, ½ + 9 in) = (144.4625, 241.3) mm', () => {
    const r = labelRect(letter, 30);
    expect(r).toMatchObject({ column: 2, row: 9 });
    expect(r.xMm).toBeCloseTo(144.4625, 9);
    expect(r.yMm).toBeCloseTo(241.3, 9);
    // and its right edge is 3⁄16 in = 4.7625 mm from the paper's right edge
    expect(215.9 - (r.xMm + r.widthMm)).toBeCloseTo(4.7625, 9);
  });
  test('positions outside the sheet are refused', () => {
    expect(() => labelRect(a4, 0)).toThrow(RangeError);
    expect(() => labelRect(a4, 25)).toThrow(RangeError);
    expect(() => labelRect(letter, 1.5)).toThrow(RangeError);
  });
});

describe('QR box inside a label', () => {
  test('A4: 37 − 2 × 2.5 = 32 mm square, 3 mm in from the left edge', () => {
    expect(qrBox(a4)).toEqual({ xMm: 3, yMm: 2.5, sizeMm: 32 });
  });
  test('Letter: 25.4 − 2 × 1.2 = 23 mm square', () => {
    expect(qrBox(letter).sizeMm).toBeCloseTo(23, 9);
  });
});

describe('spreading a run over sheets', () => {
  test('26 labels on A4 take 2 sheets: 24 on the first, 2 on the second', () => {
    const plan = planSheets(a4, 26);
    expect(plan.sheets).toBe(2);
    expect(plan.skipped).toBe(0);
    expect(plan.slots[0]).toEqual({ sheet: 0, position: 1, item: 0 });
    expect(plan.slots[23]).toEqual({ sheet: 0, position: 24, item: 23 });
    expect(plan.slots[25]).toEqual({ sheet: 1, position: 2, item: 25 });
  });
  test('exactly one full sheet is one sheet', () => {
    expect(planSheets(a4, 24).sheets).toBe(1);
    expect(planSheets(letter, 30).sheets).toBe(1);
  });
  test('starting at label 5 of a Letter sheet: 26 labels fit the first sheet, the next 4 go on a second', () => {
    const plan = planSheets(letter, 30, 5);
    expect(plan.sheets).toBe(2);
    expect(plan.skipped).toBe(4);
    expect(plan.slots[0]).toEqual({ sheet: 0, position: 5, item: 0 });
    expect(plan.slots[25]).toEqual({ sheet: 0, position: 30, item: 25 });
    expect(plan.slots[26]).toEqual({ sheet: 1, position: 1, item: 26 });
    expect(plan.slots[29]).toEqual({ sheet: 1, position: 4, item: 29 });
  });
  test('no labels, no sheets', () => {
    expect(planSheets(a4, 0)).toEqual({ sheets: 0, labels: 0, skipped: 0, slots: [] });
  });
  test('a start position off the sheet is refused', () => {
    expect(() => planSheets(a4, 3, 25)).toThrow(/1 to 24/);
    expect(() => planSheets(a4, 3, 0)).toThrow(RangeError);
  });
});
