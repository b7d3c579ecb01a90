/**
 * The fleet grid's query language, translated to SQL. Pure: no I/O.
 *
 * The browser's grid (AG Grid's infinite row model) sends a sort model, a filter model and a row window. Only
 * the column ids in BIN_COLUMNS are accepted, each mapped to a fixed SQL expression written here; every value
 * the client sends travels as a bind parameter ($1, $2, …), never inside the SQL text. Anything outside the
 * supported subset (an unknown column, an operator a column does not offer, a malformed value) is rejected
 * with a GridQueryError that says what was wrong and what is allowed.
 *
 * Day counts and date filters on instants use the operator's time zone: a bin that arrived at 23:30 local
 * time yesterday has been on site 1 day today, whatever the server's zone.
 *
 * Filter model subset (the AG Grid shapes, plus two of Loopfold's own):
 *   text     { filterType: 'text', type: contains|notContains|equals|notEqual|startsWith|endsWith|blank|notBlank, filter }
 *   number   { filterType: 'number', type: equals|notEqual|lessThan|lessThanOrEqual|greaterThan|greaterThanOrEqual|inRange|blank|notBlank, filter, filterTo }
 *   date     { filterType: 'date', type: (as number), dateFrom: 'YYYY-MM-DD[ hh:mm:ss]', dateTo }
 *   set      { filterType: 'set', values: [...] }          (null in values = "none")
 *   boolean  { filterType: 'boolean', value: true|false }
 *   combined { filterType, operator: 'AND'|'OR', conditions: [2–5 simple conditions of that type] }
 */
import { STATUSES } from '@/lib/scans/lifecycle';
import { addDays, endOfMonth, isLocalDate, monthOf, type LocalDate } from '@/lib/calendar';
import { CONTROL_MESSAGE, DATE_RANGE_MESSAGE, hasControlCharacter, inDateRange } from '@/lib/text-input';
import { overdueBackSql, tripTermSql } from './overdue-return';
import { DUE_SOON_DAYS, testDueSoonSql } from '@/lib/inspections/inspection-due';

export const MAX_PAGE_ROWS = 500;
const MAX_SORT_COLUMNS = 5;
const MAX_SET_VALUES = 500;
const MAX_CONDITIONS = 5;
const MAX_TEXT_LENGTH = 200;
const MAX_START_ROW = 10_000_000;
// Day counts stay inside what addDays can represent, and inside anything a person would type.
const MAX_DAYS = 100_000;
const MAX_NUMBER = 1_000_000_000; // inside PostgreSQL's integer

export class GridQueryError extends Error {
  readonly issues: Array<{ path: string; message: string }>;
  constructor(issues: Array<{ path: string; message: string }>) {
    super(issues.map((i) => `${i.path}: ${i.message}`).join('; '));
    this.name = 'GridQueryError';
    this.issues = issues;
  }
}

function fail(path: string, message: string): never {
  throw new GridQueryError([{ path, message }]);
}

// ---------------------------------------------------------------------------------------------------
// Bind parameters: values are appended in order; the context values (zone, today, month end) are added
// once and only when an expression uses them (PostgreSQL refuses a parameter that nothing references).

export class Binds {
  readonly values: unknown[] = [];
  private readonly named = new Map<string, string>();
  constructor(private readonly ctx: QueryContext) {}

  add(value: unknown, cast: string): string {
    this.values.push(value);
    return `$${this.values.length}::${cast}`;
  }
  private once(key: string, value: unknown, cast: string): string {
    let ref = this.named.get(key);
    if (!ref) {
      ref = this.add(value, cast);
      this.named.set(key, ref);
    }
    return ref;
  }
  tz(): string {
    return this.once('tz', this.ctx.timeZone, 'text');
  }
  today(): string {
    return this.once('today', this.ctx.today, 'date');
  }
  monthEnd(): string {
    return this.once('monthEnd', endOfMonth(monthOf(this.ctx.today)), 'date');
  }
}

export interface QueryContext {
  /** IANA zone of the operator (settings.timeZone). */
  timeZone: string;
  /** Today in that zone, 'YYYY-MM-DD'. */
  today: LocalDate;
}

