/**
 * The pool overview's figure cards, each as the fleet-grid filter whose rows it counts. The overview's number
 * is the grid's count of that same filter (pool-overview.server.ts) and the card opens the grid with it
 * (/fleet/bins?card=<id>&days=<N>), so a card's number is always the length of the list it opens. Pure.
 */
import type { Status } from '@/lib/scans/lifecycle';
import type { FilterModel, SortItem } from './grid-query';
import type { ViewState } from './grid-views';
import { WITH_CUSTOMER_STATUSES } from './overdue-return';
import { IN_SERVICE_STATUSES, parseStaleDays } from './scan-age';

export const OVERVIEW_CARD_IDS = ['in-service', 'with-customers', 'overdue', 'awaiting', 'silent'] as const;
export type OverviewCardId = (typeof OVERVIEW_CARD_IDS)[number];

export interface OverviewCard {
  id: OverviewCardId;
  /** The grid's filter: the one rule for the number and the list. */
  filter: (days: number) => FilterModel;
  sort: SortItem[];
}

const statusIn = (values: readonly Status[]) => ({ filterType: 'set' as const, values: [...values] });

export const OVERVIEW_CARDS: Record<OverviewCardId, OverviewCard> = {
  'in-service': { id: 'in-service', filter: () => ({ status: statusIn(IN_SERVICE_STATUSES) }), sort: [{ colId: 'site', sort: 'asc' }] },
  'with-customers': { id: 'with-customers', filter: () => ({ status: statusIn(WITH_CUSTOMER_STATUSES) }), sort: [{ colId: 'customer', sort: 'asc' }] },
  overdue: { id: 'overdue', filter: () => ({ overFreeDays: { filterType: 'boolean', value: true } }), sort: [{ colId: 'daysAtSite', sort: 'desc' }] },
  awaiting: { id: 'awaiting', filter: () => ({ status: statusIn(['awaiting_collection']) }), sort: [{ colId: 'daysAtSite', sort: 'desc' }] },
  silent: {
    id: 'silent',
    filter: (days) => ({ daysSilent: { filterType: 'number', type: 'greaterThanOrEqual', filter: days }, status: statusIn(IN_SERVICE_STATUSES) }),
    sort: [{ colId: 'lastScanAt', sort: 'asc' }],
  },
};

export function isOverviewCardId(v: unknown): v is OverviewCardId {
  return typeof v === 'string' && (OVERVIEW_CARD_IDS as readonly string[]).includes(v);
}

/** Days for the silent card from a URL parameter, read as the overview reads its own (parseStaleDays). */
export function cardDays(raw: string | null): number {
  return parseStaleDays(raw).days;
}

/** The grid state a card opens. */
export function cardViewState(id: OverviewCardId, days: number): ViewState {
  const card = OVERVIEW_CARDS[id];
  return { filterModel: card.filter(days), sortModel: card.sort, columns: [] };
}

/** Where a card leads. */
export function cardHref(id: OverviewCardId, days: number): string {
  return id === 'silent' ? `/fleet/bins?card=silent&days=${days}` : `/fleet/bins?card=${id}`;
}
