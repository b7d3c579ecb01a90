// Reads the trips a statistics period needs — only the columns trip-stats.ts uses — and the names to show
// beside the group keys. For 600 bins over 18 months that is a few thousand rows.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { startOfLocalDay } from './bin-life.server';
import { addDays } from '@/lib/calendar';
import type { GroupBy, Trip } from './trip-stats';
import { statsTable, type StatsTable } from './trip-stats-table';
import type { ReportPeriod } from './report-period';

/** How far back to look for each bin's trip before the period (its first depot gap); older gaps are not counted. */
const LOOKBACK_DAYS = 365;

interface TripRow {
  asset_id: number;
  customer_id: number;
  depot_site_id: number;
  dispatched_at: Date;
  delivered_at: Date | null;
  collected_at: Date | null;
  returned_at: Date | null;
}

const iso = (v: Date | null) => (v === null ? null : new Date(v).toISOString());

/**
 * The trips that belong to the period (on hire on one of its days or back inside it), plus each bin's last
 * trip back before the period so the time at the depot before its first trip in the period is known.
 */
export async function tripsForPeriod(period: ReportPeriod, timeZone: string): Promise<Trip[]> {
  const columns = 't.asset_id, t.customer_id, t.depot_site_id, t.dispatched_at, t.delivered_at, t.collected_at, t.returned_at';
  const rows = await sequelize.query<TripRow>(
    `SELECT ${columns} FROM trips t
      WHERE t.dispatched_at < ${startOfLocalDay('$3', '$1')}
        AND (t.returned_at IS NULL OR t.returned_at >= ${startOfLocalDay('$2', '$1')})
     UNION ALL
     (SELECT DISTINCT ON (t.asset_id) ${columns} FROM trips t
       WHERE t.returned_at < ${startOfLocalDay('$2', '$1')} AND t.returned_at >= ${startOfLocalDay('$4', '$1')}
       ORDER BY t.asset_id, t.returned_at DESC)`,
    { bind: [timeZone, period.from, addDays(period.to, 1), addDays(period.from, -LOOKBACK_DAYS)], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    assetId: String(r.asset_id),
    customerId: String(r.customer_id),
    depotId: String(r.depot_site_id),
    dispatchedAt: iso(r.dispatched_at)!,
    deliveredAt: iso(r.delivered_at),
    collectedAt: iso(r.collected_at),
    returnedAt: iso(r.returned_at),
  }));
}

export interface GroupName {
  name: string;
  /** Bins: the GRAI, for the link to the bin page. */
  grai?: string;
}

async function namesFor(groupBy: GroupBy, keys: string[]): Promise<Map<string, GroupName>> {
  const ids = keys.map(Number).filter(Number.isInteger);
  if (ids.length === 0) return new Map();
  const sql = {
    asset: 'SELECT id, serial AS name, grai FROM assets WHERE id = ANY($1::int[])',
    customer: 'SELECT id, name, NULL AS grai FROM organisations WHERE id = ANY($1::int[])',
    depot: 'SELECT id, name, NULL AS grai FROM sites WHERE id = ANY($1::int[])',
  }[groupBy];
  const rows = await sequelize.query<{ id: number; name: string; grai: string | null }>(sql, { bind: [ids], type: QueryTypes.SELECT });
  return new Map(rows.map((r) => [String(r.id), r.grai ? { name: r.name, grai: r.grai } : { name: r.name }]));
}

export interface TripStatistics extends StatsTable {
  names: Map<string, GroupName>;
  tripsRead: number;
  timeZone: string;
}

export async function tripStatistics(period: ReportPeriod, groupBy: GroupBy): Promise<TripStatistics> {
  const { timeZone } = await getSettings();
  const trips = await tripsForPeriod(period, timeZone);
  const table = statsTable(trips, { groupBy, period, timeZone });
  const names = await namesFor(
    groupBy,
    table.rows.map((r) => r.key),
  );
  return { ...table, names, tripsRead: trips.length, timeZone };
}