// ---------------------------------------------------------------------------------------------------
// The whitelist. `value` is the SQL of what the column shows; filters and sorts are derived from a
// column's kind so they stay index-friendly (a day count is filtered as a bound on the instant it counts
// from, which the instant's index can serve).

type SortDir = 'asc' | 'desc';
type Base =
  | { type: 'dateColumn'; column: string } // a DATE column: calendar days already
  | { type: 'instantColumn'; column: string }; // a TIMESTAMPTZ column: compared by local calendar day

export type ColumnSpec =
  | { kind: 'text'; label: string; value: string; exactEquals: boolean }
  | { kind: 'set'; label: string; value: string; sortBy: string; values: 'status' | 'id' }
  | { kind: 'number'; label: string; value: string; cast: 'int' }
  | { kind: 'date'; label: string; base: Base }
  | { kind: 'daysSince'; label: string; base: Base }
  | { kind: 'flag'; label: string; predicate: (b: Binds) => string };

const STATUS_ORDER = `array_position(ARRAY[${STATUSES.map((s) => `'${s}'`).join(',')}]::text[], a.status)`;

/**
 * Bins on hire (or folded at the customer, waiting) for longer than their trip's free days, counted as billing
 * counts them (the tariff in force on the dispatch day): the rule of overdue-return.ts.
 */
function overFreeDays(b: Binds): string {
  return overdueBackSql(b.today(), b.tz());
}

export const BIN_COLUMNS = {
  grai: { kind: 'text', label: 'GRAI', value: 'a.grai', exactEquals: true },
  serial: { kind: 'text', label: 'Serial', value: 'a.serial', exactEquals: true },
  binType: { kind: 'set', label: 'Type', value: 'a.bin_type_id', sortBy: 'bt.code', values: 'id' },
  status: { kind: 'set', label: 'Status', value: 'a.status', sortBy: STATUS_ORDER, values: 'status' },
  site: { kind: 'set', label: 'Site', value: 'a.site_id', sortBy: 's.name', values: 'id' },
  customer: { kind: 'set', label: 'Customer', value: 'a.customer_id', sortBy: 'o.name', values: 'id' },
  daysAtSite: { kind: 'daysSince', label: 'Days at site', base: { type: 'instantColumn', column: 'a.site_since' } },
  lastScanAt: { kind: 'date', label: 'Last scan', base: { type: 'instantColumn', column: 'a.last_scan_at' } },
  daysSilent: { kind: 'daysSince', label: 'Days since last scan', base: { type: 'instantColumn', column: 'a.last_scan_at' } },
  tripCount: { kind: 'number', label: 'Trips', value: 'a.trip_count', cast: 'int' },
  lastInspectionOn: { kind: 'date', label: 'Last inspection', base: { type: 'dateColumn', column: 'a.last_inspection_on' } },
  nextDue: { kind: 'date', label: 'Next test due', base: { type: 'dateColumn', column: 'a.next_due' } },
  linerLot: { kind: 'text', label: 'Liner lot', value: 'll.lot_number', exactEquals: true },
  overdue: { kind: 'flag', label: 'Test overdue', predicate: (b) => `a.next_due < ${b.today()}` },
  dueSoon: { kind: 'flag', label: `Test due within ${DUE_SOON_DAYS} days`, predicate: (b) => testDueSoonSql('a.next_due', b.today()) },
  dueThisMonth: { kind: 'flag', label: 'Test due by month end', predicate: (b) => `a.next_due <= ${b.monthEnd()}` },
  overFreeDays: { kind: 'flag', label: 'Over free days', predicate: overFreeDays },
} as const satisfies Record<string, ColumnSpec>;

export type BinColumnId = keyof typeof BIN_COLUMNS;
export const BIN_COLUMN_IDS = Object.keys(BIN_COLUMNS) as BinColumnId[];

export function isBinColumnId(value: unknown): value is BinColumnId {
  return typeof value === 'string' && Object.hasOwn(BIN_COLUMNS, value);
}

function column(id: unknown, path: string): ColumnSpec {
  if (!isBinColumnId(id)) {
    fail(path, `unknown column ${JSON.stringify(id)}; the columns are ${BIN_COLUMN_IDS.join(', ')}`);
  }
  return BIN_COLUMNS[id];
}

