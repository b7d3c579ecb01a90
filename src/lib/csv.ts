// The one CSV writer: every CSV the app sends goes through here. Pure.
//
// Cells are typed: numbers are written as numbers (a spreadsheet reads them as
// numbers, a credit of -12.5 included), text as text. A text cell that a
// spreadsheet would run as a formula — it starts with = + - @, a tab or a
// carriage return — gets a leading apostrophe and is quoted, so it opens as the
// text it is (OWASP, "CSV Injection"). Text that is a plain decimal number
// ("-12.50") is a constant, not a formula, and is left as it is.
//
// RFC 4180: CRLF line ends, fields with commas, quotes or line breaks quoted,
// quotes doubled. UTF-8; the byte-order mark that spreadsheet programs need to
// read accented names right is added by csvResponse() (src/lib/http/csv-response.ts).
import Papa from 'papaparse';

export type CsvCell = string | number | boolean | null | undefined;

const CSV_NEWLINE = '\r\n';

/** Starts like a formula, unless the whole text is a plain decimal number. */
const FORMULA_START = /^(?!-?\d+(?:\.\d+)?$)[=+\-@\t\r]/;

function cell(value: CsvCell): string | number | boolean {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? (Object.is(value, -0) ? 0 : value) : '';
  return value;
}

/** Rows as CSV lines, each ending in CRLF; '' for no rows. */
export function csvLines(rows: readonly (readonly CsvCell[])[]): string {
  if (rows.length === 0) return '';
  const data = rows.map((r) => r.map(cell));
  return Papa.unparse(data, { newline: CSV_NEWLINE, escapeFormulae: FORMULA_START, header: false }) + CSV_NEWLINE;
}

/** A whole table: the header line, then the rows. */
export function csvTable(fields: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return csvLines([fields, ...rows]);
}

/** The text a spreadsheet shows for a neutralised cell, for callers that show a preview. */
export function neutralised(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}
