import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import {
  Binds,
  GridQueryError,
  binsCountQuery,
  binsExportQuery,
  binsPageQuery,
  orderBy,
  parseFilterModel,
  parseGridRequest,
  parseSortModel,
  whereClause,
  BIN_COLUMN_IDS,
  MAX_PAGE_ROWS,
  type QueryContext,
} from '@/lib/fleet/grid-query';
import { BUILTIN_VIEWS, parseViewState } from '@/lib/fleet/grid-views';

const CTX: QueryContext = { timeZone: 'Europe/Amsterdam', today: '2026-12-01' };

function where(model: unknown) {
  const b = new Binds(CTX);
  const sql = whereClause(parseFilterModel(model), b, CTX);
  return { sql, bind: b.values };
}

function refusal(fn: () => unknown): GridQueryError {
  try {
    fn();
  } catch (e) {
    if (e instanceof GridQueryError) return e;
    throw e;
  }
  throw new Error('expected a GridQueryError');
}

describe('filter model → WHERE fragment with bind values', () => {
  test('an empty model filters nothing', () => {
    expect(where({})).toEqual({ sql: 'TRUE', bind: [] });
    expect(where(undefined)).toEqual({ sql: 'TRUE', bind: [] });
  });

  test('text contains is a case-insensitive LIKE whose wildcards in the typed text are escaped', () => {
    expect(where({ serial: { filterType: 'text', type: 'contains', filter: '12%_3\\' } })).toEqual({
      sql: 'a.serial ILIKE $1::text',
      bind: ['%12\\%\\_3\\\\%'],
    });
  });

  test('text equals on identifiers is exact; startsWith and endsWith anchor the pattern', () => {
    expect(where({ grai: { filterType: 'text', type: 'equals', filter: ' 09521234100108000417 ' } })).toEqual({ sql: 'a.grai = $1::text', bind: ['09521234100108000417'] });
    expect(where({ linerLot: { filterType: 'text', type: 'startsWith', filter: 'LL-' } }).bind).toEqual(['LL-%']);
    expect(where({ linerLot: { filterType: 'text', type: 'endsWith', filter: '-7' } }).bind).toEqual(['%-7']);
  });

  test('set filters bind one array; null stands for "none"; an empty set matches nothing', () => {
    expect(where({ status: { filterType: 'set', values: ['on_hire', 'awaiting_collection'] } })).toEqual({
      sql: 'a.status = ANY($1::text[])',
      bind: [['on_hire', 'awaiting_collection']],
    });
    expect(where({ customer: { filterType: 'set', values: [4, null] } })).toEqual({
      sql: '(a.customer_id = ANY($1::int[]) OR a.customer_id IS NULL)',
      bind: [[4]],
    });
    expect(where({ site: { filterType: 'set', values: [] } })).toEqual({ sql: 'FALSE', bind: [] });
  });

  test('number comparisons and ranges (range ends in either order)', () => {
    expect(where({ tripCount: { filterType: 'number', type: 'greaterThanOrEqual', filter: 10 } })).toEqual({ sql: 'a.trip_count >= $1::int', bind: [10] });
    expect(where({ tripCount: { filterType: 'number', type: 'inRange', filter: 9, filterTo: 3 } })).toEqual({ sql: 'a.trip_count BETWEEN $1::int AND $2::int', bind: [3, 9] });
    expect(where({ tripCount: { filterType: 'number', type: 'blank' } })).toEqual({ sql: 'a.trip_count IS NULL', bind: [] });
  });

  test('a date equal to a day on a DATE column is the half-open day [d, d+1)', () => {
    expect(where({ nextDue: { filterType: 'date', type: 'equals', dateFrom: '2027-02-28 00:00:00' } })).toEqual({
      sql: '(a.next_due >= $1::date AND a.next_due < $2::date)',
      bind: ['2027-02-28', '2027-03-01'],
    });
    expect(where({ nextDue: { filterType: 'date', type: 'lessThan', dateFrom: '2026-12-01' } })).toEqual({ sql: 'a.next_due < $1::date', bind: ['2026-12-01'] });
  });

  test('a date on an instant column compares with local midnight in the operator zone', () => {
    expect(where({ lastScanAt: { filterType: 'date', type: 'greaterThan', dateFrom: '2026-11-30' } })).toEqual({
      sql: 'a.last_scan_at >= ($1::date::timestamp AT TIME ZONE $2::text)',
      bind: ['2026-12-01', 'Europe/Amsterdam'],
    });
  });

  test('"at least 30 days since the last scan" is a bound on the scan instant: before local midnight of today − 29', () => {
    // days ≥ 30 ⇔ local day of the scan ≤ 2026-11-01 ⇔ scan < 2026-11-02 00:00 Amsterdam time.
    expect(where({ daysSilent: { filterType: 'number', type: 'greaterThanOrEqual', filter: 30 } })).toEqual({
      sql: 'a.last_scan_at < ($1::date::timestamp AT TIME ZONE $2::text)',
      bind: ['2026-11-02', 'Europe/Amsterdam'],
    });
    // days = 0 ⇔ the scan happened today (local).
    expect(where({ daysAtSite: { filterType: 'number', type: 'equals', filter: 0 } }).bind).toEqual(['2026-12-01', 'Europe/Amsterdam', '2026-12-02']);
    // days in 7..14 ⇔ local day in [today − 14, today − 7].
    expect(where({ daysAtSite: { filterType: 'number', type: 'inRange', filter: 14, filterTo: 7 } }).bind).toEqual(['2026-11-25', 'Europe/Amsterdam', '2026-11-17']);
  });

  test('flags are predicates read as IS TRUE / IS NOT TRUE (a bin with no due date is not overdue)', () => {
    expect(where({ overdue: { filterType: 'boolean', value: true } })).toEqual({ sql: '(a.next_due < $1::date) IS TRUE', bind: ['2026-12-01'] });
    expect(where({ overdue: { filterType: 'boolean', value: false } }).sql).toBe('(a.next_due < $1::date) IS NOT TRUE');
    expect(where({ dueThisMonth: { filterType: 'boolean', value: true } })).toEqual({ sql: '(a.next_due <= $1::date) IS TRUE', bind: ['2026-12-31'] });
    // Counted from the delivery (or the dispatch) of the current trip, as overdue-return.ts does; not from site_since.
    // Each term is the trip's tariff version in force on its local dispatch day, else the customer's column or the default.
    // One look-up of that version per bin; without one, the customer's column and the default terms.
    const start = (starts: string) => `CASE WHEN ${starts} = 'dispatch' THEN t.dispatched_at ELSE COALESCE(t.delivered_at, t.dispatched_at) END`;
    const version =
      `(SELECT ${start('v.hire_starts_at')} < (($1::date - v.free_days + CASE WHEN v.first_day_counts THEN 1 ELSE 0 END)::timestamp AT TIME ZONE $2::text)` +
      ' FROM tariffs v WHERE v.customer_id = t.customer_id AND v.valid_from <= (t.dispatched_at AT TIME ZONE $2::text)::date' +
      ' AND (v.valid_to IS NULL OR v.valid_to >= (t.dispatched_at AT TIME ZONE $2::text)::date))';
    const fallback = `${start("'delivery'")} < (($1::date - o.free_days + CASE WHEN false THEN 1 ELSE 0 END)::timestamp AT TIME ZONE $2::text)`;
    expect(where({ overFreeDays: { filterType: 'boolean', value: true } })).toEqual({
      sql: `((a.status IN ('on_hire', 'awaiting_collection') AND COALESCE(${version}, ${fallback}))) IS TRUE`,
      bind: ['2026-12-01', 'Europe/Amsterdam'],
    });
    expect(where({ dueSoon: { filterType: 'boolean', value: true } })).toEqual({ sql: '(a.next_due BETWEEN $1::date AND $1::date + 30) IS TRUE', bind: ['2026-12-01'] });
  });

  test('combined conditions join with the given operator; several columns join with AND', () => {
    const r = where({
      serial: {
        filterType: 'text',
        operator: 'OR',
        conditions: [
          { filterType: 'text', type: 'startsWith', filter: 'A' },
          { filterType: 'text', type: 'startsWith', filter: 'B' },
        ],
      },
      status: { filterType: 'set', values: ['quarantine'] },
    });
    expect(r.sql).toBe('(a.serial ILIKE $1::text OR a.serial ILIKE $2::text)\n   AND a.status = ANY($3::text[])');
    expect(r.bind).toEqual(['A%', 'B%', ['quarantine']]);
  });

  test('nothing the client types ever lands in the SQL text', () => {
    // Every typed text carries a marker character no SQL of ours contains; it must reach the bind values only.
    fc.assert(
      fc.property(fc.string({ maxLength: 40 }), fc.constantFrom('contains', 'equals', 'startsWith', 'notContains'), (text, type) => {
        const typed = `§${text}§`;
        const r = where({ grai: { filterType: 'text', type, filter: typed }, linerLot: { filterType: 'text', type: 'endsWith', filter: typed } });
        expect(r.sql).not.toContain('§');
        expect(r.bind.every((v) => typeof v === 'string' && v.includes('§'))).toBe(true);
      }),
      { numRuns: 300 },
    );
    const hostile = where({ serial: { filterType: 'text', type: 'contains', filter: "x'; DROP TABLE assets; --" } });
    expect(hostile.sql).toBe('a.serial ILIKE $1::text');
  });
});