// ---------------------------------------------------------------------------------------------------
// Sorting

export interface SortItem {
  colId: BinColumnId;
  sort: SortDir;
}

/** Checks a sort model from the client: known, sortable columns, each once, at most MAX_SORT_COLUMNS. */
export function parseSortModel(raw: unknown, path = 'sortModel'): SortItem[] {
  if (raw === undefined || raw === null) return [];
  if (!Array.isArray(raw)) fail(path, 'must be a list of { colId, sort }');
  if (raw.length > MAX_SORT_COLUMNS) fail(path, `sort by at most ${MAX_SORT_COLUMNS} columns`);
  const seen = new Set<string>();
  return raw.map((item: unknown, i) => {
    const p = `${path}[${i}]`;
    if (!isPlainObject(item)) fail(p, 'must be { colId, sort }');
    const spec = column(item.colId, `${p}.colId`);
    if (spec.kind === 'flag') fail(`${p}.colId`, `${spec.label} cannot be sorted; filter on it instead`);
    if (item.sort !== 'asc' && item.sort !== 'desc') fail(`${p}.sort`, 'must be "asc" or "desc"');
    if (seen.has(item.colId as string)) fail(`${p}.colId`, `${item.colId} is sorted twice`);
    seen.add(item.colId as string);
    return { colId: item.colId as BinColumnId, sort: item.sort };
  });
}

/** The ORDER BY term of one column, and the direction it actually walks its index. */
function sortTerm(spec: ColumnSpec, dir: SortDir): { sql: string; walks: SortDir } {
  const d = dir === 'asc' ? 'ASC' : 'DESC';
  switch (spec.kind) {
    case 'text':
    case 'number':
      return { sql: `${spec.value} ${d}`, walks: dir };
    case 'set':
      return { sql: `${spec.sortBy} ${d}`, walks: dir };
    case 'date':
      return { sql: `${spec.base.column} ${d}`, walks: dir };
    case 'daysSince':
      // More days = an earlier instant. Bins with no instant (no site while in transit) have no count and
      // sort as if smallest; written so the instant's index serves both directions.
      return dir === 'asc' ? { sql: `${spec.base.column} DESC NULLS FIRST`, walks: 'desc' } : { sql: `${spec.base.column} ASC NULLS LAST`, walks: 'asc' };
    case 'flag':
      throw new Error('flags are not sortable'); // parseSortModel refuses them first
  }
}

/**
 * ORDER BY terms. The bin id breaks ties so pages never overlap or skip (GRAI is unique on its own); it
 * runs the same way as the first term, so a (column, id) index can be walked in one direction, forwards
 * or backwards, and a deep page is read from the index alone.
 */
export function orderBy(sort: SortItem[]): string {
  if (sort.length === 0) return 'a.grai ASC';
  const terms = sort.map((s) => sortTerm(BIN_COLUMNS[s.colId], s.sort));
  const sql = terms.map((t) => t.sql);
  if (!sort.some((s) => s.colId === 'grai')) sql.push(`a.id ${terms[0]!.walks === 'asc' ? 'ASC' : 'DESC'}`);
  return sql.join(', ');
}

// ---------------------------------------------------------------------------------------------------
// Filtering

export type FilterModel = Partial<Record<BinColumnId, FilterCondition>>;
export type FilterCondition = SimpleCondition | CombinedCondition;
export interface CombinedCondition {
  filterType: SimpleCondition['filterType'];
  operator: 'AND' | 'OR';
  conditions: SimpleCondition[];
}
export type SimpleCondition =
  | { filterType: 'text'; type: TextOp; filter?: string }
  | { filterType: 'number'; type: CompareOp; filter?: number; filterTo?: number }
  | { filterType: 'date'; type: CompareOp; dateFrom?: string | null; dateTo?: string | null }
  | { filterType: 'set'; values: Array<string | number | null> }
  | { filterType: 'boolean'; value: boolean };

const TEXT_OPS = ['contains', 'notContains', 'equals', 'notEqual', 'startsWith', 'endsWith', 'blank', 'notBlank'] as const;
const COMPARE_OPS = ['equals', 'notEqual', 'lessThan', 'lessThanOrEqual', 'greaterThan', 'greaterThanOrEqual', 'inRange', 'blank', 'notBlank'] as const;
type TextOp = (typeof TEXT_OPS)[number];
type CompareOp = (typeof COMPARE_OPS)[number];

