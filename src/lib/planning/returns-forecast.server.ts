/**
 * Reads the trip history the returns forecast works from (`returns-forecast.ts`). One query; dates are local
 * dates in the operator's time zone. Keys are the database ids as strings: customer site (or the customer's
 * discharge site when the trip has no site), bin type, depots.
 */
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';
import type { HistoryTrip } from './returns-forecast';

interface Row {
  site_id: number | null;
  customer_id: number;
  bin_type_id: number;
  depot_site_id: number;
  closing_site_id: number | null;
  dispatched_at: Date;
  returned_at: Date | null;
}

export async function loadTripHistory(): Promise<HistoryTrip[]> {
  const { timeZone } = await getSettings();
  const rows = await sequelize.query<Row>(
    `SELECT coalesce(t.customer_site_id, t.discharge_site_id) AS site_id, t.customer_id, a.bin_type_id,
            t.depot_site_id, t.closing_site_id, t.dispatched_at,
            CASE WHEN t.status = 'closed' THEN t.returned_at END AS returned_at
       FROM trips t JOIN assets a ON a.id = t.asset_id
      ORDER BY t.dispatched_at, t.id`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => {
    const dispatchedOn = localDate(r.dispatched_at, timeZone);
    const returnedOn = r.returned_at ? localDate(r.returned_at, timeZone) : null;
    return {
      // A trip with no site recorded is grouped under its customer, apart from real sites.
      siteKey: r.site_id !== null ? `site:${r.site_id}` : `customer:${r.customer_id}`,
      binTypeKey: String(r.bin_type_id),
      dispatchedOn,
      returnedOn: returnedOn !== null && returnedOn < dispatchedOn ? dispatchedOn : returnedOn,
      returnDepotKey: r.closing_site_id !== null ? String(r.closing_site_id) : null,
      dispatchDepotKey: String(r.depot_site_id),
    };
  });
}
