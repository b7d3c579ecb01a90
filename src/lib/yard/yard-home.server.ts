// The yard's start page: what the depot holds, what to prepare for the open
// hire orders, what is on its way in, what waits for a test, recent scans.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { addDays, localDate } from '@/lib/calendar';
import type { Action, Status } from '@/lib/scans/lifecycle';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';
import { getSettings } from '@/lib/settings/settings.server';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';

export interface YardHome {
  depot: { id: number; name: string } | null;
  today: string;
  counts: Array<{ status: Status; count: number }>;
  orders: Array<{ id: number; reference: string; customer: string; neededBy: string; quantity: number; loaded: number; binType: string }>;
  toPrepare: number;
  preparedHere: number;
  expected: { returning: number; awaitingCollection: number; transfersIn: number };
  testsDue: Array<{ grai: string; serial: string; nextDue: string; status: Status }>;
  testsDueCount: number;
  quarantined: number;
  recent: Array<{ grai: string; serial: string; action: Action; occurredAt: string; statusTo: Status; inferred: boolean }>;
}

const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

export async function loadYardHome(depotId: number | null, userId: number): Promise<YardHome> {
  const settings = await getSettings();
  const today = localDate(new Date(), settings.timeZone);
  const empty: YardHome = {
    depot: null,
    today,
    counts: [],
    orders: [],
    toPrepare: 0,
    preparedHere: 0,
    expected: { returning: 0, awaitingCollection: 0, transfersIn: 0 },
    testsDue: [],
    testsDueCount: 0,
    quarantined: 0,
    recent: [],
  };
  if (!depotId) return empty;
  const [depot] = await q<{ id: number; name: string }>('SELECT id, name FROM sites WHERE id = $1', [depotId]);
  const [counts, orders, expected, transfers, testsDue, recent] = await Promise.all([
    // Retired bins have left the pool even when their scrap still stands in the yard.
    q<{ status: Status; count: number }>(`SELECT status, count(*)::int AS count FROM assets WHERE site_id = $1 AND status <> 'retired' GROUP BY status ORDER BY count DESC`, [
      depotId,
    ]),
    // The same list "Start a load" offers (src/pages/loads/new.astro): the card counts what it opens.
    openOrdersAt(depotId).then((list) =>
      list.map(({ id, reference, customer, neededBy, quantity, loaded, binType }) => ({ id, reference, customer, neededBy, quantity, loaded, binType })),
    ),
    // Bins that left from this depot come back to it, as a rule.
    q<{ returning: number; awaiting: number }>(
      `SELECT count(*) FILTER (WHERE a.status = 'in_transit' AND a.leg = 'return')::int AS returning,
              count(*) FILTER (WHERE a.status = 'awaiting_collection')::int AS awaiting
         FROM assets a JOIN trips t ON t.id = a.current_trip_id
        WHERE t.depot_site_id = $1`,
      [depotId],
    ),
    // Empties on a transfer load addressed to this depot, still on the road.
    q<{ n: number }>(
      `SELECT count(*)::int AS n FROM assets a
        WHERE a.status = 'in_transit' AND a.leg = 'transfer'
          AND (SELECT l.destination_site_id FROM scan_events e JOIN loads l ON l.id = (e.payload->>'loadId')::int
                WHERE e.asset_id = a.id AND e.action = 'dispatch' AND e.payload ? 'loadId' AND e.voided_at IS NULL
                ORDER BY e.occurred_at DESC LIMIT 1) = $1`,
      [depotId],
    ),
    q<YardHome['testsDue'][number] & { total: number }>(
      `SELECT grai, serial, next_due AS "nextDue", status, count(*) OVER ()::int AS total FROM assets
        WHERE site_id = $1 AND status IN ('available', 'quarantine', 'in_repair') AND next_due <= $2
        ORDER BY next_due LIMIT 8`,
      [depotId, addDays(today, DUE_SOON_DAYS)],
    ),
    q<YardHome['recent'][number]>(
      `SELECT a.grai, a.serial, e.action, e.occurred_at AS "occurredAt", e.status_to AS "statusTo", e.inferred
         FROM scan_events e JOIN assets a ON a.id = e.asset_id
        WHERE e.user_id = $1 AND e.voided_at IS NULL ORDER BY e.occurred_at DESC, e.id DESC LIMIT 8`,
      [userId],
    ),
  ]);
  const toPrepare = orders.reduce((sum, o) => sum + Math.max(0, o.quantity - o.loaded), 0);
  const byStatus = new Map(counts.map((c) => [c.status, c.count]));
  return {
    depot: depot ?? null,
    today,
    counts,
    orders,
    toPrepare,
    preparedHere: byStatus.get('prepared') ?? 0,
    expected: { returning: expected[0]?.returning ?? 0, awaitingCollection: expected[0]?.awaiting ?? 0, transfersIn: transfers[0]?.n ?? 0 },
    testsDue: testsDue.map(({ total: _total, ...t }) => t),
    testsDueCount: testsDue[0]?.total ?? 0,
    quarantined: (byStatus.get('quarantine') ?? 0) + (byStatus.get('in_repair') ?? 0),
    recent: recent.map((r) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
  };
}