const FILTER_TYPE_OF_KIND: Record<ColumnSpec['kind'], SimpleCondition['filterType']> = {
  text: 'text',
  set: 'set',
  number: 'number',
  date: 'date',
  daysSince: 'number',
  flag: 'boolean',
};

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function oneOf<T extends string>(value: unknown, allowed: readonly T[], path: string, what: string): T {
  if (typeof value !== 'string' || !(allowed as readonly string[]).includes(value)) {
    fail(path, `${what} ${JSON.stringify(value)} is not supported here; use one of ${allowed.join(', ')}`);
  }
  return value as T;
}

/** Checks a filter model from the client and returns it in canonical form (unknown keys dropped). */
export function parseFilterModel(raw: unknown, path = 'filterModel'): FilterModel {
  if (raw === undefined || raw === null) return {};
  if (!isPlainObject(raw)) fail(path, 'must be an object keyed by column id');
  const out: FilterModel = {};
  for (const [colId, cond] of Object.entries(raw)) {
    const spec = column(colId, `${path}.${colId}`);
    out[colId as BinColumnId] = parseCondition(spec, cond, `${path}.${colId}`);
  }
  return out;
}

function parseCondition(spec: ColumnSpec, raw: unknown, path: string): FilterCondition {
  if (!isPlainObject(raw)) fail(path, 'must be a filter condition object');
  const expected = FILTER_TYPE_OF_KIND[spec.kind];
  if (raw.filterType !== expected) {
    fail(`${path}.filterType`, `${spec.label} takes a "${expected}" filter, not ${JSON.stringify(raw.filterType)}`);
  }
  if ('operator' in raw || 'conditions' in raw) {
    const operator = oneOf(raw.operator, ['AND', 'OR'] as const, `${path}.operator`, 'operator');
    if (!Array.isArray(raw.conditions) || raw.conditions.length < 1 || raw.conditions.length > MAX_CONDITIONS) {
      fail(`${path}.conditions`, `must be a list of 1 to ${MAX_CONDITIONS} conditions`);
    }
    const conditions = raw.conditions.map((c: unknown, i) => {
      const p = `${path}.conditions[${i}]`;
      if (isPlainObject(c) && ('operator' in c || 'conditions' in c)) fail(p, 'conditions cannot be nested');
      return parseSimple(spec, c, p);
    });
    return { filterType: expected, operator, conditions };
  }
  return parseSimple(spec, raw, path);
}

