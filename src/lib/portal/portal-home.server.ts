// The customer's start page: their bins on hire, site by site, with days on
// hire and free days left (the overdue rule of src/lib/fleet/overdue-return.ts). Every query is scoped to the customer's own
// organisation here, on the server.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { daysBetween, localDate } from '@/lib/calendar';
import { overdueBack } from '@/lib/fleet/overdue-return';
import type { Status } from '@/lib/scans/lifecycle';
import { getSettings } from '@/lib/settings/settings.server';

export interface PortalBin { grai: string; serial: string; status: Status; filled: boolean; product: string | null; since: string; daysOnHire: number; freeDaysLeft: number; overdue: boolean }
export interface PortalSite { id: number; name: string; address: string | null; bins: PortalBin[]; counts: Partial<Record<Status, number>> }

export async function loadPortalHome(organisationId: number) {
  const settings = await getSettings();
  const today = localDate(new Date(), settings.timeZone);
  const [org] = await sequelize.query<{ name: string; free_days: number }>('SELECT name, free_days FROM organisations WHERE id = $1', { bind: [organisationId], type: QueryTypes.SELECT });
  const sites = await sequelize.query<{ id: number; name: string; address: string | null }>(
    `SELECT id, name, address FROM sites WHERE organisation_id = $1 AND active ORDER BY name`, { bind: [organisationId], type: QueryTypes.SELECT });
  const bins = await sequelize.query<{ site_id: number | null; grai: string; serial: string; status: Status; filled: boolean; product: string | null; start_day: string }>(
    `SELECT a.site_id, a.grai, a.serial, a.status, a.filled, t.fill_product AS product,
            to_char((COALESCE(t.delivered_at, t.dispatched_at) AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS start_day
       FROM assets a JOIN trips t ON t.id = a.current_trip_id
      WHERE a.customer_id = $1 AND a.status IN ('on_hire', 'awaiting_collection', 'in_transit')
      ORDER BY start_day, a.serial`,
    { bind: [organisationId, settings.timeZone], type: QueryTypes.SELECT },
  );
  const freeDays = org?.free_days ?? 0;
  const bySite = new Map<number | null, PortalBin[]>();
  for (const b of bins) {
    // One rule for "overdue back" everywhere (src/lib/fleet/overdue-return.ts).
    const check = overdueBack({ status: b.status, deliveredOn: b.start_day, dispatchedOn: null, freeDays, today });
    const daysOnHire = check.daysWithCustomer ?? Math.max(0, daysBetween(b.start_day, today));
    const days = { daysOnHire, freeDaysLeft: freeDays - daysOnHire, overdue: check.overdue };
    const list = bySite.get(b.site_id) ?? [];
    list.push({ grai: b.grai, serial: b.serial, status: b.status, filled: b.filled, product: b.product, since: b.start_day, ...days });
    bySite.set(b.site_id, list);
  }
  const count = (list: PortalBin[]) => list.reduce<Partial<Record<Status, number>>>((acc, b) => ((acc[b.status] = (acc[b.status] ?? 0) + 1), acc), {});
  const perSite: PortalSite[] = sites.map((s) => ({ ...s, bins: bySite.get(s.id) ?? [], counts: count(bySite.get(s.id) ?? []) }));
  const onTheRoad = [...bySite.entries()].filter(([id]) => id === null || !sites.some((s) => s.id === id)).flatMap(([, l]) => l);
  return {
    organisation: org?.name ?? '',
    freeDays,
    today,
    sites: perSite,
    onTheRoad,
    totals: { onHire: bins.filter((b) => b.status === 'on_hire').length, awaiting: bins.filter((b) => b.status === 'awaiting_collection').length, overdue: [...bySite.values()].flat().filter((b) => b.overdue).length },
  };
}
