import { describe, test, expect } from 'vitest';
import Papa from 'papaparse';
import {
  exportCsvChunk,
  graisInLines,
  importCounts,
  parseRegisterCsv,
  templateCsv,
  validateImportLines,
  EXPORT_COLUMNS,
  IMPORT_COLUMNS,
  type CsvLine,
  type ExportRow,
  type ImportLine,
  type RegisterLookups,
} from '@/lib/bins/register-csv';

// EPC Tag Data Standard translation test vector (REFERENCES §4): company
// prefix 0614141, asset type 12345, check digit 2, serial 400.
const TDS_GRAI = '00614141123452400';
const WRONG_CHECK = '00614141123453400'; // same with check digit 3
/** Filler 0, prefix 0614141, asset type 12345, check digit 2, then the serial. */
const grai = (serial: string) => `00614141123452${serial}`;
const G1 = grai('A1');
const G2 = grai('A2');
const G3 = grai('A3');
// Published example mark, UN Model Regulations 6.5.2.1.2 (REFERENCES §2): made May 2001.
const COMPOSITE_MARK = '31HA1/Y/05 01/D/Muller 1683/10800/1200';

const HEADER = IMPORT_COLUMNS.map((c) => c.name).join(',');

const LOOKUPS: RegisterLookups = {
  prefixLength: 7,
  binTypes: new Map([
    ['T1000', { id: 1, code: 'T1000', unCode: '31HA1', active: true }],
    ['T1250', { id: 2, code: 'T1250', unCode: null, active: true }],
    ['OLD1', { id: 3, code: 'OLD1', unCode: null, active: false }],
  ]),
  sites: new Map([
    ['DEP-A', { id: 10, code: 'DEP-A', kind: 'depot', active: true }],
    ['DEP-SHUT', { id: 11, code: 'DEP-SHUT', kind: 'depot', active: false }],
    ['CUS-1', { id: 12, code: 'CUS-1', kind: 'customer', active: true }],
  ]),
  registeredGrais: new Set([grai('TAKEN')]),
};

function lines(csv: string): CsvLine[] {
  const parsed = parseRegisterCsv(csv);
  if (!parsed.ok) throw new Error(`expected lines, got ${parsed.code}: ${parsed.message}`);
  return parsed.lines;
}

function check(csv: string): ImportLine[] {
  return validateImportLines(lines(csv), LOOKUPS);
}

/** The problems of one line as "column: message" strings. */
function problemsOf(result: ImportLine[], line: number): string[] {
  const l = result.find((x) => x.line === line);
  if (!l) throw new Error(`no line ${line}`);
  return l.issues.map((i) => `${i.column ?? '(line)'}: ${i.message}`);
}

describe('the test GRAIs', () => {
  test('are built on the Tag Data Standard vector (check digit 2)', () => {
    expect(grai('400')).toBe(TDS_GRAI);
    expect(G1).toBe('00614141123452A1');
  });
});

