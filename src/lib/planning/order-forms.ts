/**
 * The hire-order list's query string and the order form, checked with zod.
 * Shared by the pages and the API, so a link copied from the page works against
 * the API. Pure.
 *
 * Only whitelisted names are accepted: an unknown parameter, sort column or a
 * malformed filter is an issue (400), never silently ignored. Empty values
 * mean "not set" (a form's empty select).
 */
import { z } from 'zod';
import { isLocalDate, type LocalDate } from '@/lib/calendar';
import { multilineText, text } from '@/lib/text-input';
import { ORDER_STATUSES, type OrderStatus } from './order-status';

export const ORDER_SORT_KEYS = ['wanted', 'reference', 'customer', 'status', 'quantity', 'created'] as const;
export type OrderSortKey = (typeof ORDER_SORT_KEYS)[number];
const ORDER_FILTER_KEYS = ['status', 'customer', 'depot', 'type', 'from', 'to', 'ref'] as const;
export type OrderFilterKey = (typeof ORDER_FILTER_KEYS)[number];
const OPTION_KEYS = ['sort', 'dir', 'page', 'size'] as const;

const DEFAULT_ORDER_PAGE_SIZE = 50;
const MAX_ORDER_PAGE_SIZE = 200;

/** `status=demand` means confirmed or loading (what the depots are working on). */
export type OrderStatusFilter = OrderStatus | 'demand';

export interface OrderFilters {
  status?: OrderStatusFilter;
  customer?: number;
  depot?: number;
  type?: number;
  /** Wanted on or after / on or before (local dates, both included). */
  from?: LocalDate;
  to?: LocalDate;
  /** Beginning of the reference, any case. */
  ref?: string;
}

export interface OrderListQuery {
  sort: OrderSortKey;
  dir: 'asc' | 'desc';
  page: number;
  size: number;
  filters: OrderFilters;
}

export const DEFAULT_ORDER_LIST: OrderListQuery = { sort: 'wanted', dir: 'asc', page: 1, size: DEFAULT_ORDER_PAGE_SIZE, filters: {} };

export interface QueryIssue {
  field: string;
  message: string;
}

const id = z.coerce.number({ invalid_type_error: 'must be a number' }).int('must be a whole number').positive('must be positive').max(2_147_483_647, 'is too large');
const localDate = z.string().refine(isLocalDate, 'must be a date like 2026-03-14');
const whole = (min: number, max: number) =>
  z.coerce.number({ invalid_type_error: 'must be a number' }).int('must be a whole number').min(min, `must be ${min} or more`).max(max, `must be at most ${max}`);

const listSchema = z
  .object({
    sort: z.enum(ORDER_SORT_KEYS, { errorMap: () => ({ message: `must be one of: ${ORDER_SORT_KEYS.join(', ')}` }) }).default('wanted'),
    dir: z.enum(['asc', 'desc'], { errorMap: () => ({ message: 'must be asc or desc' }) }).default('asc'),
    page: whole(1, 1_000_000).default(1),
    size: whole(1, MAX_ORDER_PAGE_SIZE).default(DEFAULT_ORDER_PAGE_SIZE),
    status: z.enum([...ORDER_STATUSES, 'demand'], { errorMap: () => ({ message: `must be one of: demand, ${ORDER_STATUSES.join(', ')}` }) }).optional(),
    customer: id.optional(),
    depot: id.optional(),
    type: id.optional(),
    from: localDate.optional(),
    to: localDate.optional(),
    ref: text().max(32, 'must be at most 32 characters').optional(),
  })
  .strict();

const KNOWN = new Set<string>([...OPTION_KEYS, ...ORDER_FILTER_KEYS]);

export type OrderListParse = { ok: true; query: OrderListQuery } | { ok: false; issues: QueryIssue[] };

