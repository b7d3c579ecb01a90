// The yard's liner screens at the home depot: the compact stock view, counts, transfers between depots (sent,
// in transit, arrived) and liner kits sent with folded bins. The moves themselves are liner-ledger.server.ts's.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { DEMAND_STATUSES_SQL } from '@/lib/planning/order-status';
import { inTransitTo, stockAt, type LotStock } from './liner-ledger.server';

const rows = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

export interface YardLinerView {
  depot: { id: number; name: string };
  lots: LotStock[];
  arriving: Array<{ sentMoveId: number; lotNumber: string; from: string; quantity: number; sentAt: Date }>;
  otherDepots: Array<{ id: number; name: string }>;
  orders: Array<{ id: number; reference: string; customer: string; neededBy: string; bins: number }>;
  recentCounts: Array<{ lotNumber: string; counted: number; expected: number; at: Date; who: string | null }>;
}

export function homeDepotOf(user: { homeSiteId: number | null }): number {
  if (!user.homeSiteId) throw new AppError('unprocessable', 'You have no home depot yet. Ask an administrator to set it.');
  return user.homeSiteId;
}

export async function yardLinerView(siteId: number): Promise<YardLinerView | null> {
  const [depot] = await rows<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE id = $1 AND kind = 'depot'`, [siteId]);
  if (!depot) return null;
  const [lots, transit, otherDepots, orders, recentCounts] = await Promise.all([
    stockAt(siteId),
    inTransitTo(siteId),
    rows<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'depot' AND active AND id <> $1 ORDER BY name`, [siteId]),
    rows<YardLinerView['orders'][number]>(
      `SELECT ho.id, ho.reference, o.name AS customer, ho.needed_by::text AS "neededBy", ho.quantity AS bins FROM hire_orders ho JOIN organisations o ON o.id = ho.customer_id
        WHERE ho.depot_site_id = $1 AND ho.status IN (${DEMAND_STATUSES_SQL}) ORDER BY ho.needed_by, ho.id LIMIT 50`,
      [siteId],
    ),
    rows<YardLinerView['recentCounts'][number]>(
      `SELECT l.lot_number AS "lotNumber", m.counted, m.expected, m.occurred_at AS at, u.name AS who FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
         LEFT JOIN users u ON u.id = m.user_id WHERE m.site_id = $1 AND m.kind = 'counted' ORDER BY m.occurred_at DESC, m.id DESC LIMIT 10`,
      [siteId],
    ),
  ]);
  const names = new Map((await rows<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'depot'`)).map((s) => [s.id, s.name]));
  const lotNumbers = new Map(
    (await rows<{ id: number; lot_number: string }>('SELECT id, lot_number FROM liner_lots WHERE id = ANY($1::int[])', [transit.map((x) => x.lotId)])).map((l) => [
      l.id,
      l.lot_number,
    ]),
  );
  return {
    depot,
    lots,
    arriving: transit.map((x) => ({
      sentMoveId: x.sentMoveId,
      lotNumber: lotNumbers.get(x.lotId) ?? '?',
      from: names.get(x.fromSiteId) ?? '?',
      quantity: x.quantity,
      sentAt: x.sentAt,
    })),
    otherDepots,
    orders,
    recentCounts,
  };
}

/** A transfer's arrival may be booked only at the depot it was sent to. */
export async function checkArrivalHere(sentMoveId: number, siteId: number): Promise<void> {
  const [m] = await rows<{ to_site_id: number }>(`SELECT to_site_id FROM liner_moves WHERE id = $1 AND kind = 'sent'`, [sentMoveId]);
  if (!m || m.to_site_id !== siteId) throw new AppError('not_found', 'No transfer on its way to your depot has that number.');
}

/** Kits go out on an order served from this depot. */
export async function checkOrderHere(hireOrderId: number, siteId: number): Promise<void> {
  const [o] = await rows<{ depot_site_id: number; status: string }>('SELECT depot_site_id, status FROM hire_orders WHERE id = $1', [hireOrderId]);
  if (!o || o.depot_site_id !== siteId)
    throw new AppError('unprocessable', 'That hire order is not served from your depot.', [{ path: 'hireOrderId', message: 'Choose an order of this depot.' }]);
}