function parseSimple(spec: ColumnSpec, raw: unknown, path: string): SimpleCondition {
  if (!isPlainObject(raw)) fail(path, 'must be a filter condition object');
  const expected = FILTER_TYPE_OF_KIND[spec.kind];
  if (raw.filterType !== undefined && raw.filterType !== expected) {
    fail(`${path}.filterType`, `${spec.label} takes a "${expected}" filter, not ${JSON.stringify(raw.filterType)}`);
  }
  switch (expected) {
    case 'text': {
      const type = oneOf(raw.type, TEXT_OPS, `${path}.type`, 'text operator');
      if (type === 'blank' || type === 'notBlank') return { filterType: 'text', type };
      if (typeof raw.filter !== 'string' || raw.filter.trim() === '') fail(`${path}.filter`, 'type some text to filter by');
      if (raw.filter.length > MAX_TEXT_LENGTH) fail(`${path}.filter`, `at most ${MAX_TEXT_LENGTH} characters`);
      if (hasControlCharacter(raw.filter)) fail(`${path}.filter`, CONTROL_MESSAGE);
      return { filterType: 'text', type, filter: raw.filter.trim() };
    }
    case 'number': {
      const type = oneOf(raw.type, COMPARE_OPS, `${path}.type`, 'number operator');
      if (type === 'blank' || type === 'notBlank') return { filterType: 'number', type };
      const limit = spec.kind === 'daysSince' ? MAX_DAYS : MAX_NUMBER;
      const filter = wholeNumber(raw.filter, `${path}.filter`, limit);
      if (type !== 'inRange') return { filterType: 'number', type, filter };
      return { filterType: 'number', type, filter, filterTo: wholeNumber(raw.filterTo, `${path}.filterTo`, limit) };
    }
    case 'date': {
      const type = oneOf(raw.type, COMPARE_OPS, `${path}.type`, 'date operator');
      if (type === 'blank' || type === 'notBlank') return { filterType: 'date', type };
      const dateFrom = dayOf(raw.dateFrom, `${path}.dateFrom`);
      if (type !== 'inRange') return { filterType: 'date', type, dateFrom };
      return { filterType: 'date', type, dateFrom, dateTo: dayOf(raw.dateTo, `${path}.dateTo`) };
    }
    case 'set': {
      if (!Array.isArray(raw.values)) fail(`${path}.values`, 'must be a list of values');
      if (raw.values.length > MAX_SET_VALUES) fail(`${path}.values`, `at most ${MAX_SET_VALUES} values`);
      const kind = (spec as Extract<ColumnSpec, { kind: 'set' }>).values;
      const values = raw.values.map((v: unknown, i) => {
        const p = `${path}.values[${i}]`;
        if (v === null) return null;
        if (kind === 'status') return oneOf(v, STATUSES, p, 'status');
        if (typeof v !== 'number' || !Number.isInteger(v) || v <= 0 || v > 2_147_483_647) fail(p, 'must be a record id (a positive whole number) or null');
        return v;
      });
      return { filterType: 'set', values };
    }
    case 'boolean': {
      if (typeof raw.value !== 'boolean') fail(`${path}.value`, 'must be true or false');
      return { filterType: 'boolean', value: raw.value };
    }
  }
}

function wholeNumber(v: unknown, path: string, limit: number): number {
  if (typeof v !== 'number' || !Number.isInteger(v)) fail(path, 'must be a whole number');
  if (Math.abs(v) > limit) fail(path, `must be between -${limit} and ${limit}`);
  return v;
}

/** AG Grid sends 'YYYY-MM-DD hh:mm:ss'; the day is what counts. */
function dayOf(v: unknown, path: string): LocalDate {
  const text = typeof v === 'string' ? v.trim() : '';
  const day = text.slice(0, 10);
  if (!/^\d{4}-\d{2}-\d{2}( 00:00:00)?$/.test(text) || !isLocalDate(day)) fail(path, 'must be a date, YYYY-MM-DD');
  if (!inDateRange(day)) fail(path, DATE_RANGE_MESSAGE);
  return day;
}

/** The start of a calendar day as the column compares it: the date itself, or local midnight as an instant. */
function dayStart(base: Base, day: LocalDate, b: Binds): string {
  const d = b.add(day, 'date');
  return base.type === 'dateColumn' ? d : `(${d}::timestamp AT TIME ZONE ${b.tz()})`;
}

/** A comparison on calendar days, expressed as half-open bounds on the base column (index-friendly). */
function dayCompare(base: Base, op: Exclude<CompareOp, 'blank' | 'notBlank' | 'inRange'>, day: LocalDate, b: Binds): string {
  const c = base.column;
  switch (op) {
    case 'equals':
      return `(${c} >= ${dayStart(base, day, b)} AND ${c} < ${dayStart(base, addDays(day, 1), b)})`;
    case 'notEqual':
      return `(${c} < ${dayStart(base, day, b)} OR ${c} >= ${dayStart(base, addDays(day, 1), b)})`;
    case 'lessThan':
      return `${c} < ${dayStart(base, day, b)}`;
    case 'lessThanOrEqual':
      return `${c} < ${dayStart(base, addDays(day, 1), b)}`;
    case 'greaterThan':
      return `${c} >= ${dayStart(base, addDays(day, 1), b)}`;
    case 'greaterThanOrEqual':
      return `${c} >= ${dayStart(base, day, b)}`;
  }
}

function dateRange(base: Base, from: LocalDate, to: LocalDate): (b: Binds) => string {
  const [lo, hi] = from <= to ? [from, to] : [to, from];
  return (b) => `(${dayCompare(base, 'greaterThanOrEqual', lo, b)} AND ${dayCompare(base, 'lessThanOrEqual', hi, b)})`;
}

