// Deliveries from the portal: the loads on their way to the customer's sites, confirmed with a name and a photo —
// the same confirmation as the dispatch note's link (src/lib/loads/load-service.server.ts), scoped to the
// customer's own organisation and sites.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { Load } from '@/models';
import { AppError } from '@/lib/api-errors';
import { checkUpload, storeAttachment } from '@/lib/attachments.server';
import { confirmDelivery } from '@/lib/loads/load-service.server';
import type { DeliveryInput } from './portal-forms';
import type { PortalScope } from './portal-scope.server';

export interface PortalDeliveryRow {
  reference: string;
  status: 'dispatched' | 'delivered';
  site: string;
  orderReference: string;
  bins: number;
  dispatchedAt: string | null;
  deliveredAt: string | null;
  receivedByName: string | null;
  carrier: string | null;
}

const SCOPED = `FROM loads l JOIN hire_orders ho ON ho.id = l.hire_order_id JOIN sites s ON s.id = l.destination_site_id
  WHERE ho.customer_id = $1 AND ($2::int[] IS NULL OR l.destination_site_id = ANY($2::int[])) AND l.purpose = 'hire'`;

/** Loads on the way (all of them) and the last ones delivered. */
export async function portalDeliveries(scope: PortalScope): Promise<PortalDeliveryRow[]> {
  return sequelize.query<PortalDeliveryRow>(
    `SELECT * FROM (
       SELECT l.reference, l.status, s.name AS site, ho.reference AS "orderReference",
              (SELECT count(*)::int FROM trips t WHERE t.load_id = l.id) AS bins,
              l.dispatched_at AS "dispatchedAt", l.delivered_at AS "deliveredAt", l.received_by_name AS "receivedByName", l.carrier,
              row_number() OVER (PARTITION BY l.status ORDER BY COALESCE(l.delivered_at, l.dispatched_at) DESC) AS n
         ${SCOPED} AND l.status IN ('dispatched', 'delivered')
     ) x WHERE status = 'dispatched' OR n <= 10
     ORDER BY status DESC, COALESCE("deliveredAt", "dispatchedAt") DESC`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

export async function confirmFromPortal(
  scope: PortalScope,
  input: DeliveryInput,
  photo: { bytes: Uint8Array; filename: string | null } | null,
): Promise<{ reference: string; delivered: number; already: boolean }> {
  const [row] = await sequelize.query<{ id: number }>(`SELECT l.id ${SCOPED} AND l.reference = $3`, {
    bind: [scope.organisationId, scope.siteIds, input.reference],
    type: QueryTypes.SELECT,
  });
  const load = row ? await Load.findByPk(row.id) : null;
  if (!load) throw new AppError('not_found', 'There is no such delivery to your sites.');
  if (photo) await checkUpload(photo.bytes, 'photo');
  const stored = photo ? await storeAttachment({ ...photo, purpose: 'photo', organisationId: scope.organisationId, uploadedBy: scope.userId }) : null;
  const result = await confirmDelivery(load, { receivedByName: input.receivedByName, photoId: stored?.id ?? null, userId: scope.userId });
  return { reference: load.reference, ...result };
}
