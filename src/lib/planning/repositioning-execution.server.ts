/**
 * Repositioning orders carried out by transfer loads: each dispatch scan on a load between the two depots names the
 * oldest open order of its lane and bin type (the scan service calls `claimRepositioning()` and, once the scan is
 * written, `syncRepositioningOrder()`; voiding a scan syncs again); an order is done when as many bins have gone as
 * it asked for, and open again if a voided scan takes it below that. Kept apart from the approval, so the scan path
 * does not load the solver.
 */
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';

const q = <T extends object>(sql: string, bind: unknown[] = [], t?: Transaction) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });

/** A transfer dispatch on a load between two depots: the oldest open repositioning order of its lane and bin type. */
export async function claimRepositioning(loadId: number, assetId: number, t: Transaction): Promise<{ repositioningOrderId: number; repositioningRef: string } | null> {
  const [row] = await q<{ id: number; reference: string }>(
    `SELECT ro.id, ro.reference FROM loads l JOIN assets a ON a.id = $2
       JOIN repositioning_orders ro ON ro.from_site_id = l.depot_site_id AND ro.to_site_id = l.destination_site_id AND ro.bin_type_id = a.bin_type_id
      WHERE l.id = $1 AND l.purpose = 'transfer' AND ro.status = 'open'
      ORDER BY ro.id LIMIT 1 FOR UPDATE OF ro`,
    [loadId, assetId],
    t,
  );
  return row ? { repositioningOrderId: row.id, repositioningRef: row.reference } : null;
}

export const SENT_SQL = `(SELECT count(*)::int FROM scan_events e WHERE e.action = 'dispatch' AND e.payload ? 'repositioningOrderId'
                    AND (e.payload->>'repositioningOrderId')::int = ro.id AND e.voided_at IS NULL)`;

/** Done once as many bins have gone as the order asked for; open again when a voided scan takes it below. */
export async function syncRepositioningOrder(id: number, t: Transaction): Promise<void> {
  await sequelize.query(
    `UPDATE repositioning_orders ro SET status = CASE WHEN ${SENT_SQL} >= ro.quantity THEN 'done' ELSE 'open' END,
            done_at = CASE WHEN ${SENT_SQL} >= ro.quantity THEN COALESCE(ro.done_at, now()) END, version = version + 1, updated_at = now()
      WHERE ro.id = $1 AND ro.status <> 'cancelled' AND (ro.status = 'done') <> (${SENT_SQL} >= ro.quantity)`,
    { bind: [id], transaction: t },
  );
}
