// The bins behind each figure of the yard start page (yard-lists.ts names the lists). One SQL condition per
// list serves both the figure (countYardLists) and the list page (yardList), so the two cannot drift apart.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { addDays } from '@/lib/calendar';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';
import type { Status } from '@/lib/scans/lifecycle';
import { YARD_LISTS, type YardList, type YardListKey } from './yard-lists';

// :depot the depot, :dueBy the last day "due soon" reaches, :status the status a "here" list narrows to (null:
// all). Named replacements, not bind parameters: a query that leaves one out would leave its type unknown.
const TRIP = 'LEFT JOIN trips t ON t.id = a.current_trip_id';
const WHERE: Record<YardList, string> = {
  // Retired bins have left the pool even when their scrap still stands in the yard.
  here: `a.site_id = :depot AND a.status <> 'retired' AND (CAST(:status AS text) IS NULL OR a.status::text = :status)`,
  // Bins that left from this depot come back to it, as a rule.
  returning: `t.depot_site_id = :depot AND a.status = 'in_transit' AND a.leg = 'return'`,
  awaiting: `t.depot_site_id = :depot AND a.status = 'awaiting_collection'`,
  // Empties on a transfer load addressed to this depot, still on the road.
  'transfers-in': `a.status = 'in_transit' AND a.leg = 'transfer'
    AND (SELECT l.destination_site_id FROM scan_events e JOIN loads l ON l.id = (e.payload->>'loadId')::int
          WHERE e.asset_id = a.id AND e.action = 'dispatch' AND e.payload ? 'loadId' AND e.voided_at IS NULL
          ORDER BY e.occurred_at DESC LIMIT 1) = :depot`,
  'tests-due': `a.site_id = :depot AND a.status IN ('available', 'quarantine', 'in_repair') AND a.next_due <= CAST(:dueBy AS date)`,
  held: `a.site_id = :depot AND a.status IN ('quarantine', 'in_repair')`,
};

function params(depotId: number, today: string, status: Status | null): Record<string, unknown> {
  return { depot: depotId, dueBy: addDays(today, DUE_SOON_DAYS), status };
}

/** Every list's length for one depot, in one query (the start page's figures). */
export async function countYardLists(depotId: number, today: string): Promise<Record<YardList, number>> {
  const cols = YARD_LISTS.map((l) => `count(*) FILTER (WHERE ${WHERE[l]})::int AS "${l}"`).join(',\n ');
  const [row] = await sequelize.query<Record<YardList, number>>(`SELECT ${cols} FROM assets a ${TRIP}`, {
    replacements: params(depotId, today, null),
    type: QueryTypes.SELECT,
  });
  return row!;
}

/** The "here" list by status, largest first (the start page's depot counts; each opens its "here" list). */
export async function hereByStatus(depotId: number, today: string): Promise<Array<{ status: Status; count: number }>> {
  return sequelize.query<{ status: Status; count: number }>(
    `SELECT a.status, count(*)::int AS count FROM assets a WHERE ${WHERE.here} GROUP BY a.status ORDER BY count DESC, a.status`,
    { replacements: params(depotId, today, null), type: QueryTypes.SELECT },
  );
}

export interface YardListRow {
  grai: string;
  serial: string;
  status: Status;
  nextDue: string;
  /** Where the bin is: its site (the customer's for bins out there), else null. */
  siteName: string | null;
  customer: string | null;
}

/** The bins of one list, soonest test first for the tests list, else by serial. */
export async function yardList(depotId: number, today: string, key: YardListKey): Promise<YardListRow[]> {
  const order = key.list === 'tests-due' ? 'a.next_due, a.serial' : 'a.serial';
  return sequelize.query<YardListRow>(
    `SELECT a.grai, a.serial, a.status, a.next_due AS "nextDue", s.name AS "siteName", o.name AS customer
       FROM assets a ${TRIP}
       LEFT JOIN sites s ON s.id = a.site_id
       LEFT JOIN organisations o ON o.id = a.customer_id
      WHERE ${WHERE[key.list]}
      ORDER BY ${order}`,
    { replacements: params(depotId, today, key.status), type: QueryTypes.SELECT },
  );
}

/** The list page's data: the depot's name and the list's bins (null when the depot is unknown). */
export async function loadYardList(depotId: number, today: string, key: YardListKey): Promise<{ depotName: string; rows: YardListRow[] } | null> {
  const [depot] = await sequelize.query<{ name: string }>('SELECT name FROM sites WHERE id = :depot', { replacements: { depot: depotId }, type: QueryTypes.SELECT });
  return depot ? { depotName: depot.name, rows: await yardList(depotId, today, key) } : null;
}
