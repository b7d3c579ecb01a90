// The stock-move filters of the depot stock page and its CSV: one schema, one way back to a query string. Pure.
import { z } from 'zod';
import { text, inDateRange, DATE_RANGE_MESSAGE } from '@/lib/text-input';
import { MOVE_KINDS } from './liner-moves';
import { isLocalDate } from '@/lib/calendar';

const day = text()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Write dates as YYYY-MM-DD.')
  .refine(isLocalDate, 'That is not a date in the calendar.')
  .refine(inDateRange, `The date ${DATE_RANGE_MESSAGE}.`);
const empty = z.literal('').transform(() => undefined);

export const ledgerQuerySchema = z.object({
  kind: z.union([empty, z.enum(MOVE_KINDS)]).optional(),
  lot: z.union([empty, text().trim().max(40)]).optional(),
  from: z.union([empty, day]).optional(),
  to: z.union([empty, day]).optional(),
});
export type LedgerQuery = { kind?: (typeof MOVE_KINDS)[number]; lot?: string; from?: string; to?: string };

export function ledgerQuery(params: Record<string, string>): { ok: true; value: LedgerQuery } | { ok: false; message: string } {
  const r = ledgerQuerySchema.safeParse({ kind: params.kind, lot: params.lot, from: params.from, to: params.to });
  if (!r.success) return { ok: false, message: r.error.issues.map((i) => i.message).join(' ') };
  const v = r.data as LedgerQuery;
  if (v.from && v.to && v.from > v.to) return { ok: false, message: 'The “from” date is after the “to” date.' };
  return { ok: true, value: Object.fromEntries(Object.entries(v).filter(([, x]) => x !== undefined && x !== '')) as LedgerQuery };
}

export function ledgerSearch(q: LedgerQuery & { depot?: number }): string {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== '') p.set(k, String(v));
  const s = p.toString();
  return s ? `?${s}` : '';
}
