/**
 * The trip list's query string: which columns it may sort by, which filters it takes, which page. Shared by
 * the /trips page and GET /api/trips, so a link copied from the page works against the API and the other way
 * round.
 *
 *   parseTripListQuery(params)        → { ok: true, query } | { ok: false, issues }
 *   tripListSearch(query, changes)    → '?sort=…&page=…' for links (defaults left out)
 *
 * Only whitelisted names are accepted: an unknown parameter, an unknown sort column or a malformed filter
 * is an issue (the API answers 400), never silently ignored — a mistyped filter that did nothing would show
 * every trip and look like an answer. Empty values mean "not set" (a form's empty select).
 */
import { z } from 'zod';
import { DATE_RANGE_MESSAGE, inDateRange, text } from '@/lib/text-input';
import { isLocalDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';

export const TRIP_SORT_KEYS = ['dispatched', 'returned', 'bin', 'customer', 'depot', 'dwell', 'cycle', 'lot', 'status', 'id'] as const;
export type TripSortKey = (typeof TRIP_SORT_KEYS)[number];

const TRIP_FILTER_KEYS = ['status', 'customer', 'depot', 'bin', 'lot', 'from', 'to', 'mismatch'] as const;
export type TripFilterKey = (typeof TRIP_FILTER_KEYS)[number];

const OPTION_KEYS = ['sort', 'dir', 'page', 'size'] as const;
export const PAGE_SIZES = [25, 50, 100] as const;
const DEFAULT_PAGE_SIZE = 50;
const MAX_PAGE_SIZE = 200;

export interface TripFilters {
  status?: 'open' | 'closed';
  customer?: number;
  depot?: number;
  /** A whole GRAI (any written form, or the label's link), or the beginning of a serial. */
  bin?: string;
  /** Liner lot number, or its beginning. */
  lot?: string;
  /** Dispatched on or after this local date. */
  from?: LocalDate;
  /** Dispatched on or before this local date. */
  to?: LocalDate;
  mismatch?: true;
}

export interface TripListQuery {
  sort: TripSortKey;
  dir: 'asc' | 'desc';
  page: number;
  size: number;
  filters: TripFilters;
}

export interface QueryIssue {
  field: string;
  message: string;
}

export type TripListParse = { ok: true; query: TripListQuery } | { ok: false; issues: QueryIssue[] };

export const DEFAULT_TRIP_LIST: TripListQuery = { sort: 'dispatched', dir: 'desc', page: 1, size: DEFAULT_PAGE_SIZE, filters: {} };

const id = z.coerce.number({ invalid_type_error: 'must be a number' }).int('must be a whole number').positive('must be positive').max(2_147_483_647, 'is too large');
const localDate = text().refine(isLocalDate, 'must be a date like 2026-03-14').refine(inDateRange, DATE_RANGE_MESSAGE);

const schema = z
  .object({
    sort: z.enum(TRIP_SORT_KEYS, { errorMap: () => ({ message: `must be one of: ${TRIP_SORT_KEYS.join(', ')}` }) }).default('dispatched'),
    dir: z.enum(['asc', 'desc'], { errorMap: () => ({ message: 'must be asc or desc' }) }).default('desc'),
    page: z.coerce.number({ invalid_type_error: 'must be a number' }).int('must be a whole number').min(1, 'must be 1 or more').max(1_000_000, 'is too large').default(1),
    size: z.coerce
      .number({ invalid_type_error: 'must be a number' })
      .int('must be a whole number')
      .min(1, 'must be 1 or more')
      .max(MAX_PAGE_SIZE, `must be at most ${MAX_PAGE_SIZE}`)
      .default(DEFAULT_PAGE_SIZE),
    status: z.enum(['open', 'closed'], { errorMap: () => ({ message: 'must be open or closed' }) }).optional(),
    customer: id.optional(),
    depot: id.optional(),
    bin: text().trim().min(1).max(80, 'must be at most 80 characters').optional(),
    lot: text().trim().min(1).max(40, 'must be at most 40 characters').optional(),
    from: localDate.optional(),
    to: localDate.optional(),
    mismatch: z.enum(['1', 'true'], { errorMap: () => ({ message: 'must be 1 (only seal mismatches)' }) }).optional(),
  })
  .strict();

/** The query's shape, for tests that generate inputs from it; parseTripListQuery() is the way to read a query. */
export const tripListQuerySchema = schema;

const KNOWN = new Set<string>([...OPTION_KEYS, ...TRIP_FILTER_KEYS]);

function entriesOf(params: URLSearchParams | Record<string, string | undefined>): Array<[string, string]> {
  const list = params instanceof URLSearchParams ? [...params.entries()] : Object.entries(params);
  return list.filter((e): e is [string, string] => typeof e[1] === 'string');
}

export function parseTripListQuery(params: URLSearchParams | Record<string, string | undefined>): TripListParse {
  const issues: QueryIssue[] = [];
  const input: Record<string, string> = {};
  for (const [key, raw] of entriesOf(params)) {
    if (!KNOWN.has(key)) {
      issues.push({ field: key, message: `"${key}" is not a column or option of the trip list (filters: ${TRIP_FILTER_KEYS.join(', ')}).` });
      continue;
    }
    if (key in input) {
      issues.push({ field: key, message: `"${key}" is given twice.` });
      continue;
    }
    const value = raw.trim();
    if (value !== '') input[key] = value;
  }
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const field = String(issue.path[0] ?? '');
      issues.push({ field, message: `"${field}" ${issue.message}.` });
    }
  }
  if (issues.length || !parsed.success) return { ok: false, issues };
  const v = parsed.data;
  if (v.from && v.to && v.from > v.to) return { ok: false, issues: [{ field: 'to', message: '"to" is before "from".' }] };
  const filters: TripFilters = {};
  if (v.status) filters.status = v.status;
  if (v.customer !== undefined) filters.customer = v.customer;
  if (v.depot !== undefined) filters.depot = v.depot;
  if (v.bin) filters.bin = v.bin;
  if (v.lot) filters.lot = v.lot;
  if (v.from) filters.from = v.from;
  if (v.to) filters.to = v.to;
  if (v.mismatch) filters.mismatch = true;
  return { ok: true, query: { sort: v.sort, dir: v.dir, page: v.page, size: v.size, filters } };
}

