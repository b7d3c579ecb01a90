// The yard's start page: what the depot holds, what to prepare for the open
// hire orders, what is on its way in, what waits for a test, recent scans.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { localDate } from '@/lib/calendar';
import type { Action, Status } from '@/lib/scans/lifecycle';
import { getSettings } from '@/lib/settings/settings.server';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';
import { countYardLists, hereByStatus, yardList } from './yard-lists.server';

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
  const [counts, orders, figures, testsDue, recent] = await Promise.all([
    hereByStatus(depotId, today),
    // The same list "Start a load" offers (src/pages/loads/new.astro): the card counts what it opens.
    openOrdersAt(depotId).then((list) =>
      list.map(({ id, reference, customer, neededBy, quantity, loaded, binType }) => ({ id, reference, customer, neededBy, quantity, loaded, binType })),
    ),
    // Every other figure is the length of its list on /yard/bins (yard-lists.server.ts).
    countYardLists(depotId, today),
    // A preview of the tests list: its first few.
    yardList(depotId, today, { list: 'tests-due', status: null }).then((rows) => rows.slice(0, 8)),
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
    expected: { returning: figures.returning, awaitingCollection: figures.awaiting, transfersIn: figures['transfers-in'] },
    testsDue: testsDue.map(({ grai, serial, nextDue, status }) => ({ grai, serial, nextDue, status })),
    testsDueCount: figures['tests-due'],
    quarantined: figures.held,
    recent: recent.map((r) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
  };
}
