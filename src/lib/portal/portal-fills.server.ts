// Fill records from the portal: the customer records what went into one of their bins — product, volume or mass,
// temperature and the tamper-evident seal numbers — through the scan service's fill action (the one path by which
// a bin's state changes), so the receiving site's seal check works as for yard scans. Scoped to the customer's
// organisation and sites; the fill planner is the order's own (fillPlannerData of lib/planning).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import type { ScanOutcome } from '@/lib/scans/scan-service.server';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { fillPlannerData, type FillPlannerData } from '@/lib/planning/orders.server';
import type { FillRecordInput } from './portal-forms';
import { SCOPE_SITE_SQL, type PortalScope } from './portal-scope.server';

export interface FillableBin {
  grai: string;
  serial: string;
  site: string | null;
  siteId: number | null;
  orderId: number | null;
  orderReference: string | null;
}

/** Bins the customer may fill now: on hire to them at a site of their scope (or on the way there), empty. */
export async function fillableBins(scope: PortalScope): Promise<FillableBin[]> {
  return sequelize.query<FillableBin>(
    `SELECT a.grai, a.serial, cs.name AS site, ${SCOPE_SITE_SQL} AS "siteId", ho.id AS "orderId", ho.reference AS "orderReference"
       FROM assets a JOIN trips t ON t.id = a.current_trip_id LEFT JOIN sites s ON s.id = a.site_id
       LEFT JOIN sites cs ON cs.id = ${SCOPE_SITE_SQL} LEFT JOIN hire_orders ho ON ho.id = t.hire_order_id AND ho.customer_id = $1
      WHERE a.customer_id = $1 AND NOT a.filled AND (a.status = 'on_hire' OR (a.status = 'in_transit' AND a.leg = 'outbound'))
        AND ($2::int[] IS NULL OR ${SCOPE_SITE_SQL} = ANY($2::int[]))
      ORDER BY cs.name, a.serial`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

export interface RecentFill {
  grai: string;
  serial: string;
  product: string | null;
  volumeL: string | null;
  massKg: string | null;
  temperatureC: string | null;
  seals: string[];
  filledAt: string;
  site: string | null;
}

/** Their bins filled on the current trips, newest first. */
export async function recentFills(scope: PortalScope, limit = 30): Promise<RecentFill[]> {
  const rows = await sequelize.query<RecentFill>(
    `SELECT a.grai, a.serial, t.fill_product AS product, t.fill_volume_l AS "volumeL", t.fill_mass_kg AS "massKg", t.fill_temperature_c AS "temperatureC",
            t.seals_applied AS seals, t.filled_at AS "filledAt", cs.name AS site
       FROM assets a JOIN trips t ON t.id = a.current_trip_id LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN sites cs ON cs.id = ${SCOPE_SITE_SQL}
      WHERE a.customer_id = $1 AND t.filled_at IS NOT NULL AND a.filled
        AND ($2::int[] IS NULL OR ${SCOPE_SITE_SQL} = ANY($2::int[]))
      ORDER BY t.filled_at DESC LIMIT $3`,
    { bind: [scope.organisationId, scope.siteIds, limit], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, filledAt: new Date(r.filledAt).toISOString() }));
}

/**
 * Records the fill through the scan intake (the scan service, then its alerts). A bin not on hire to them at a site of
 * their scope is "no such bin of yours"; one already filled is the rule table's refusal; the same form sent twice
 * (the client event id rendered into it) replays the first answer.
 */
export async function recordPortalFill(user: SessionUser, scope: PortalScope, input: FillRecordInput): Promise<ScanOutcome> {
  const [bin] = await sequelize.query<{ id: number; site_id: number | null }>(
    `SELECT a.id, ${SCOPE_SITE_SQL} AS site_id FROM assets a LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.grai = $1 AND a.customer_id = $2 AND a.status IN ('on_hire', 'in_transit') AND ($3::int[] IS NULL OR ${SCOPE_SITE_SQL} = ANY($3::int[]))`,
    { bind: [input.grai, scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
  if (!bin)
    throw new AppError('not_found', 'That bin is not one of yours waiting to be filled; choose one from the list.', [{ path: 'grai', message: 'Choose a bin from the list.' }]);
  return recordScanFromClient(user, {
    clientEventId: input.clientEventId,
    assetId: bin.id,
    action: 'fill_seal',
    siteId: bin.site_id,
    fill: { product: input.product, volumeL: input.volumeL, massKg: input.massKg, temperatureC: input.temperatureC, seals: input.seals },
  });
}

/** The fill planner of the order a bin of theirs travels on (none when the bin is not theirs or has no order). */
export async function portalFillPlanner(scope: PortalScope, grai: string | null): Promise<FillPlannerData | null> {
  if (!grai) return null;
  const bin = (await fillableBins(scope)).find((b) => b.grai === grai);
  if (!bin?.orderId) return null;
  return fillPlannerData(bin.orderId);
}
