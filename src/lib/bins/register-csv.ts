// The bin register as CSV: reading an import file into lines with their
// problems, and writing the export. Line numbers are the ones a spreadsheet
// shows (the header is line 1; a quoted cell with a line break inside stays one
// line), so a planner can go straight to the row to fix.
//
// Pure: no I/O. The database look-ups (bin types, depots, GRAIs already
// registered) come in as plain maps; src/lib/bins/register-import.server.ts fills them.
import Papa from 'papaparse';
import { csvLines, csvTable } from '@/lib/csv';
import { parseSerialisedGrai } from '@/lib/gs1';
import {
  checkBinType,
  checkDepot,
  checkMarkAgainstType,
  checkRegistration,
  graiFromSerial,
  normaliseMonth,
  type BinTypeRef,
  type RegisterBinInput,
  type RegisterIssue,
  type SiteRef,
} from './registration-check';

export const IMPORT_COLUMNS = [
  { name: 'grai', required: true, meaning: "The bin's GS1 GRAI with its serial, as on the label (spaces allowed; a label link works too).", example: '09521234100102EX-0001' },
  { name: 'bin_type', required: true, meaning: 'Bin type code, one of the codes in use listed below this table.', example: 'FX1000' },
  { name: 'depot', required: true, meaning: 'Site code of the depot where the bin is now, one of the open depots listed below this table.', example: 'DEP-RTM' },
  { name: 'manufacture_month', required: true, meaning: 'Month of manufacture, YYYY-MM. May be empty when the UN mark is given (the mark carries it).', example: '2024-05' },
  {
    name: 'un_marking',
    required: false,
    meaning: 'The UN mark as stamped on the bin, fields separated by /. Empty for a bin without one.',
    example: '31HA2/Y/05 24/NL/NMP 4417/2313/1285',
  },
  { name: 'last_intermediate_test_month', required: false, meaning: 'Month of the last 2.5-year inspection and leakproofness test, YYYY-MM, if any.', example: '' },
  { name: 'last_full_inspection_month', required: false, meaning: 'Month of the last 5-year inspection, YYYY-MM, if any.', example: '' },
] as const;

export type ImportColumn = (typeof IMPORT_COLUMNS)[number]['name'];
export type Cells = Record<ImportColumn, string>;

const COLUMN_NAMES: readonly ImportColumn[] = IMPORT_COLUMNS.map((c) => c.name);
const REQUIRED: readonly ImportColumn[] = IMPORT_COLUMNS.filter((c) => c.required).map((c) => c.name);
const DELIMITERS = [',', ';', '\t'] as const;

export interface LineIssue {
  /** The column the problem is in; null for the line as a whole. */
  column: ImportColumn | null;
  message: string;
}

export interface CsvLine {
  /** As a spreadsheet numbers rows: the header is line 1. */
  line: number;
  cells: Cells;
  issues: LineIssue[];
}

export type CsvParseResult =
  | { ok: true; lines: CsvLine[]; delimiter: string }
  | { ok: false; code: 'no_header' | 'missing_columns' | 'bad_header' | 'no_lines'; message: string; missingColumns: ImportColumn[]; unknownColumns: string[] };

/** 'Last Full-Inspection Month ' → 'last_full_inspection_month'. */
function headerKey(text: string): string {
  return text
    .replace(/^\uFEFF/, '')
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
}