/** A query string for a link to the list with some options changed; defaults are left out, so links stay short. */
export function tripListSearch(query: TripListQuery, changes: Partial<Omit<TripListQuery, 'filters'>> & { filters?: TripFilters } = {}): string {
  const next: TripListQuery = { ...query, ...changes, filters: changes.filters ?? query.filters };
  const params = new URLSearchParams();
  for (const key of TRIP_FILTER_KEYS) {
    const value = next.filters[key];
    if (value !== undefined) params.set(key, value === true ? '1' : String(value));
  }
  if (next.sort !== DEFAULT_TRIP_LIST.sort) params.set('sort', next.sort);
  if (next.dir !== DEFAULT_TRIP_LIST.dir) params.set('dir', next.dir);
  if (next.size !== DEFAULT_TRIP_LIST.size) params.set('size', String(next.size));
  if (next.page !== 1) params.set('page', String(next.page));
  const text = params.toString();
  return text ? `?${text}` : '';
}

/** Clicking a column header: a new column starts in its natural order, the current one flips. */
export function nextSort(query: TripListQuery, column: TripSortKey): Pick<TripListQuery, 'sort' | 'dir' | 'page'> {
  if (query.sort === column) return { sort: column, dir: query.dir === 'asc' ? 'desc' : 'asc', page: 1 };
  const newestFirst: readonly TripSortKey[] = ['dispatched', 'returned', 'dwell', 'cycle', 'id'];
  return { sort: column, dir: newestFirst.includes(column) ? 'desc' : 'asc', page: 1 };
}

export function pageCount(total: number, size: number): number {
  return Math.max(1, Math.ceil(total / size));
}