describe('refusals name the problem and what is allowed', () => {
  test('an unknown column', () => {
    const e = refusal(() => parseFilterModel({ password_hash: { filterType: 'text', type: 'contains', filter: 'x' } }));
    expect(e.issues[0]!.path).toBe('filterModel.password_hash');
    expect(e.message).toMatch(/unknown column "password_hash"; the columns are grai, serial/);
    expect(refusal(() => parseSortModel([{ colId: 'a.id; DROP TABLE x', sort: 'asc' }])).message).toMatch(/unknown column/);
  });

  test('an operator the column does not offer', () => {
    expect(refusal(() => parseFilterModel({ grai: { filterType: 'text', type: 'regex', filter: '.*' } })).message).toMatch(
      /text operator "regex" is not supported here; use one of contains/,
    );
    expect(refusal(() => parseFilterModel({ tripCount: { filterType: 'number', type: 'contains', filter: 1 } })).message).toMatch(/number operator "contains"/);
    expect(refusal(() => parseFilterModel({ serial: { filterType: 'text', operator: 'XOR', conditions: [] } })).message).toMatch(/operator "XOR"/);
  });

  test('a filter type that does not fit the column', () => {
    expect(refusal(() => parseFilterModel({ grai: { filterType: 'number', type: 'equals', filter: 1 } })).message).toMatch(/GRAI takes a "text" filter, not "number"/);
    expect(refusal(() => parseFilterModel({ status: { filterType: 'text', type: 'equals', filter: 'on_hire' } })).message).toMatch(/takes a "set" filter/);
  });

  test('malformed values', () => {
    expect(refusal(() => parseFilterModel({ status: { filterType: 'set', values: ['lost'] } })).message).toMatch(/status "lost"/);
    expect(refusal(() => parseFilterModel({ site: { filterType: 'set', values: ['1 OR 1=1'] } })).message).toMatch(/record id/);
    expect(refusal(() => parseFilterModel({ tripCount: { filterType: 'number', type: 'equals', filter: 2.5 } })).message).toMatch(/whole number/);
    expect(refusal(() => parseFilterModel({ nextDue: { filterType: 'date', type: 'equals', dateFrom: '2027-02-30' } })).message).toMatch(/YYYY-MM-DD/);
    expect(refusal(() => parseFilterModel({ nextDue: { filterType: 'date', type: 'equals', dateFrom: "2027-02-01'--" } })).message).toMatch(/YYYY-MM-DD/);
    expect(refusal(() => parseFilterModel({ overdue: { filterType: 'boolean', value: 'yes' } })).message).toMatch(/true or false/);
    expect(refusal(() => parseFilterModel({ daysAtSite: { filterType: 'number', type: 'equals', filter: 10_000_000 } })).message).toMatch(/between/);
  });

  test('sorting: flags are not sortable, a column once, directions asc/desc only', () => {
    expect(refusal(() => parseSortModel([{ colId: 'overdue', sort: 'asc' }])).message).toMatch(/cannot be sorted/);
    expect(
      refusal(() =>
        parseSortModel([
          { colId: 'grai', sort: 'asc' },
          { colId: 'grai', sort: 'desc' },
        ]),
      ).message,
    ).toMatch(/sorted twice/);
    expect(refusal(() => parseSortModel([{ colId: 'grai', sort: 'up' }])).message).toMatch(/"asc" or "desc"/);
  });

  test(`a page holds at most ${MAX_PAGE_ROWS} rows and the window must make sense`, () => {
    expect(refusal(() => parseGridRequest({ startRow: 0, endRow: 501 })).message).toMatch(/at most 500 rows/);
    expect(refusal(() => parseGridRequest({ startRow: 100, endRow: 100 })).message).toMatch(/above startRow/);
    expect(refusal(() => parseGridRequest({ startRow: -1, endRow: 10 })).message).toMatch(/from 0/);
    expect(parseGridRequest({ startRow: 90_000, endRow: 90_500 })).toMatchObject({ startRow: 90_000, endRow: 90_500 });
  });
});

