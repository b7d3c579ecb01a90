// The one CSV writer (src/lib/csv.ts), read back with the tests' own RFC 4180
// reader (tests/unit/support/rfc4180.ts), not with papaparse, which the writer uses.
// Which leading characters make a spreadsheet run a cell: OWASP, "CSV Injection"
// (= + - @ tab carriage-return); the apostrophe prefix is its recommended defence.
import { describe, test, expect } from 'vitest';
import { csvLines, csvTable, neutralised } from '@/lib/csv';
import { csvResponse, safeFileName } from '@/lib/http/csv-response';
import { readCsv, runsAsFormula } from './support/rfc4180';

describe('text that would run as a formula is neutralised', () => {
  test.each([
    ['=HYPERLINK("a")', `'=HYPERLINK("a")`],
    ['+SUM(A1:A2)', `'+SUM(A1:A2)`],
    ['-2+3', `'-2+3`],
    ['@SUM(A1)', `'@SUM(A1)`],
    ['\tTAB', `'\tTAB`],
    ['\rCR', `'\rCR`],
    ['-', `'-`],
    // plain decimal numbers written as text are constants, not formulas
    ['-12.50', '-12.50'],
    ['-3', '-3'],
    // the characters elsewhere in the text are harmless
    ['a=b', 'a=b'],
    ['Dent, 2 cm', 'Dent, 2 cm'],
    ['', ''],
  ])('%j → %j', (input, shown) => {
    const cell = readCsv(csvLines([[input]]))[0]![0]!;
    expect(cell.text).toBe(shown);
    expect(neutralised(input)).toBe(shown);
    expect(runsAsFormula(cell.text)).toBe(false);
  });
});

describe('numbers stay numbers', () => {
  test.each([
    [-12.5, '-12.5'],
    [0, '0'],
    [-0, '0'],
    [12, '12'],
    [2.46, '2.46'],
    [Number.NaN, ''],
    [Number.POSITIVE_INFINITY, ''],
  ])('%d is written unquoted as %j', (n, text) => {
    const cell = readCsv(csvLines([[n]]))[0]![0]!;
    expect(cell).toEqual({ text, quoted: false });
  });
});

describe('RFC 4180 framing', () => {
  test('CRLF after every line, quotes doubled, commas and line breaks quoted, null as empty', () => {
    const text = csvTable(
      ['serial', 'note', 'count'],
      [
        ['A"1', 'one, two', 3],
        ['B2', 'line\nbreak', null],
      ],
    );
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.split('\r\n').length).toBe(4);
    expect(readCsv(text).map((r) => r.map((c) => c.text))).toEqual([
      ['serial', 'note', 'count'],
      ['A"1', 'one, two', '3'],
      ['B2', 'line\nbreak', ''],
    ]);
    expect(csvLines([])).toBe('');
  });
});

describe('csvResponse', () => {
  test('a string: byte-order mark, text/csv, attachment with a safe name, no caching', async () => {
    const res = csvResponse(csvLines([['a', 1]]), 'reuse 2026/01"x.csv');
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="reuse-2026-01-x.csv"');
    expect(res.headers.get('cache-control')).toBe('no-store');
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]); // UTF-8 encoding of U+FEFF
  });
  test('a stream stays a stream, with the mark first; cancelling the download cancels the producer', async () => {
    let cancelled = false;
    const enc = new TextEncoder();
    const source = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(enc.encode('x,1\r\n'));
      },
      cancel() {
        cancelled = true;
      },
    });
    const res = csvResponse(source, 'grid.csv');
    const reader = res.body!.getReader();
    const first = await reader.read();
    expect([...first.value!.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    await reader.cancel();
    await new Promise((r) => setTimeout(r, 10));
    expect(cancelled).toBe(true);
  });
  test.each([
    ['loopfold-bins-2026-12-02.csv', 'loopfold-bins-2026-12-02.csv'],
    ['../../etc/passwd', 'etc-passwd.csv'],
    ['', 'export.csv'],
  ])('file name %j → %j', (name, safe) => expect(safeFileName(name)).toBe(safe));
});