describe('parseRegisterCsv: the file', () => {
  test('a clean file gives one line per bin, numbered as spreadsheet rows (header = line 1)', () => {
    const result = lines(`${HEADER}\n${G1},T1000,DEP-A,,${COMPOSITE_MARK},,\n${G2},T1250,DEP-A,2024-05,,2025-10,\n`);
    expect(result.map((l) => l.line)).toEqual([2, 3]);
    expect(result[0]!.cells.un_marking).toBe(COMPOSITE_MARK);
    expect(result[1]!.cells.manufacture_month).toBe('2024-05');
    expect(result[1]!.cells.last_intermediate_test_month).toBe('2025-10');
  });

  test('missing columns refuse the whole file and are listed', () => {
    const parsed = parseRegisterCsv(`grai,bin_type\n${G1},T1000\n`);
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.code).toBe('missing_columns');
    expect(parsed.missingColumns).toEqual(['depot', 'manufacture_month']);
    expect(parsed.message).toContain('depot, manufacture_month');
  });

  test('the optional columns may be left out of the header', () => {
    const result = lines(`grai,bin_type,depot,manufacture_month\n${G1},T1250,DEP-A,2024-05\n`);
    expect(result[0]!.cells.un_marking).toBe('');
  });

  test('an unknown or repeated column refuses the file, naming it', () => {
    const unknown = parseRegisterCsv(`${HEADER},un_mark\n`);
    expect(unknown.ok).toBe(false);
    if (!unknown.ok) {
      expect(unknown.code).toBe('bad_header');
      expect(unknown.unknownColumns).toEqual(['un_mark']);
    }
    const twice = parseRegisterCsv(`${HEADER},grai\n`);
    expect(!twice.ok && twice.message).toContain('named twice: grai');
  });

  test('header names are read case- and space-insensitively, in any order', () => {
    const result = lines(`Depot, Bin Type ,GRAI,Manufacture-Month\nDEP-A,T1250,${G1},2024-05\n`);
    expect(result[0]!.cells).toMatchObject({ grai: G1, bin_type: 'T1250', depot: 'DEP-A', manufacture_month: '2024-05' });
  });

  test("a byte-order mark and CRLF line ends (a spreadsheet's CSV UTF-8) are read", () => {
    const result = lines(`\uFEFF${HEADER}\r\n${G1},T1250,DEP-A,2024-05,,,\r\n${G2},T1250,DEP-A,2024-06,,,\r\n`);
    expect(result.map((l) => [l.line, l.cells.grai, l.cells.last_full_inspection_month])).toEqual([
      [2, G1, ''],
      [3, G2, ''],
    ]);
  });

  test('a file that mixes CRLF and LF line ends (edited by hand) is read line by line', () => {
    const result = lines(`${HEADER}\r\n${G1},T1250,DEP-A,2024-05,,,\n${G2},T1250,DEP-A,2024-06,,,\r\n${G3},T1250,DEP-A,2024-07,,,`);
    expect(result.map((l) => [l.line, l.cells.manufacture_month])).toEqual([
      [2, '2024-05'],
      [3, '2024-06'],
      [4, '2024-07'],
    ]);
  });

  test('quoted fields: commas, doubled quotes and a line break inside stay one cell, and one spreadsheet row', () => {
    const csv = [
      HEADER,
      `"${G1}",T1000,DEP-A,,"31HA1/Y/05 01/D/Maker, Ltd ""North"" 7/10800/1200",,`,
      `${G2},T1000,DEP-A,,"31HA1/Y/05 01\nD/Maker 7/10800/1200",,`,
      `${G3},T1250,DEP-A,2024-05,,,`,
    ].join('\r\n');
    const result = lines(csv);
    expect(result.map((l) => l.line)).toEqual([2, 3, 4]);
    expect(result[0]!.cells.un_marking).toBe('31HA1/Y/05 01/D/Maker, Ltd "North" 7/10800/1200');
    expect(result[1]!.cells.un_marking).toBe('31HA1/Y/05 01\nD/Maker 7/10800/1200');
    expect(validateImportLines(result, LOOKUPS).every((l) => l.issues.length === 0)).toBe(true);
  });

  test('blank lines are skipped but still counted, as the spreadsheet counts them', () => {
    const result = lines(`${HEADER}\n${G1},T1250,DEP-A,2024-05,,,\n\n,,,,,,\n${G2},T1250,DEP-A,2024-05,,,\n`);
    expect(result.map((l) => l.line)).toEqual([2, 5]);
  });

  test('semicolon-separated files (spreadsheets in comma-decimal locales) are read', () => {
    const result = lines(`grai;bin_type;depot;manufacture_month;un_marking\n${G1};T1000;DEP-A;;${COMPOSITE_MARK}\n`);
    expect(result[0]!.cells.un_marking).toBe(COMPOSITE_MARK);
  });

  test('a file without header, or with only a header, is refused', () => {
    expect(parseRegisterCsv('')).toMatchObject({ ok: false, code: 'no_header' });
    expect(parseRegisterCsv(`${HEADER}\r\n\r\n`)).toMatchObject({ ok: false, code: 'no_lines' });
  });
});

