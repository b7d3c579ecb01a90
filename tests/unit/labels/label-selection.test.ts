import { describe, test, expect } from 'vitest';
import { MAX_LABELS_PER_RUN, formatIdList, labelQueryString, parseIdList, parseLabelQuery, resolveRange, splitPastedList, statusesFor } from '@/lib/labels/label-selection';

// Input handling of label runs. GRAI test values: company prefix 9521234 (GS1 prefix 952 is reserved for
// demonstrations [memory]); body 952123410010 has check digit 2 by the GS1 mod-10 rule (GS1 General
// Specifications), worked by hand: digits from the right weighted 3,1,3,…:
// 0·3+1·1+0·3+0·1+1·3+4·1+3·3+2·1+1·3+2·1+5·3+9·1 = 48 → 2.
const FIXED = '09521234100102';
const g = (serial: string) => FIXED + serial;

describe('compact id lists', () => {
  test('reads single ids and ranges, keeping the order given', () => {
    expect(parseIdList('3,1,7-9')).toEqual({ ok: true, ids: [3, 1, 7, 8, 9] });
    expect(parseIdList(' 5 , 6 ')).toEqual({ ok: true, ids: [5, 6] });
  });
  test('drops repeats, keeping the first', () => {
    expect(parseIdList('4,2,4,1-3')).toEqual({ ok: true, ids: [4, 2, 1, 3] });
  });
  test('refuses junk, backwards ranges and zero with a message', () => {
    expect(parseIdList('1,abc')).toMatchObject({ ok: false, message: expect.stringContaining('abc') });
    expect(parseIdList('9-3')).toMatchObject({ ok: false, message: expect.stringContaining('3-9') });
    expect(parseIdList('0')).toMatchObject({ ok: false });
    expect(parseIdList('')).toMatchObject({ ok: false, message: expect.stringContaining('empty') });
  });
  test(`refuses more than ${MAX_LABELS_PER_RUN} ids without expanding a huge range`, () => {
    const t0 = Date.now();
    expect(parseIdList('1-999999999')).toMatchObject({ ok: false, message: expect.stringContaining('1,200') });
    expect(Date.now() - t0).toBeLessThan(50);
    expect(parseIdList('1-1200')).toMatchObject({ ok: true });
    expect(parseIdList('1-1200,5000')).toMatchObject({ ok: false });
  });
  test('writes runs of three or more as a-b, and reads back the same list', () => {
    const ids = [1, 2, 3, 4, 9, 10, 20, 19, 18, 30, 31, 32];
    expect(formatIdList(ids)).toBe('1-4,9,10,20,19,18,30-32');
    expect(parseIdList(formatIdList(ids))).toEqual({ ok: true, ids });
  });
});

describe('pasted lists', () => {
  test('one entry per line, comma, semicolon or cell; grouped GRAIs stay whole', () => {
    expect(splitPastedList(`${g('1')}\r\n0 9521234 10010 8 · 2\n\n  ;${g('3')},${g('4')}\t${g('5')}  `)).toEqual([g('1'), '0 9521234 10010 8 · 2', g('3'), g('4'), g('5')]);
  });
});

describe('ranges of serials or GRAIs', () => {
  test('digit-only serials compare as numbers', () => {
    expect(resolveRange('99', '100', 7)).toEqual({ ok: true, range: { fixedPart: null, low: '99', high: '100', numeric: true, swapped: false } });
  });
  test('ends given high to low are swapped and say so', () => {
    expect(resolveRange('100026', '100001', 7)).toMatchObject({ ok: true, range: { low: '100001', high: '100026', swapped: true } });
  });
  test('letters make it a text range', () => {
    expect(resolveRange('A0010', 'A0100', 7)).toMatchObject({ ok: true, range: { numeric: false, low: 'A0010', high: 'A0100' } });
  });
  test('a GRAI at an end fixes prefix and asset type; a Digital Link works as well', () => {
    expect(resolveRange(g('100001'), `https://id.example.org/8003/${g('100026')}`, 7)).toEqual({
      ok: true,
      range: { fixedPart: FIXED, low: '100001', high: '100026', numeric: true, swapped: false },
    });
    expect(resolveRange('100001', g('100026'), 7)).toMatchObject({ ok: true, range: { fixedPart: FIXED } });
  });
  test('GRAIs of two asset types cannot bound one range', () => {
    // 952123412510 → check digit 5 by the same rule, worked by hand:
    // 0·3+1·1+5·3+2·1+1·3+4·1+3·3+2·1+1·3+2·1+5·3+9·1 = 65 → 5.
    const r = resolveRange(g('1'), '09521234125105' + '7', 7);
    expect(r).toMatchObject({ ok: false, issues: [{ field: 'to', message: expect.stringContaining('share company prefix') }] });
  });
  test('a GRAI with a wrong check digit, or text that is no serial, is explained', () => {
    const r = resolveRange('09521234100107100001', 'bad serial with spaces', 7);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues.map((i) => i.field)).toEqual(['from', 'to']);
      expect(r.issues[0]!.message).toMatch(/Wrong check digit: 7 given, 2 expected/);
      expect(r.issues[1]!.message).toMatch(/neither a bin serial nor a GRAI/);
    }
  });
  test('a mistyped GRAI short enough to be a serial is still read as a GRAI attempt', () => {
    const r = resolveRange('0952123410010' + '9' + '7', '100026', 7);
    expect(r).toMatchObject({ ok: false, issues: [{ field: 'from', message: expect.stringMatching(/check digit/) }] });
  });
});

