/**
 * The lists behind the yard start page's figures: every number on that page opens the list it counts.
 *
 *   parseYardList({ list, status })  → YardListKey | null   (the page's query, checked once)
 *   yardListTitle(key, depotName)    → the list's heading, in the start page's own words
 *   yardListHref(key)                → the list's address, as the start page links it
 *
 * Which bins each list holds is SQL in yard-lists.server.ts, used by the figure and the list alike.
 */
import { z } from 'zod';
import { STATUSES, STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';

export const YARD_LISTS = ['here', 'returning', 'awaiting', 'transfers-in', 'tests-due', 'held'] as const;
export type YardList = (typeof YARD_LISTS)[number];

/** A list, and for "here" the one status it narrows to (all statuses but retired without it). */
export interface YardListKey {
  list: YardList;
  status: Exclude<Status, 'retired'> | null;
}

const HERE_STATUSES = STATUSES.filter((s): s is Exclude<Status, 'retired'> => s !== 'retired');

const querySchema = z.object({
  list: z.enum(YARD_LISTS),
  status: z.enum(HERE_STATUSES as [Exclude<Status, 'retired'>, ...Exclude<Status, 'retired'>[]]).optional(),
});

/** The page's query as a list key (no list named: every bin at the depot); null for anything else (404). */
export function parseYardList(query: Record<string, string | undefined>): YardListKey | null {
  const r = querySchema.safeParse({ list: query.list || 'here', status: query.status || undefined });
  if (!r.success) return null;
  if (r.data.status && r.data.list !== 'here') return null;
  return { list: r.data.list, status: r.data.status ?? null };
}

export function yardListTitle(key: YardListKey, depotName: string): string {
  switch (key.list) {
    case 'here':
      return key.status ? `${STATUS_LABELS[key.status]} at ${depotName}` : `Bins at ${depotName}`;
    case 'returning':
      return 'On their way back';
    case 'awaiting':
      return 'Folded at customers, waiting for collection';
    case 'transfers-in':
      return 'Empties coming from other depots';
    case 'tests-due':
      return `Due for a periodic test within ${DUE_SOON_DAYS} days`;
    case 'held':
      return 'Held in quarantine or repair';
  }
}

export function yardListHref(key: YardListKey): string {
  const q = new URLSearchParams({ list: key.list });
  if (key.status) q.set('status', key.status);
  return `/yard/bins?${q}`;
}