describe('validateImportLines: every kind of line problem, with its line number', () => {
  const csv = [
    HEADER,
    /* 2 */ `${G1},T1000,DEP-A,,${COMPOSITE_MARK},,`,
    /* 3 */ `${WRONG_CHECK},T1250,DEP-A,2024-05,,,`,
    /* 4 */ `${G2},NOPE,DEP-A,2024-05,,,`,
    /* 5 */ `${G3},T1250,DEP-X,2024-05,,,`,
    /* 6 */ `${G1},T1250,DEP-A,2024-05,,,`,
    /* 7 */ `${grai('TAKEN')},T1250,DEP-A,2024-05,,,`,
    /* 8 */ `${grai('B8')},T1250,CUS-1,2024-05,,,`,
    /* 9 */ `${grai('B9')},T1250,DEP-SHUT,2024-05,,,`,
    /* 10 */ `${grai('B10')},OLD1,DEP-A,2024-05,,,`,
    /* 11 */ `${grai('B11')},,,2024-05,,,`,
    /* 12 */ `${grai('B12')},T1250,DEP-A,05/2024,,,`,
    /* 13 */ `${grai('B13')},T1250,DEP-A,2024-05,,2023-01,`,
    /* 14 */ `${grai('B14')},T1000,DEP-A,,31HA1/Q/05 01/D/Maker 7/10800/1200,,`,
    /* 15 */ `${grai('B15')},T1000,DEP-A,,31HA2/Y/05 01/D/Maker 7/10800/1200,,`,
    /* 16 */ `${grai('B16')},T1000,DEP-A,2001-06,${COMPOSITE_MARK},,`,
    /* 17 */ `${grai('B17')},T1250,DEP-A,2024-05,,,,extra`,
    /* 18 */ `6.14141E+15,T1250,DEP-A,2024-05,,,`,
    /* 19 */ `0061414112345,T1250,DEP-A,2024-05,,,`,
    /* 20 */ `${grai('B20')},T1250,DEP-A,,,,`,
    /* 21 */ `${grai('OK21')},t1250,dep-a,2024-05-01,,,`,
  ].join('\n');
  const result = check(csv);

  test('a wrong check digit (GS1 mod-10: 2 expected for the TDS vector)', () => {
    expect(problemsOf(result, 3)).toEqual(['grai: Wrong check digit: 3 given, 2 expected for 061414112345']);
  });
  test('an unknown bin type code, listing nothing else wrong', () => {
    expect(problemsOf(result, 4)).toEqual(['bin_type: Unknown bin type "NOPE".']);
  });
  test('an unknown depot code', () => {
    expect(problemsOf(result, 5)).toEqual(['depot: Unknown depot "DEP-X".']);
  });
  test('a GRAI on two lines: each line names the other', () => {
    expect(problemsOf(result, 2)).toEqual(['grai: The same GRAI is also on line 6.']);
    expect(problemsOf(result, 6)).toEqual(['grai: The same GRAI is also on line 2.']);
  });
  test('a GRAI already registered', () => {
    expect(problemsOf(result, 7)).toEqual(['grai: A bin with this GRAI is already registered.']);
  });
  test('a customer site, a closed depot and a bin type out of use', () => {
    expect(problemsOf(result, 8)).toEqual(['depot: CUS-1 is a customer site; bins are registered at a depot.']);
    expect(problemsOf(result, 9)).toEqual(['depot: Depot DEP-SHUT is closed; choose an open depot.']);
    expect(problemsOf(result, 10)).toEqual(['bin_type: Bin type OLD1 is no longer in use; choose a current one.']);
  });
  test('empty bin type and depot cells', () => {
    expect(problemsOf(result, 11)).toEqual(['bin_type: Give the bin type code.', "depot: Give the depot's site code."]);
  });
  test('a month that is not YYYY-MM, and a test month before manufacture', () => {
    expect(problemsOf(result, 12)).toEqual(['manufacture_month: Month of manufacture must look like 2024-03.']);
    expect(problemsOf(result, 13)).toEqual(['last_intermediate_test_month: A test month looks like 2025-06 and is not before manufacture.']);
  });
  test("a malformed UN mark gives the parser's reason", () => {
    expect(problemsOf(result, 14)).toEqual([
      'un_marking: Packing-group letter "Q" is not X, Y or Z',
      'manufacture_month: Give the month of manufacture (YYYY-MM) or a UN mark that carries it.',
    ]);
  });
  test("a UN mark of another type code than the bin type's", () => {
    expect(problemsOf(result, 15)).toEqual(["un_marking: The mark's type code is 31HA2, but bin type T1000 is 31HA1."]);
  });
  test('a month of manufacture that contradicts the UN mark', () => {
    expect(problemsOf(result, 16)).toEqual(['manufacture_month: The UN mark says manufactured 2001-05, not 2001-06.']);
  });
  test('a line with more cells than the header', () => {
    expect(problemsOf(result, 17)).toEqual(['(line): This line has 8 cells; the header names 7. Check for a stray "," or an unquoted cell.']);
  });
  test('a GRAI a spreadsheet turned into a number, or one without serial', () => {
    expect(problemsOf(result, 18)[0]).toMatch(/^grai: .*The spreadsheet turned this GRAI into a number/);
    expect(problemsOf(result, 19)).toEqual([
      'grai: Too short: a GRAI needs 14 digits before the serial (filler 0, 12 digits of company prefix and asset type, check digit); got 13',
    ]);
  });
  test('no month of manufacture and no mark that carries one', () => {
    expect(problemsOf(result, 20)).toEqual(['manufacture_month: Give the month of manufacture (YYYY-MM) or a UN mark that carries it.']);
  });
  test('codes in small letters and a month a spreadsheet turned into a date are fine', () => {
    const ok = result.find((l) => l.line === 21)!;
    expect(ok.issues).toEqual([]);
    expect(ok.input).toEqual({
      grai: grai('OK21'),
      binTypeId: 2,
      siteId: 10,
      unMarking: null,
      manufactureMonth: '2024-05',
      lastIntermediateTestMonth: null,
      lastFullInspectionMonth: null,
    });
  });
  test('only lines without problems carry what to register', () => {
    expect(result.filter((l) => l.input).map((l) => l.line)).toEqual([21]);
    expect(importCounts(result)).toEqual({ total: 20, ready: 1, withProblems: 19 });
  });
  test('a line with an unclosed quote says so', () => {
    const broken = check(`${HEADER}\n${G1},T1250,DEP-A,2024-05,,,\n${G2},T1250,DEP-A,2024-05,"31HA1/Y,,\n`);
    expect(problemsOf(broken, 3)).toContain('(line): A quoted cell is never closed: a " is missing, so the rest of the file ran into this cell.');
  });
});