describe('the label query', () => {
  test('no selection yet on a first visit: defaults A4 from label 1', () => {
    expect(parseLabelQuery({})).toEqual({ ok: true, query: { selection: null, options: { stock: 'a4-3x8', startAt: 1 } } });
  });
  test('a range', () => {
    expect(parseLabelQuery({ by: 'range', from: ' 100001 ', to: '100026', stock: 'letter-3x10', start: '5' })).toEqual({
      ok: true,
      query: { selection: { by: 'range', from: '100001', to: '100026' }, options: { stock: 'letter-3x10', startAt: 5 } },
    });
  });
  test('a filter from a form: empty fields mean "any"; status defaults to in service', () => {
    expect(parseLabelQuery({ by: 'filter', site: '', type: '3', status: '', unprinted: 'on' })).toMatchObject({
      ok: true,
      query: { selection: { by: 'filter', siteId: null, binTypeId: 3, status: 'in_service', neverPrinted: true } },
    });
  });
  test('ids alone select by id', () => {
    expect(parseLabelQuery({ ids: '1,2,3' })).toMatchObject({ ok: true, query: { selection: { by: 'ids', ids: [1, 2, 3] } } });
  });
  test('a pasted list', () => {
    expect(parseLabelQuery({ by: 'list', grais: `${g('1')}\n${g('2')}` })).toMatchObject({ ok: true, query: { selection: { by: 'list', entries: [g('1'), g('2')] } } });
  });
  test('bad input gives messages per field, never a throw', () => {
    const cases: Array<[Record<string, string>, string, RegExp]> = [
      [{ by: 'sideways' }, 'by', /how to pick bins/],
      [{ by: 'range', from: '', to: '5' }, 'from', /first serial/],
      [{ by: 'filter', site: 'x' }, 'site', /site from the list/],
      [{ by: 'filter', site: '-4' }, 'site', /site from the list/],
      [{ by: 'filter', status: 'lost' }, 'status', /status from the list/],
      [{ by: 'ids', ids: '1,,two' }, 'ids', /two/],
      [{ by: 'list', grais: ' \n ' }, 'grais', /Paste at least one/],
      [{ by: 'list', grais: Array.from({ length: 1201 }, (_, i) => g(String(i))).join('\n') }, 'grais', /1,201 entries/],
      [{ stock: 'a5' }, 'stock', /label stock/],
      [{ stock: 'a4-3x8', start: '25' }, 'start', /1 to 24/],
      [{ start: '2.5' }, 'start', /whole number/],
      [{ start: 'abc' }, 'start', /give a number/],
    ];
    for (const [input, field, message] of cases) {
      const r = parseLabelQuery(input);
      expect(r.ok, JSON.stringify(input).slice(0, 80)).toBe(false);
      if (!r.ok) expect(r.issues.find((i) => i.field === field)?.message, field).toMatch(message);
    }
  });
  test('Letter accepts start 30, A4 does not', () => {
    expect(parseLabelQuery({ stock: 'letter-3x10', start: '30' }).ok).toBe(true);
    expect(parseLabelQuery({ stock: 'a4-3x8', start: '30' }).ok).toBe(false);
  });
  test('a query string reads back to the same selection', () => {
    const sel = { by: 'filter', siteId: 4, status: 'available', binTypeId: null, neverPrinted: true } as const;
    const qs = labelQueryString(sel, { stock: 'letter-3x10', startAt: 7 });
    expect(parseLabelQuery(Object.fromEntries(new URLSearchParams(qs)))).toEqual({ ok: true, query: { selection: sel, options: { stock: 'letter-3x10', startAt: 7 } } });
    const ids = labelQueryString({ by: 'ids', ids: [5, 6, 7, 8, 2] }, { stock: 'a4-3x8', startAt: 1 });
    expect(ids).toBe('by=ids&ids=5-8%2C2&stock=a4-3x8&start=1');
  });
  test('status filters: in service leaves only retired out', () => {
    expect(statusesFor('in_service')).not.toContain('retired');
    expect(statusesFor('in_service')).toHaveLength(8);
    expect(statusesFor('any')).toBeNull();
    expect(statusesFor('missing')).toEqual(['missing']);
  });
});