/** "N days since the instant" compared with n, as a bound on the instant: days ≥ n ⇔ local day ≤ today − n. */
function daysCompare(base: Base, op: CompareOp, n: number, nTo: number | undefined, b: Binds, today: LocalDate): string {
  const dayMinus = (k: number) => addDays(today, -k);
  switch (op) {
    case 'equals':
      return dayCompare(base, 'equals', dayMinus(n), b);
    case 'notEqual':
      return dayCompare(base, 'notEqual', dayMinus(n), b);
    case 'greaterThanOrEqual':
      return dayCompare(base, 'lessThanOrEqual', dayMinus(n), b);
    case 'greaterThan':
      return dayCompare(base, 'lessThan', dayMinus(n), b);
    case 'lessThanOrEqual':
      return dayCompare(base, 'greaterThanOrEqual', dayMinus(n), b);
    case 'lessThan':
      return dayCompare(base, 'greaterThan', dayMinus(n), b);
    case 'inRange': {
      const [lo, hi] = n <= nTo! ? [n, nTo!] : [nTo!, n];
      return `(${dayCompare(base, 'lessThanOrEqual', dayMinus(lo), b)} AND ${dayCompare(base, 'greaterThanOrEqual', dayMinus(hi), b)})`;
    }
    case 'blank':
      return `${base.column} IS NULL`;
    case 'notBlank':
      return `${base.column} IS NOT NULL`;
  }
}

function likePattern(text: string, op: 'contains' | 'startsWith' | 'endsWith'): string {
  const escaped = text.replace(/[\\%_]/g, (ch) => `\\${ch}`);
  return op === 'contains' ? `%${escaped}%` : op === 'startsWith' ? `${escaped}%` : `%${escaped}`;
}

function simpleSql(spec: ColumnSpec, cond: SimpleCondition, b: Binds, ctx: QueryContext): string {
  switch (cond.filterType) {
    case 'text': {
      const s = spec as Extract<ColumnSpec, { kind: 'text' }>;
      const col = s.value;
      switch (cond.type) {
        case 'blank':
          return `(${col} IS NULL OR ${col} = '')`;
        case 'notBlank':
          return `(${col} IS NOT NULL AND ${col} <> '')`;
        case 'equals':
          return s.exactEquals ? `${col} = ${b.add(cond.filter, 'text')}` : `lower(${col}) = lower(${b.add(cond.filter, 'text')})`;
        case 'notEqual':
          return s.exactEquals ? `${col} IS DISTINCT FROM ${b.add(cond.filter, 'text')}` : `lower(${col}) IS DISTINCT FROM lower(${b.add(cond.filter, 'text')})`;
        case 'notContains':
          return `COALESCE(${col}, '') NOT ILIKE ${b.add(likePattern(cond.filter!, 'contains'), 'text')}`;
        default:
          return `${col} ILIKE ${b.add(likePattern(cond.filter!, cond.type), 'text')}`;
      }
    }
    case 'number': {
      if (spec.kind === 'daysSince') return daysCompare(spec.base, cond.type, cond.filter!, cond.filterTo, b, ctx.today);
      const s = spec as Extract<ColumnSpec, { kind: 'number' }>;
      const col = s.value;
      const v = () => b.add(cond.filter, s.cast);
      switch (cond.type) {
        case 'equals':
          return `${col} = ${v()}`;
        case 'notEqual':
          return `${col} <> ${v()}`;
        case 'lessThan':
          return `${col} < ${v()}`;
        case 'lessThanOrEqual':
          return `${col} <= ${v()}`;
        case 'greaterThan':
          return `${col} > ${v()}`;
        case 'greaterThanOrEqual':
          return `${col} >= ${v()}`;
        case 'inRange': {
          const [lo, hi] = cond.filter! <= cond.filterTo! ? [cond.filter, cond.filterTo] : [cond.filterTo, cond.filter];
          return `${col} BETWEEN ${b.add(lo, s.cast)} AND ${b.add(hi, s.cast)}`;
        }
        case 'blank':
          return `${col} IS NULL`;
        case 'notBlank':
          return `${col} IS NOT NULL`;
      }
      break;
    }
    case 'date': {
      const s = spec as Extract<ColumnSpec, { kind: 'date' }>;
      switch (cond.type) {
        case 'blank':
          return `${s.base.column} IS NULL`;
        case 'notBlank':
          return `${s.base.column} IS NOT NULL`;
        case 'inRange':
          return dateRange(s.base, cond.dateFrom!, cond.dateTo!)(b);
        default:
          return dayCompare(s.base, cond.type, cond.dateFrom!, b);
      }
    }
    case 'set': {
      const s = spec as Extract<ColumnSpec, { kind: 'set' }>;
      const present = cond.values.filter((v) => v !== null);
      const wantsNone = present.length < cond.values.length;
      const parts: string[] = [];
      if (present.length) parts.push(`${s.value} = ANY(${b.add(present, s.values === 'status' ? 'text[]' : 'int[]')})`);
      if (wantsNone) parts.push(`${s.value} IS NULL`);
      if (parts.length === 0) return 'FALSE';
      return parts.length === 1 ? parts[0]! : `(${parts.join(' OR ')})`;
    }
    case 'boolean': {
      const s = spec as Extract<ColumnSpec, { kind: 'flag' }>;
      return `(${s.predicate(b)}) IS ${cond.value ? 'TRUE' : 'NOT TRUE'}`;
    }
  }
  throw new Error('unreachable');
}