describe('a clean line registers with the month from its UN mark', () => {
  test('the published example mark gives May 2001', () => {
    const [line] = check(`${HEADER}\n${TDS_GRAI},T1000,DEP-A,,${COMPOSITE_MARK},,2010-03\n`);
    expect(line!.issues).toEqual([]);
    expect(line!.input).toEqual({
      grai: TDS_GRAI,
      binTypeId: 1,
      siteId: 10,
      unMarking: COMPOSITE_MARK,
      manufactureMonth: null,
      lastIntermediateTestMonth: null,
      lastFullInspectionMonth: '2010-03',
    });
  });
  test('graisInLines collects the canonical GRAIs to look up, grouped or not', () => {
    const found = graisInLines(lines(`${HEADER}\n0 0614141 12345 2 · 400,T1000,DEP-A,,,,\n${WRONG_CHECK},T1000,DEP-A,,,,\n`), 7);
    expect(found).toEqual([TDS_GRAI]);
  });
});

describe('templateCsv', () => {
  test('the template reads back through the importer with no problems', () => {
    const csv = templateCsv({
      companyPrefix: '0614141',
      binTypes: [
        { code: 'T1000', graiAssetType: '12345', unCode: '31HA1' },
        { code: 'T1250', graiAssetType: '12345', unCode: null },
      ],
      depotCode: 'DEP-A',
    });
    expect(csv.split('\r\n')[0]).toBe(HEADER);
    const result = check(csv);
    expect(result).toHaveLength(2);
    expect(result.flatMap((l) => l.issues)).toEqual([]);
  });
});

describe('exportCsvChunk', () => {
  const row: ExportRow = {
    grai: TDS_GRAI,
    serial: '400',
    bin_type: 'T1000',
    status: 'on_hire',
    site: 'CUS-1',
    customer: '=HYPERLINK("x"), Ltd',
    manufacture_month: '2001-05',
    un_marking: COMPOSITE_MARK,
    trip_count: 12,
    last_inspection_on: '2024-03-01',
    last_full_inspection_on: null,
    next_intermediate_due: '2026-09-30',
    next_full_due: '2029-03-31',
    next_due: '2026-09-30',
  };
  test('the header comes only with the first chunk', () => {
    const first = exportCsvChunk([row], true);
    const next = exportCsvChunk([row], false);
    expect(first.split('\r\n')[0]).toBe(EXPORT_COLUMNS.join(','));
    expect(next.startsWith(TDS_GRAI)).toBe(true);
    expect(exportCsvChunk([], false)).toBe('');
  });
  test('cells read back unchanged, except a formula is escaped for spreadsheets', () => {
    const back = Papa.parse<string[]>(exportCsvChunk([row], true), { skipEmptyLines: true }).data;
    expect(back[1]).toEqual([
      TDS_GRAI,
      '400',
      'T1000',
      'on_hire',
      'CUS-1',
      '\'=HYPERLINK("x"), Ltd',
      '2001-05',
      COMPOSITE_MARK,
      '12',
      '2024-03-01',
      '',
      '2026-09-30',
      '2029-03-31',
      '2026-09-30',
    ]);
  });
});
