// Hire orders from the portal: a customer places one as a draft (it counts nowhere until a planner confirms it) and
// follows its progress. The order itself is the planners' (src/lib/planning/orders.server.ts); this file only scopes
// it to the customer's own organisation and sites.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { createOrder } from '@/lib/planning/orders.server';
import type { OrderStatus } from '@/lib/planning/order-status';
import type { AuditActor } from '@/lib/audit.server';
import type { PortalOrderInput } from './portal-forms';
import { ownSite, scopeSites, type PortalScope } from './portal-scope.server';

export interface PortalOrderRow {
  id: number;
  reference: string;
  status: OrderStatus;
  quantity: number;
  neededBy: string;
  createdAt: string;
  binType: string;
  site: string;
  product: string | null;
  loaded: number;
  dispatched: number;
  delivered: number;
}

export async function listPortalOrders(scope: PortalScope): Promise<PortalOrderRow[]> {
  return sequelize.query<PortalOrderRow>(
    `SELECT ho.id, ho.reference, ho.status, ho.quantity, to_char(ho.needed_by, 'YYYY-MM-DD') AS "neededBy", ho.created_at AS "createdAt",
            bt.name AS "binType", s.name AS site, ho.product,
            count(t.id)::int AS loaded,
            count(t.id) FILTER (WHERE t.load_id IS NULL OR l.status IN ('dispatched', 'delivered'))::int AS dispatched,
            count(t.id) FILTER (WHERE t.delivered_at IS NOT NULL)::int AS delivered
       FROM hire_orders ho
       JOIN bin_types bt ON bt.id = ho.bin_type_id
       JOIN sites s ON s.id = ho.delivery_site_id
       LEFT JOIN trips t ON t.hire_order_id = ho.id
       LEFT JOIN loads l ON l.id = t.load_id
      WHERE ho.customer_id = $1 AND ($2::int[] IS NULL OR ho.delivery_site_id = ANY($2::int[]))
      GROUP BY ho.id, bt.name, s.name
      ORDER BY ho.needed_by DESC, ho.id DESC
      LIMIT 100`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

export async function portalOrderChoices(scope: PortalScope) {
  const [sites, binTypes] = await Promise.all([
    scopeSites(scope),
    sequelize.query<{ id: number; name: string; nominalCapacityL: number }>(`SELECT id, name, nominal_capacity_l AS "nominalCapacityL" FROM bin_types WHERE active ORDER BY name`, {
      type: QueryTypes.SELECT,
    }),
  ]);
  return { sites, binTypes };
}

/**
 * The depot an order from the portal goes out from until the planner says otherwise: the one that served the
 * customer most, else the first depot.
 */
async function usualDepot(organisationId: number): Promise<number> {
  const [row] = await sequelize.query<{ id: number }>(
    `SELECT id FROM (
        SELECT ho.depot_site_id AS id, count(*) AS n, 0 AS fallback FROM hire_orders ho JOIN sites d ON d.id = ho.depot_site_id AND d.active
         WHERE ho.customer_id = $1 GROUP BY ho.depot_site_id
        UNION ALL
        SELECT id, 0, 1 FROM sites WHERE kind = 'depot' AND active
     ) c ORDER BY fallback, n DESC, id LIMIT 1`,
    { bind: [organisationId], type: QueryTypes.SELECT },
  );
  return row!.id;
}

export async function placePortalOrder(scope: PortalScope, input: PortalOrderInput, actor: AuditActor): Promise<{ id: number; reference: string; status: OrderStatus }> {
  await ownSite(scope, input.deliverySiteId);
  return createOrder(
    {
      customerId: scope.organisationId,
      deliverySiteId: input.deliverySiteId,
      depotSiteId: await usualDepot(scope.organisationId),
      binTypeId: input.binTypeId,
      quantity: input.quantity,
      neededBy: input.neededBy,
      product: input.product,
      notes: input.notes,
      linerFoodContact: input.linerFoodContact,
      linerMaxFillTempC: input.linerMaxFillTempC,
      confirm: false,
    },
    actor,
  );
}
