// The customer's start page: their bins on hire, site by site, with days on
// hire and free days left (the overdue rule of src/lib/fleet/overdue-return.ts). Every query is scoped to the customer's own
// organisation here, on the server.
import { isInspectionLapsed } from '@/lib/scans/lifecycle';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { daysBetween, localDate } from '@/lib/calendar';
import { overdueBack, tripTermsOf, tripTermsSelectSql, type TripTermsRow } from '@/lib/fleet/overdue-return';
import type { Status } from '@/lib/scans/lifecycle';
import { getSettings } from '@/lib/settings/settings.server';
import { SCOPE_SITE_SQL, scopeSites, type PortalScope } from './portal-scope.server';

export interface PortalBin {
  grai: string;
  serial: string;
  status: Status;
  filled: boolean;
  product: string | null;
  since: string;
  daysOnHire: number;
  freeDaysLeft: number;
  overdue: boolean;
  testLapsed: boolean;
}
/** A bin on the road: to one of the customer's sites (outbound) or back from them to the depot (return). */
export interface RoadBin extends PortalBin {
  leg: 'outbound' | 'return' | 'transfer' | null;
  toSite: string | null;
}
export interface PortalSite {
  id: number;
  name: string;
  address: string | null;
  bins: PortalBin[];
  counts: Partial<Record<Status, number>>;
}

export async function loadPortalHome(scope: PortalScope) {
  const organisationId = scope.organisationId;
  const settings = await getSettings();
  const today = localDate(new Date(), settings.timeZone);
  const [org] = await sequelize.query<{ name: string; free_days: number }>('SELECT name, free_days FROM organisations WHERE id = $1', {
    bind: [organisationId],
    type: QueryTypes.SELECT,
  });
  const sites = await scopeSites(scope);
  // A bin counts at the site it stands at; one on the road, at the site its trip serves.
  const bins = await sequelize.query<
    {
      site_id: number | null;
      grai: string;
      serial: string;
      status: Status;
      filled: boolean;
      product: string | null;
      start_day: string;
      delivered_on: string | null;
      dispatched_on: string;
      leg: RoadBin['leg'];
      to_site: string | null;
      next_due: string | null;
    } & TripTermsRow
  >(
    `SELECT a.site_id, a.grai, a.serial, a.status, a.filled, t.fill_product AS product, a.leg, cs.name AS to_site, a.next_due::text,
            to_char((COALESCE(t.delivered_at, t.dispatched_at) AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS start_day,
            to_char((t.delivered_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS delivered_on,
            to_char((t.dispatched_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS dispatched_on,
            ${tripTermsSelectSql('$2::text')}
       FROM assets a JOIN trips t ON t.id = a.current_trip_id JOIN organisations o ON o.id = a.customer_id
       LEFT JOIN sites cs ON cs.id = t.customer_site_id LEFT JOIN sites s ON s.id = a.site_id
      WHERE a.customer_id = $1 AND a.status IN ('on_hire', 'awaiting_collection', 'in_transit')
        AND ($3::int[] IS NULL OR ${SCOPE_SITE_SQL} = ANY($3::int[]))
      ORDER BY start_day, a.serial`,
    { bind: [organisationId, settings.timeZone, scope.siteIds], type: QueryTypes.SELECT },
  );
  const freeDays = org?.free_days ?? 0;
  const bySite = new Map<number | null, PortalBin[]>();
  const road: RoadBin[] = [];
  for (const b of bins) {
    // One rule for "overdue back" everywhere (src/lib/fleet/overdue-return.ts), by the terms billing charges this
    // trip by (the tariff in force on its dispatch day).
    const terms = tripTermsOf(b);
    const check = overdueBack({ status: b.status, deliveredOn: b.delivered_on, dispatchedOn: b.dispatched_on, today, ...terms });
    const daysOnHire = check.daysWithCustomer ?? Math.max(0, daysBetween(b.start_day, today));
    const days = { daysOnHire, freeDaysLeft: terms.freeDays - daysOnHire, overdue: check.overdue };
    const list = bySite.get(b.site_id) ?? [];
    const bin = {
      grai: b.grai,
      serial: b.serial,
      status: b.status,
      filled: b.filled,
      product: b.product,
      since: b.start_day,
      ...days,
      testLapsed: isInspectionLapsed(b.next_due, today),
    };
    if (b.status === 'in_transit') road.push({ ...bin, leg: b.leg, toSite: b.to_site });
    else list.push(bin);
    bySite.set(b.site_id, list);
  }
  const count = (list: PortalBin[]) => list.reduce<Partial<Record<Status, number>>>((acc, b) => ((acc[b.status] = (acc[b.status] ?? 0) + 1), acc), {});
  const perSite: PortalSite[] = sites.map((s) => ({ ...s, bins: bySite.get(s.id) ?? [], counts: count(bySite.get(s.id) ?? []) }));
  // Bins on the way to the customer first, then those on their way back.
  const onTheRoad = [...road].sort((x, y) => (x.leg === 'outbound' ? 0 : 1) - (y.leg === 'outbound' ? 0 : 1) || x.since.localeCompare(y.since));
  return {
    organisation: org?.name ?? '',
    freeDays,
    today,
    sites: perSite,
    onTheRoad,
    totals: {
      onHire: bins.filter((b) => b.status === 'on_hire').length,
      awaiting: bins.filter((b) => b.status === 'awaiting_collection').length,
      overdue: [...bySite.values()].flat().filter((b) => b.overdue).length,
      onTheWay: road.filter((b) => b.leg === 'outbound').length,
    },
  };
}