describe('ordering', () => {
  test('defaults to GRAI; otherwise the sort terms, then the id (walking the same way as the first term)', () => {
    expect(orderBy([])).toBe('a.grai ASC');
    expect(
      orderBy(
        parseSortModel([
          { colId: 'nextDue', sort: 'asc' },
          { colId: 'site', sort: 'desc' },
        ]),
      ),
    ).toBe('a.next_due ASC, s.name DESC, a.id ASC');
    expect(orderBy(parseSortModel([{ colId: 'nextDue', sort: 'desc' }]))).toBe('a.next_due DESC, a.id DESC');
    expect(
      orderBy(
        parseSortModel([
          { colId: 'tripCount', sort: 'desc' },
          { colId: 'grai', sort: 'asc' },
        ]),
      ),
    ).toBe('a.trip_count DESC, a.grai ASC');
  });

  test('more days at site = an earlier arrival, so the day count sorts on the instant, reversed', () => {
    expect(orderBy(parseSortModel([{ colId: 'daysAtSite', sort: 'desc' }]))).toBe('a.site_since ASC NULLS LAST, a.id ASC');
    expect(orderBy(parseSortModel([{ colId: 'daysAtSite', sort: 'asc' }]))).toBe('a.site_since DESC NULLS FIRST, a.id DESC');
  });
});

