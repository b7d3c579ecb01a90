// Liner purchase orders and reorder alerts (pure): the reference, the wanted-by day, what is still to come,
// whether a quantity suits the supplier's cartons and minimum, and when a reorder alert opens and clears.
import { addDays, type LocalDate } from '@/lib/calendar';

/** The reference printed on the order and quoted by the supplier: LPO- and the number, five digits at least. */
export function poReference(id: number): string {
  return `LPO-${String(id).padStart(5, '0')}`;
}

/** Wanted by: the day it is ordered plus the supplier's lead time. */
export function wantedBy(orderedOn: LocalDate, leadTimeDays: number): LocalDate {
  return addDays(orderedOn, Math.max(0, Math.ceil(leadTimeDays)));
}

export type PoStatus = 'open' | 'closed' | 'cancelled';
export type PoState = 'open' | 'part_received' | 'received' | 'closed_short' | 'cancelled';
export const PO_STATE_WORDS: Record<PoState, string> = {
  open: 'Ordered',
  part_received: 'Partly received',
  received: 'Received',
  closed_short: 'Closed short',
  cancelled: 'Cancelled',
};

/** What a purchase order still has to deliver, and its state in words. Deliveries above the quantity count in full. */
export function poProgress(p: { status: PoStatus; quantity: number; received: number }): { remaining: number; state: PoState; complete: boolean } {
  const remaining = p.status === 'open' ? Math.max(0, p.quantity - p.received) : 0;
  const complete = p.received >= p.quantity;
  const state: PoState =
    p.status === 'cancelled'
      ? 'cancelled'
      : p.status === 'closed'
        ? complete
          ? 'received'
          : p.received > 0
            ? 'closed_short'
            : 'cancelled'
        : p.received > 0
          ? 'part_received'
          : 'open';
  return { remaining, state, complete };
}

/** A quantity the supplier can deliver: whole cartons and at least the minimum; null when it fits, else why not. */
export function orderQuantityProblem(quantity: number, pack: { packSize: number; minimumOrder: number }): string | null {
  if (!Number.isInteger(quantity) || quantity <= 0) return 'Order a whole number of liners, at least one.';
  if (quantity < pack.minimumOrder) return `The supplier's minimum order is ${pack.minimumOrder.toLocaleString('en-GB')} liners.`;
  if (quantity % pack.packSize !== 0) {
    const up = Math.ceil(quantity / pack.packSize) * pack.packSize;
    return `The supplier packs ${pack.packSize.toLocaleString('en-GB')} to a carton: order ${up.toLocaleString('en-GB')} (or ${(up - pack.packSize).toLocaleString('en-GB')}).`;
  }
  return null;
}

/**
 * The reorder alert of a depot and spec, by what the stock job sees: it opens when the inventory position (on hand
 * + in transit + on order) falls below the reorder point, stays open (no second mail) while it is below, and
 * clears once the position is back at or above it — only then can a later fall open (and mail) a new one.
 */
export function reorderAlertStep(open: boolean, position: number, reorderPoint: number): 'raise' | 'clear' | 'keep' {
  const below = position < reorderPoint;
  if (below && !open) return 'raise';
  if (!below && open) return 'clear';
  return 'keep';
}