export function parseOrderListQuery(params: URLSearchParams | Record<string, string | undefined>): OrderListParse {
  const issues: QueryIssue[] = [];
  const input: Record<string, string> = {};
  const entries = params instanceof URLSearchParams ? [...params.entries()] : Object.entries(params);
  for (const [key, raw] of entries) {
    if (typeof raw !== 'string') continue;
    if (!KNOWN.has(key)) {
      issues.push({ field: key, message: `"${key}" is not a filter or option of the order list (filters: ${ORDER_FILTER_KEYS.join(', ')}).` });
      continue;
    }
    if (key in input) {
      issues.push({ field: key, message: `"${key}" is given twice.` });
      continue;
    }
    const value = raw.trim();
    if (value !== '') input[key] = value;
  }
  const parsed = listSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const field = String(issue.path[0] ?? '');
      issues.push({ field, message: `"${field}" ${issue.message}.` });
    }
  }
  if (issues.length || !parsed.success) return { ok: false, issues };
  const v = parsed.data;
  if (v.from && v.to && v.from > v.to) return { ok: false, issues: [{ field: 'to', message: '"to" is before "from".' }] };
  const filters: OrderFilters = {};
  if (v.status) filters.status = v.status;
  if (v.customer !== undefined) filters.customer = v.customer;
  if (v.depot !== undefined) filters.depot = v.depot;
  if (v.type !== undefined) filters.type = v.type;
  if (v.from) filters.from = v.from;
  if (v.to) filters.to = v.to;
  if (v.ref) filters.ref = v.ref;
  return { ok: true, query: { sort: v.sort, dir: v.dir, page: v.page, size: v.size, filters } };
}

/** A query string for a link with some options changed; defaults left out. */
export function orderListSearch(query: OrderListQuery, changes: Partial<Omit<OrderListQuery, 'filters'>> & { filters?: OrderFilters } = {}): string {
  const next: OrderListQuery = { ...query, ...changes, filters: changes.filters ?? query.filters };
  const params = new URLSearchParams();
  for (const key of ORDER_FILTER_KEYS) {
    const value = next.filters[key];
    if (value !== undefined) params.set(key, String(value));
  }
  if (next.sort !== DEFAULT_ORDER_LIST.sort) params.set('sort', next.sort);
  if (next.dir !== DEFAULT_ORDER_LIST.dir) params.set('dir', next.dir);
  if (next.size !== DEFAULT_ORDER_LIST.size) params.set('size', String(next.size));
  if (next.page !== 1) params.set('page', String(next.page));
  const text = params.toString();
  return text ? `?${text}` : '';
}

export function pageCount(total: number, size: number): number {
  return Math.max(1, Math.ceil(total / size));
}

/** The planner's order form (and, later, the portal's). */
export const orderInputSchema = z
  .object({
    customerId: id,
    deliverySiteId: id,
    depotSiteId: id,
    binTypeId: id,
    quantity: z.number({ invalid_type_error: 'must be a number' }).int('must be a whole number of bins').min(1, 'must be at least 1 bin').max(1000, 'must be at most 1000 bins'),
    neededBy: localDate,
    product: text()
      .trim()
      .max(120, 'must be at most 120 characters')
      .nullish()
      .transform((v) => (v ? v : null)),
    notes: multilineText()
      .trim()
      .max(2000, 'must be at most 2000 characters')
      .nullish()
      .transform((v) => (v ? v : null)),
    linerFoodContact: z.boolean().default(false),
    linerMaxFillTempC: z
      .number({ invalid_type_error: 'must be a number' })
      .int('must be whole degrees')
      .min(-40, 'must be −40 °C or more')
      .max(100, 'must be 100 °C or less')
      .nullish()
      .transform((v) => v ?? null),
    /** Save as draft (counts nowhere) or confirm straight away. */
    confirm: z.boolean().default(false),
  })
  .strict();
export type OrderInput = z.infer<typeof orderInputSchema>;

export const orderCommandSchema = z
  .object({
    command: z.enum(['confirm', 'cancel', 'close'], { errorMap: () => ({ message: 'must be confirm, cancel or close' }) }),
    version: z.number().int().min(0),
  })
  .strict();

/** An order id from a path segment, or null when it cannot be one (answered as "no such order"). */
export function parseOrderId(raw: string | undefined): number | null {
  const parsed = id.safeParse(raw);
  return parsed.success ? parsed.data : null;
}
