/**
 * Label stock geometry: where each label of a pre-cut sheet sits, in
 * millimetres from the sheet's top-left corner, and how a run of labels is
 * spread over sheets. The sheet page positions every label with these
 * numbers, and the browser prints them at @page margin 0, so the printed
 * label lands on the die-cut one.
 *
 * The two stocks are the usual office label sheets (common practice; sizes
 * as sold, margins and pitch from memory of the stock's template and
 * checked here by adding up to the paper size):
 * - A4, 3 × 8 labels of 70 × 37 mm, no side margins, 0.5 mm top and bottom.
 * - US Letter, 3 × 10 labels of 2⅝ × 1 in, 3⁄16 in side margins, ⅛ in gaps
 *   between columns (pitch 2¾ in), ½ in top and bottom, rows touching.
 *
 * Pure: no I/O, no framework.
 */

export const MM_PER_INCH = 25.4;

export type LabelStockId = 'a4-3x8' | 'letter-3x10';

export interface LabelStock {
  id: LabelStockId;
  /** Short name for menus: paper and label count. */
  name: string;
  /** The label size as people read it on the box. */
  labelSizeText: string;
  /** CSS @page size keyword. */
  cssPageSize: 'A4' | 'letter';
  pageWidthMm: number;
  pageHeightMm: number;
  columns: number;
  rows: number;
  labelWidthMm: number;
  labelHeightMm: number;
  /** Sheet edge to the first label's top-left corner. */
  marginTopMm: number;
  marginLeftMm: number;
  /** Distance from one label's left (top) edge to the next one's. */
  pitchXMm: number;
  pitchYMm: number;
  /**
   * Blank border kept inside each label so printer drift and the die-cut
   * tolerance never eat into the QR's quiet zone or the text.
   */
  paddingXMm: number;
  paddingYMm: number;
}

const inch = (n: number) => n * MM_PER_INCH;

export const LABEL_STOCKS: Readonly<Record<LabelStockId, LabelStock>> = {
  'a4-3x8': {
    id: 'a4-3x8',
    name: 'A4 · 24 labels (3 × 8)',
    labelSizeText: '70 × 37 mm',
    cssPageSize: 'A4',
    pageWidthMm: 210,
    pageHeightMm: 297,
    columns: 3,
    rows: 8,
    labelWidthMm: 70,
    labelHeightMm: 37,
    marginTopMm: 0.5,
    marginLeftMm: 0,
    pitchXMm: 70,
    pitchYMm: 37,
    paddingXMm: 3,
    paddingYMm: 2.5,
  },
  'letter-3x10': {
    id: 'letter-3x10',
    name: 'US Letter · 30 labels (3 × 10)',
    labelSizeText: '2⅝ × 1 in',
    cssPageSize: 'letter',
    pageWidthMm: inch(8.5),
    pageHeightMm: inch(11),
    columns: 3,
    rows: 10,
    labelWidthMm: inch(2.625),
    labelHeightMm: inch(1),
    marginTopMm: inch(0.5),
    marginLeftMm: inch(0.1875),
    pitchXMm: inch(2.75),
    pitchYMm: inch(1),
    paddingXMm: 1.5,
    paddingYMm: 1.2,
  },
};

export const LABEL_STOCK_IDS = Object.keys(LABEL_STOCKS) as LabelStockId[];
export const DEFAULT_LABEL_STOCK: LabelStockId = 'a4-3x8';

export function labelsPerSheet(stock: LabelStock): number {
  return stock.columns * stock.rows;
}

export interface LabelRect {
  /** 1-based position on the sheet, left to right, then top to bottom. */
  position: number;
  column: number;
  row: number;
  xMm: number;
  yMm: number;
  widthMm: number;
  heightMm: number;
}

/** Where label `position` (1-based, row by row) sits on a sheet of this stock. */
export function labelRect(stock: LabelStock, position: number): LabelRect {
  const perSheet = labelsPerSheet(stock);
  if (!Number.isInteger(position) || position < 1 || position > perSheet) {
    throw new RangeError(`Label position ${position} is not on a ${perSheet}-label sheet`);
  }
  const column = (position - 1) % stock.columns;
  const row = Math.floor((position - 1) / stock.columns);
  return {
    position,
    column,
    row,
    xMm: stock.marginLeftMm + column * stock.pitchXMm,
    yMm: stock.marginTopMm + row * stock.pitchYMm,
    widthMm: stock.labelWidthMm,
    heightMm: stock.labelHeightMm,
  };
}

/**
 * The square the QR takes inside a label: as tall as the label less its
 * vertical padding, at the label's left after the horizontal padding. The
 * QR's own quiet zone (4 modules) is drawn inside this square.
 */
export function qrBox(stock: LabelStock): { xMm: number; yMm: number; sizeMm: number } {
  const sizeMm = stock.labelHeightMm - 2 * stock.paddingYMm;
  return { xMm: stock.paddingXMm, yMm: stock.paddingYMm, sizeMm };
}

/** Problems with a stock's numbers (labels off the paper or overlapping); empty when it adds up. */
export function stockProblems(stock: LabelStock): string[] {
  const problems: string[] = [];
  const eps = 1e-9;
  if (stock.pitchXMm + eps < stock.labelWidthMm) problems.push('labels overlap across');
  if (stock.pitchYMm + eps < stock.labelHeightMm) problems.push('labels overlap down');
  const last = labelRect(stock, labelsPerSheet(stock));
  if (last.xMm + last.widthMm > stock.pageWidthMm + eps) problems.push('the last column runs off the paper');
  if (last.yMm + last.heightMm > stock.pageHeightMm + eps) problems.push('the last row runs off the paper');
  if (qrBox(stock).sizeMm + 2 * stock.paddingXMm > stock.labelWidthMm) problems.push('the QR does not fit across the label');
  return problems;
}

export interface SheetSlot {
  /** 0-based sheet number in the run. */
  sheet: number;
  /** 1-based label position on that sheet. */
  position: number;
  /** Index into the run's items. */
  item: number;
}

export interface SheetPlan {
  sheets: number;
  labels: number;
  /** Positions left blank at the start of the first sheet (already used). */
  skipped: number;
  slots: SheetSlot[];
}

/**
 * Spreads `count` labels over sheets, starting at position `startAt` of the
 * first sheet (a part-used sheet: positions before it are skipped).
 */
export function planSheets(stock: LabelStock, count: number, startAt = 1): SheetPlan {
  const perSheet = labelsPerSheet(stock);
  if (!Number.isInteger(count) || count < 0) throw new RangeError(`Label count must be a whole number ≥ 0, got ${count}`);
  if (!Number.isInteger(startAt) || startAt < 1 || startAt > perSheet) {
    throw new RangeError(`Start position must be 1 to ${perSheet} on this stock, got ${startAt}`);
  }
  const skipped = startAt - 1;
  const slots: SheetSlot[] = [];
  for (let item = 0; item < count; item++) {
    const n = skipped + item;
    slots.push({ sheet: Math.floor(n / perSheet), position: (n % perSheet) + 1, item });
  }
  const sheets = count === 0 ? 0 : Math.ceil((skipped + count) / perSheet);
  return { sheets, labels: count, skipped, slots };
}