/** The WHERE clause for a checked filter model ('TRUE' when there is nothing to filter). */
export function whereClause(model: FilterModel, b: Binds, ctx: QueryContext): string {
  const parts: string[] = [];
  for (const colId of BIN_COLUMN_IDS) {
    const cond = model[colId];
    if (!cond) continue;
    const spec = BIN_COLUMNS[colId];
    if ('conditions' in cond) {
      const joined = cond.conditions.map((c) => simpleSql(spec, c, b, ctx)).join(cond.operator === 'AND' ? ' AND ' : ' OR ');
      parts.push(`(${joined})`);
    } else {
      parts.push(simpleSql(spec, cond, b, ctx));
    }
  }
  return parts.length ? parts.join('\n   AND ') : 'TRUE';
}

// ---------------------------------------------------------------------------------------------------
// Whole statements

export interface GridRequest {
  startRow: number;
  endRow: number;
  sortModel: SortItem[];
  filterModel: FilterModel;
}

/** Checks the row window and both models; throws GridQueryError listing what is wrong. */
export function parseGridRequest(raw: { startRow?: unknown; endRow?: unknown; sortModel?: unknown; filterModel?: unknown }): GridRequest {
  const startRow = raw.startRow ?? 0;
  const endRow = raw.endRow ?? 100;
  if (typeof startRow !== 'number' || !Number.isInteger(startRow) || startRow < 0 || startRow > MAX_START_ROW) fail('startRow', 'must be a whole number from 0');
  if (typeof endRow !== 'number' || !Number.isInteger(endRow) || endRow <= startRow) fail('endRow', 'must be a whole number above startRow');
  if (endRow - startRow > MAX_PAGE_ROWS) fail('endRow', `a page holds at most ${MAX_PAGE_ROWS} rows`);
  return { startRow, endRow, sortModel: parseSortModel(raw.sortModel), filterModel: parseFilterModel(raw.filterModel) };
}

export interface SqlStatement {
  text: string;
  values: unknown[];
}

const JOINS: ReadonlyArray<readonly [alias: RegExp, join: string]> = [
  [/\bbt\./, 'LEFT JOIN bin_types bt ON bt.id = a.bin_type_id'],
  [/\bs\./, 'LEFT JOIN sites s ON s.id = a.site_id'],
  [/\bo\./, 'LEFT JOIN organisations o ON o.id = a.customer_id'],
  [/\bll\./, 'LEFT JOIN liner_lots ll ON ll.id = a.liner_lot_id'],
  [/\bt\./, 'LEFT JOIN trips t ON t.id = a.current_trip_id'],
];
const FROM = `FROM assets a\n  ${JOINS.map(([, j]) => j).join('\n  ')}`;

/**
 * FROM with only the joins the given SQL uses. PostgreSQL drops an unused LEFT JOIN by itself, but the
 * join's column (a.site_id, …) still counts as needed, which rules out an index-only scan.
 */