/** The delimiter that splits the header into the most known column names (comma on a tie). */
function delimiterOf(firstLine: string): string {
  let best: string = ',';
  let bestCount = -1;
  for (const d of DELIMITERS) {
    const count = firstLine.split(d).filter((cell) => (COLUMN_NAMES as readonly string[]).includes(headerKey(cell.replace(/"/g, '')))).length;
    if (count > bestCount) {
      best = d;
      bestCount = count;
    }
  }
  return best;
}

function refused(code: Exclude<CsvParseResult, { ok: true }>['code'], message: string, missingColumns: ImportColumn[] = [], unknownColumns: string[] = []): CsvParseResult {
  return { ok: false, code, message, missingColumns, unknownColumns };
}

/** Reads an import file: header first, then one line per bin; blank lines are skipped but still counted. */
export function parseRegisterCsv(input: string): CsvParseResult {
  // One line end throughout: files edited by hand mix CRLF and LF, and the parser reads only one kind.
  const text = input.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const firstLine = text.split('\n', 1)[0] ?? '';
  if (firstLine.trim() === '') return refused('no_header', `The file has no header line. The first line must name the columns: ${COLUMN_NAMES.join(', ')}.`);
  const delimiter = delimiterOf(firstLine);
  const parsed = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false, delimiter, newline: '\n' });
  const rows = parsed.data;

  const header = (rows[0] ?? []).map(headerKey);
  const unknown = header.filter((h) => h !== '' && !(COLUMN_NAMES as readonly string[]).includes(h));
  const repeated = header.filter((h, i) => h !== '' && header.indexOf(h) !== i);
  const missing = REQUIRED.filter((c) => !header.includes(c));
  if (missing.length) {
    return refused(
      'missing_columns',
      `The header lacks ${missing.length === 1 ? 'the column' : 'these columns'}: ${missing.join(', ')}. The first line must name the columns (see the template).`,
      [...missing],
      unknown,
    );
  }
  if (unknown.length || repeated.length) {
    const parts = [
      unknown.length ? `unknown column${unknown.length === 1 ? '' : 's'} ${unknown.join(', ')}` : '',
      repeated.length ? `column${repeated.length === 1 ? '' : 's'} named twice: ${[...new Set(repeated)].join(', ')}` : '',
    ].filter(Boolean);
    return refused('bad_header', `The header has ${parts.join('; ')}. Known columns: ${COLUMN_NAMES.join(', ')}.`, [], unknown);
  }

  const quoteProblems = new Map<number, string>();
  for (const e of parsed.errors) {
    if (e.type === 'Quotes' && typeof e.row === 'number') {
      quoteProblems.set(
        e.row,
        e.code === 'MissingQuotes'
          ? 'A quoted cell is never closed: a " is missing, so the rest of the file ran into this cell.'
          : 'A " stands inside a cell that is not quoted; write it as "" inside a quoted cell.',
      );
    }
  }

  const lines: CsvLine[] = [];
  for (let r = 1; r < rows.length; r++) {
    const row = rows[r] ?? [];
    if (row.every((cell) => cell.trim() === '')) continue;
    const cells = Object.fromEntries(COLUMN_NAMES.map((c) => [c, ''])) as Cells;
    header.forEach((name, i) => {
      if (name !== '') cells[name as ImportColumn] = (row[i] ?? '').trim();
    });
    const issues: LineIssue[] = [];
    const extra = row.slice(header.length).filter((cell) => cell.trim() !== '');
    if (extra.length)
      issues.push({
        column: null,
        message: `This line has ${row.length} cells; the header names ${header.length}. Check for a stray ${delimiter === '\t' ? 'tab' : `"${delimiter}"`} or an unquoted cell.`,
      });
    const quote = quoteProblems.get(r);
    if (quote) issues.push({ column: null, message: quote });
    lines.push({ line: r + 1, cells, issues });
  }
  if (!lines.length) return refused('no_lines', 'The file has a header but no bins below it.');
  return { ok: true, lines, delimiter };
}

// ---------------------------------------------------------------------------------------------------
// Checking the lines against the pool

export interface RegisterLookups {
  prefixLength: number;
  /** By bin type code in capitals. */
  binTypes: ReadonlyMap<string, BinTypeRef>;
  /** By site code in capitals (all kinds, so a customer site is named as such). */
  sites: ReadonlyMap<string, SiteRef>;
  /** Canonical GRAIs already in the register. */
  registeredGrais: ReadonlySet<string>;
}

export interface ImportLine extends CsvLine {
  /** Canonical GRAI when it reads; null otherwise. */
  grai: string | null;
  /** What to register, when the line has no problems. */
  input: RegisterBinInput | null;
}

const FIELD_COLUMN: Record<string, ImportColumn> = {
  grai: 'grai',
  binTypeId: 'bin_type',
  siteId: 'depot',
  manufactureMonth: 'manufacture_month',
  unMarking: 'un_marking',
  lastIntermediateTestMonth: 'last_intermediate_test_month',
  lastFullInspectionMonth: 'last_full_inspection_month',
};

function toLineIssue(issue: RegisterIssue): LineIssue {
  return { column: FIELD_COLUMN[issue.field] ?? null, message: issue.message };
}

/** Spreadsheets turn long digit strings into numbers: say so instead of only "missing filler digit". */
function spreadsheetHint(cell: string): string {
  if (/^\d(\.\d+)?E\+?\d+$/i.test(cell)) return ' The spreadsheet turned this GRAI into a number: format the grai column as text and enter it again.';
  if (/^[1-9]\d{12,}/.test(cell)) return ' Spreadsheets drop leading zeros: format the grai column as text.';
  return '';
}

function months(cells: Cells) {
  return {
    manufactureMonth: normaliseMonth(cells.manufacture_month) || null,
    lastIntermediateTestMonth: normaliseMonth(cells.last_intermediate_test_month) || null,
    lastFullInspectionMonth: normaliseMonth(cells.last_full_inspection_month) || null,
  };
}

/**
 * Every problem of every line: the GRAI (check digit, serial), bin type and
 * depot codes, months and UN mark, GRAIs already registered, and GRAIs that
 * appear on more than one line (each of those lines names the others).
 */
export function validateImportLines(lines: CsvLine[], lookups: RegisterLookups): ImportLine[] {
  const out: ImportLine[] = lines.map((l) => {
    const issues = [...l.issues];
    const { cells } = l;
    const monthsGiven = months(cells);
    const unMarking = cells.un_marking || null;
    const checked = checkRegistration({ grai: cells.grai, unMarking, ...monthsGiven }, lookups.prefixLength);
    for (const issue of checked.issues) {
      const hint = issue.field === 'grai' ? spreadsheetHint(cells.grai) : '';
      issues.push(toLineIssue({ field: issue.field, message: issue.message + hint }));
    }
    if (checked.grai && lookups.registeredGrais.has(checked.grai)) {
      issues.push({ column: 'grai', message: 'A bin with this GRAI is already registered.' });
    }
    const binType = cells.bin_type ? lookups.binTypes.get(cells.bin_type.toUpperCase()) : undefined;
    const site = cells.depot ? lookups.sites.get(cells.depot.toUpperCase()) : undefined;
    if (!cells.bin_type) issues.push({ column: 'bin_type', message: 'Give the bin type code.' });
    if (!cells.depot) issues.push({ column: 'depot', message: "Give the depot's site code." });
    const typeIssue = cells.bin_type ? checkBinType(binType, cells.bin_type) : null;
    const depotIssue = cells.depot ? checkDepot(site, cells.depot) : null;
    for (const issue of [typeIssue, depotIssue]) if (issue) issues.push(toLineIssue(issue));
    const markIssue = binType ? checkMarkAgainstType(unMarking, binType) : null;
    if (markIssue) issues.push(toLineIssue(markIssue));
    const ready = issues.length === 0 && binType && site && checked.grai;
    return {
      ...l,
      issues,
      grai: checked.grai ?? null,
      input: ready ? { grai: checked.grai!, binTypeId: binType.id, siteId: site.id, unMarking, ...monthsGiven } : null,
    };
  });

  const linesByGrai = new Map<string, number[]>();
  for (const l of out) {
    if (l.grai) linesByGrai.set(l.grai, [...(linesByGrai.get(l.grai) ?? []), l.line]);
  }
  for (const l of out) {
    const same = l.grai ? linesByGrai.get(l.grai)! : [];
    if (same.length > 1) {
      const others = same.filter((n) => n !== l.line);
      l.issues.push({ column: 'grai', message: `The same GRAI is also on line${others.length === 1 ? '' : 's'} ${others.join(', ')}.` });
      l.input = null;
    }
  }
  return out;
}

/** Canonical GRAIs of the lines that read, to ask the database which are taken. */
export function graisInLines(lines: CsvLine[], prefixLength: number): string[] {
  const grais = new Set<string>();
  for (const l of lines) {
    const parsed = parseSerialisedGrai(l.cells.grai, { companyPrefixLength: prefixLength });
    if (parsed.ok) grais.add(parsed.grai.value);
  }
  return [...grais];
}

export function importCounts(lines: ImportLine[]): { total: number; ready: number; withProblems: number } {
  const ready = lines.filter((l) => l.issues.length === 0).length;
  return { total: lines.length, ready, withProblems: lines.length - ready };
}

/** A template with the operator's own codes: the header and two example lines to replace. */
export function templateCsv(example: { companyPrefix: string; binTypes: Array<{ code: string; graiAssetType: string; unCode: string | null }>; depotCode: string }): string {
  const rows = example.binTypes.slice(0, 2).map((t, i) => {
    const made = i === 0 ? '2024-05' : '2023-11';
    const built = graiFromSerial(example.companyPrefix, t.graiAssetType, `EXAMPLE-${i + 1}`);
    const mark = t.unCode ? `${t.unCode}/Y/${made.slice(5)} ${made.slice(2, 4)}/NL/MAKER 1234/2313/1285` : '';
    return [built.ok ? built.grai : '', t.code, example.depotCode, mark ? '' : made, mark, i === 1 ? '2025-10' : '', ''];
  });
  return csvTable([...COLUMN_NAMES], rows);
}

// ---------------------------------------------------------------------------------------------------
// The export

export const EXPORT_COLUMNS = [
  'grai',
  'serial',
  'bin_type',
  'status',
  'site',
  'customer',
  'manufacture_month',
  'un_marking',
  'trip_count',
  'last_inspection_on',
  'last_full_inspection_on',
  'next_intermediate_due',
  'next_full_due',
  'next_due',
] as const;

export type ExportRow = Record<(typeof EXPORT_COLUMNS)[number], string | number | null>;

/**
 * One chunk of the export; the header only with the first. Cells that a
 * spreadsheet would run as a formula (=, +, -, @ …) are escaped.
 */
export function exportCsvChunk(rows: ExportRow[], withHeader: boolean): string {
  const data = rows.map((r) => EXPORT_COLUMNS.map((c) => r[c] ?? null));
  return withHeader ? csvTable([...EXPORT_COLUMNS], data) : csvLines(data);
}