describe('whole statements', () => {
  test('the page picks its ids first, then joins only those rows; the count shares the filter', () => {
    const req = parseGridRequest({
      startRow: 200,
      endRow: 300,
      sortModel: [{ colId: 'nextDue', sort: 'asc' }],
      filterModel: { status: { filterType: 'set', values: ['on_hire'] } },
    });
    const page = binsPageQuery(req, CTX);
    expect(page.text).toMatch(/WHERE a\.id = ANY\(ARRAY\(\n {2}SELECT a\.id FROM assets a/);
    expect(page.text).toContain('LIMIT $2::int OFFSET $3::int');
    expect(page.values.slice(0, 3)).toEqual([['on_hire'], 100, 200]);
    expect(page.values).toContain('Europe/Amsterdam');
    const count = binsCountQuery(req.filterModel, CTX);
    expect(count.text).toBe('SELECT count(*)::int AS n FROM (SELECT 1 FROM assets a\nWHERE a.status = ANY($1::text[])\nLIMIT $2::int) capped');
    expect(count.values).toEqual([['on_hire'], 1_000_001]);
  });

  test('the id-picking query joins only the tables its filter and sort use (so an index-only scan stays possible)', () => {
    const inner = (raw: Parameters<typeof parseGridRequest>[0]) => binsPageQuery(parseGridRequest(raw), CTX).text.split('ARRAY(')[1]!.split('LIMIT')[0]!;
    expect(inner({ sortModel: [{ colId: 'nextDue', sort: 'asc' }] })).not.toMatch(/JOIN/);
    expect(inner({ sortModel: [{ colId: 'site', sort: 'asc' }] })).toMatch(/LEFT JOIN sites s ON s\.id = a\.site_id/);
    expect(inner({ sortModel: [{ colId: 'site', sort: 'asc' }] })).not.toMatch(/organisations|liner_lots|bin_types/);
    expect(inner({ filterModel: { overFreeDays: { filterType: 'boolean', value: true } } })).toMatch(/LEFT JOIN organisations o/);
    expect(inner({ filterModel: { overFreeDays: { filterType: 'boolean', value: true } } })).toMatch(/LEFT JOIN trips t ON t\.id = a\.current_trip_id/);
    expect(inner({ filterModel: { daysSilent: { filterType: 'number', type: 'greaterThan', filter: 3 } } })).not.toMatch(/trips/);
    expect(inner({ filterModel: { linerLot: { filterType: 'text', type: 'contains', filter: 'x' } } })).toMatch(/LEFT JOIN liner_lots ll/);
  });

  test('every placeholder in a statement has exactly one bind value', () => {
    const req = parseGridRequest({
      startRow: 0,
      endRow: 100,
      sortModel: [{ colId: 'daysAtSite', sort: 'desc' }],
      filterModel: {
        daysSilent: { filterType: 'number', type: 'greaterThan', filter: 3 },
        overFreeDays: { filterType: 'boolean', value: true },
        lastScanAt: { filterType: 'date', type: 'inRange', dateFrom: '2026-01-01', dateTo: '2026-06-30' },
      },
    });
    for (const s of [binsPageQuery(req, CTX), binsCountQuery(req.filterModel, CTX), binsExportQuery(req, CTX)]) {
      const used = new Set([...s.text.matchAll(/\$(\d+)/g)].map((m) => Number(m[1])));
      expect([...used].sort((a, b) => a - b)).toEqual(s.values.map((_, i) => i + 1));
    }
  });
});

describe('saved view state', () => {
  test('the built-in views are valid states', () => {
    for (const v of BUILTIN_VIEWS) expect(parseViewState(v.state)).toEqual(v.state);
  });
  test('a view naming an unknown column is refused', () => {
    expect(() => parseViewState({ filterModel: {}, sortModel: [], columns: [{ colId: 'secret', hide: false }] })).toThrow(/unknown column "secret"/);
    expect(() => parseViewState({ filterModel: { nope: {} }, sortModel: [] })).toThrow(GridQueryError);
  });
  test('every column id is covered by a label', () => {
    expect(BIN_COLUMN_IDS.length).toBeGreaterThan(12);
  });
});