function fromFor(...sql: string[]): string {
  const text = sql.join(' ');
  const joins = JOINS.filter(([alias]) => alias.test(text)).map(([, j]) => j);
  return ['FROM assets a', ...joins].join('\n  ');
}

function daysExpr(column: string, b: Binds): string {
  return `(${b.today()} - (${column} AT TIME ZONE ${b.tz()})::date)`;
}

/** What one grid row carries (camelCase names straight from SQL). */
function selectList(b: Binds): string {
  return `a.id, a.grai, a.serial, a.status,
  a.bin_type_id AS "binTypeId", bt.code AS "binTypeCode",
  a.site_id AS "siteId", s.name AS "siteName",
  a.customer_id AS "customerId", o.name AS "customerName", ${tripTermSql('free_days', b.tz())} AS "freeDays",
  ${daysExpr('a.site_since', b)} AS "daysAtSite",
  to_char(a.site_since AT TIME ZONE ${b.tz()}, 'YYYY-MM-DD') AS "siteSinceOn",
  ${daysExpr('a.last_scan_at', b)} AS "daysSilent",
  to_char(a.last_scan_at AT TIME ZONE ${b.tz()}, 'YYYY-MM-DD HH24:MI') AS "lastScanLocal",
  a.trip_count AS "tripCount", a.last_inspection_on AS "lastInspectionOn", a.next_due AS "nextDue",
  (${BIN_COLUMNS.overdue.predicate(b)}) IS TRUE AS overdue,
  (${BIN_COLUMNS.dueSoon.predicate(b)}) IS TRUE AS "dueSoon",
  (${BIN_COLUMNS.dueThisMonth.predicate(b)}) IS TRUE AS "dueThisMonth",
  (${overFreeDays(b)}) IS TRUE AS "overFreeDays",
  ll.lot_number AS "linerLot"`;
}

/**
 * One page of rows.
 *
 * Paging is OFFSET/LIMIT over the ordered set. The page's ids are picked first by a query that selects
 * nothing but the id (PostgreSQL drops the joins it does not need), so the rows skipped by OFFSET are
 * index entries — with the (column, id) indexes, read from the index alone — not joined rows; only the
 * page's own rows are then joined and shaped ("deferred join").
 */
export function binsPageQuery(req: GridRequest, ctx: QueryContext): SqlStatement {
  const b = new Binds(ctx);
  const where = whereClause(req.filterModel, b, ctx);
  const order = orderBy(req.sortModel);
  const limit = b.add(req.endRow - req.startRow, 'int');
  const offset = b.add(req.startRow, 'int');
  const text = `SELECT ${selectList(b)}
${FROM}
WHERE a.id = ANY(ARRAY(
  SELECT a.id ${fromFor(where, order)}
  WHERE ${where}
  ORDER BY ${order}
  LIMIT ${limit} OFFSET ${offset}))
ORDER BY ${order}`;
  return { text, values: b.values };
}

/** Counting stops here: past it the grid is told "more than this" and scrolls on to find the end. */
export const COUNT_CAP = 1_000_000;

/**
 * How many bins pass the filter, counting at most COUNT_CAP + 1 rows, so the cost of a count is bounded
 * by rows rather than by a timeout (one statement, no transaction). Asked for separately from the pages,
 * so a page never waits for a count.
 */
export function binsCountQuery(filterModel: FilterModel, ctx: QueryContext): SqlStatement {
  const b = new Binds(ctx);
  const where = whereClause(filterModel, b, ctx);
  const cap = b.add(COUNT_CAP + 1, 'int');
  return { text: `SELECT count(*)::int AS n FROM (SELECT 1 ${fromFor(where)}\nWHERE ${where}\nLIMIT ${cap}) capped`, values: b.values };
}

/** Every row of the filtered, sorted set, for a cursor that streams it out in chunks (CSV export). */
export function binsExportQuery(req: Pick<GridRequest, 'sortModel' | 'filterModel'>, ctx: QueryContext): SqlStatement {
  const b = new Binds(ctx);
  const where = whereClause(req.filterModel, b, ctx);
  const select = selectList(b);
  return { text: `SELECT ${select}\n${FROM}\nWHERE ${where}\nORDER BY ${orderBy(req.sortModel)}`, values: b.values };
}
