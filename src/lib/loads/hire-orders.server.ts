// The hire orders a depot is loading or will load (status confirmed or loading: drafts count nowhere, see planning/order-status.ts), soonest needed first, with how
// many bins have gone out on each so far. One query for the yard home, the phone's depot snapshot, the bin page's
// dispatch form and the start-a-load page.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { LocalDate } from '@/lib/calendar';
import { DEMAND_STATUSES_SQL } from '@/lib/planning/order-status';

export interface OpenOrder {
  id: number;
  reference: string;
  customer: string;
  neededBy: LocalDate;
  quantity: number;
  /** Bins that went out on this order so far (its trips). */
  loaded: number;
  binTypeId: number;
  binType: string;
  deliverySite: string;
}

export interface OpenOrdersFilter {
  /** Only orders for this bin type (a bin can only go out on an order for its type). */
  binTypeId?: number;
  /** Only orders needed by this day (inclusive). */
  neededBy?: LocalDate;
  limit?: number;
}

export async function openOrdersAt(depotId: number, filter: OpenOrdersFilter = {}): Promise<OpenOrder[]> {
  const bind: unknown[] = [depotId];
  const clauses = ['ho.depot_site_id = $1', `ho.status IN (${DEMAND_STATUSES_SQL})`];
  if (filter.binTypeId !== undefined) clauses.push(`ho.bin_type_id = $${bind.push(filter.binTypeId)}`);
  if (filter.neededBy !== undefined) clauses.push(`ho.needed_by <= $${bind.push(filter.neededBy)}::date`);
  const limit = filter.limit !== undefined ? `LIMIT $${bind.push(filter.limit)}` : '';
  return sequelize.query<OpenOrder>(
    `SELECT ho.id, ho.reference, o.name AS customer, ho.needed_by AS "neededBy", ho.quantity,
            (SELECT count(*)::int FROM trips t WHERE t.hire_order_id = ho.id) AS loaded,
            ho.bin_type_id AS "binTypeId", bt.name AS "binType", s.name AS "deliverySite"
       FROM hire_orders ho
       JOIN organisations o ON o.id = ho.customer_id
       JOIN bin_types bt ON bt.id = ho.bin_type_id
       JOIN sites s ON s.id = ho.delivery_site_id
      WHERE ${clauses.join(' AND ')}
      ORDER BY ho.needed_by, ho.id ${limit}`,
    { bind, type: QueryTypes.SELECT },
  );
}
