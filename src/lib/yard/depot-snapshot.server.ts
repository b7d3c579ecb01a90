// What a yard phone needs to keep working without signal: the bins at the
// user's home depot and the bins on their way back to it (with the state the
// rule table reads), the liner lots usable there (first-expiry-first-out) and
// the depot's open hire orders. One read, a few hundred bytes per bin.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { localDate } from '@/lib/calendar';
import type { DepotSnapshot, SnapshotBin, SnapshotOrder } from './yard-offline';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';
import { lotsAt, type SiteOption } from './action-options.server';
import { getSettings } from '@/lib/settings/settings.server';

/** More bins than any one depot holds; a guard, not a page size. */
const MAX_BINS = 20_000;

export async function loadDepotSnapshot(depotId: number, now = new Date()): Promise<DepotSnapshot | null> {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const [depot] = await sequelize.query<SiteOption>('SELECT id, name, kind FROM sites WHERE id = $1', { bind: [depotId], type: QueryTypes.SELECT });
  if (!depot) return null;
  const [bins, lots, orders] = await Promise.all([
    sequelize.query<SnapshotBin>(
      // Here: standing at the depot. Expected: on a trip that left from this depot and has not come back
      // (bins come home to the depot they left from, as a rule; a missed collection scan is common).
      `SELECT a.id, a.grai, a.serial, a.bin_type_id AS "binTypeId", bt.name AS "binType", a.status,
              a.site_id AS "siteId", s.kind AS "siteKind", a.leg, a.prep_checked AS "prepChecked",
              a.liner_lot_id AS "linerLotId", a.filled, (a.current_trip_id IS NOT NULL) AS "tripOpen",
              a.next_due AS "nextDue", a.version,
              CASE WHEN a.site_id = $1 THEN 'here' ELSE 'expected' END AS "where"
         FROM assets a
         JOIN bin_types bt ON bt.id = a.bin_type_id
         LEFT JOIN sites s ON s.id = a.site_id
         LEFT JOIN trips t ON t.id = a.current_trip_id
        WHERE (a.site_id = $1 AND a.status <> 'retired')
           OR (t.depot_site_id = $1 AND a.status IN ('on_hire', 'awaiting_collection', 'in_transit') AND (a.status <> 'in_transit' OR a.leg = 'return'))
        ORDER BY a.grai
        LIMIT ${MAX_BINS}`,
      { bind: [depotId], type: QueryTypes.SELECT },
    ),
    lotsAt(depotId, today),
    openOrdersAt(depotId, { limit: 200 }).then((list) =>
      list.map(({ id, reference, customer, neededBy, quantity, loaded, binTypeId }): SnapshotOrder => ({ id, reference, customer, neededBy, quantity, loaded, binTypeId })),
    ),
  ]);
  return { depot, generatedAt: now.toISOString(), today, timeZone: settings.timeZone, bins, lots, orders };
}
