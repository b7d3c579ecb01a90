// Everything the bin page shows, read in a few queries and returned as plain
// data (the page renders it; islands get the parts they need as props).
import { reachableBins, siteLimited } from '@/lib/customer-scope.server';
import { serviceLifeEnd } from '@/lib/inspections/service-life';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { allowedActions, type Action, type Leg, type SiteKind, type Status } from '@/lib/scans/lifecycle';
import { daysBetween, localDate } from '@/lib/calendar';
import { testStatus, type TestStatus } from '@/lib/inspections/inspection-due';
import { parseUnMarking } from './un-marking';
import { getSettings } from '@/lib/settings/settings.server';
import { timelineEvents, type BinEvent } from '@/lib/scans/event-timeline.server';

export type { BinEvent };
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { tripTermSql } from '@/lib/fleet/overdue-return';

export interface BinView {
  asset: {
    id: number;
    grai: string;
    serial: string;
    binTypeId: number;
    status: Status;
    version: number;
    manufactureMonth: string;
    unMarking: string | null;
    tripCount: number;
    lastScanAt: string | null;
    siteSince: string | null;
    labelPrintedAt: string | null;
    filled: boolean;
    prepChecked: boolean;
    leg: Leg | null;
    lastInspectionOn: string | null;
    nextIntermediateDue: string | null;
    nextFullDue: string | null;
    nextDue: string | null;
    testStatus: TestStatus | null;
    daysAtSite: number | null;
    /** ADR 4.1.1.15: the inner receptacle's month and the last day of its period of use (null: the rule does not apply). */
    innerMadeMonth: string | null;
    serviceLifeEndsOn: string | null;
  };
  binType: {
    code: string;
    name: string;
    nominalCapacityL: number;
    tareKg: number;
    maxGrossKg: number;
    unCode: string | null;
    policyKind: 'un' | 'own';
    intermediateMonths: number;
    fullMonths: number;
  };
  site: { id: number; code: string; name: string; kind: SiteKind } | null;
  customer: { id: number; name: string; freeDays: number } | null;
  trip: {
    id: number;
    dispatchedAt: string;
    deliveredAt: string | null;
    orderRef: string | null;
    customerSite: string | null;
    fillProduct: string | null;
    sealsApplied: string[];
  } | null;
  linerLot: { id: number; lotNumber: string; supplier: string; expiryDate: string; status: string } | null;
  marking: ReturnType<typeof parseUnMarking> | null;
  events: BinEvent[];
  today: string;
  timeZone: string;
}

/** Null when the bin does not exist or the viewer may not see it (customers see only bins on hire to them). */
export async function loadBinView(grai: string, user: SessionUser): Promise<BinView | null> {
  const settings = await getSettings();
  const today = localDate(new Date(), settings.timeZone);
  const [row] = await sequelize.query<Record<string, unknown>>(
    `SELECT a.*, bt.code AS bt_code, bt.name AS bt_name, bt.nominal_capacity_l, bt.tare_kg, bt.max_gross_kg, bt.un_code, bt.policy_kind,
            bt.intermediate_months, bt.full_months, bt.service_life_applies, bt.service_life_years,
            s.code AS site_code, s.name AS site_name, s.kind AS site_kind,
            o.name AS customer_name, ${tripTermSql('free_days', '$2::text')} AS free_days,
            t.dispatched_at, t.delivered_at, t.fill_product, t.seals_applied, ho.reference AS order_ref, cs.name AS customer_site_name,
            l.lot_number, l.supplier, l.expiry_date, l.status AS lot_status
       FROM assets a
       JOIN bin_types bt ON bt.id = a.bin_type_id
       LEFT JOIN sites s ON s.id = a.site_id
       LEFT JOIN organisations o ON o.id = a.customer_id
       LEFT JOIN trips t ON t.id = a.current_trip_id
       LEFT JOIN hire_orders ho ON ho.id = t.hire_order_id
       LEFT JOIN sites cs ON cs.id = t.customer_site_id
       LEFT JOIN liner_lots l ON l.id = a.liner_lot_id
      WHERE a.grai = $1`,
    { bind: [grai, settings.timeZone], type: QueryTypes.SELECT },
  );
  if (!row) return null;
  const isCustomer = user.role === 'customer';
  if (isCustomer && row.customer_id !== user.organisationId) return null;
  // A customer user limited to some sites sees only the bins at (or for) those sites.
  if (isCustomer && siteLimited(user) && !(await reachableBins(user, [Number(row.id)])).has(Number(row.id))) return null;

  // A customer sees only what happened during their own trips, never other customers' use of the bin.
  const events = isCustomer
    ? await timelineEvents('e.asset_id = $1 AND e.trip_id IN (SELECT id FROM trips WHERE customer_id = $2)', [row.id, user.organisationId])
    : await timelineEvents('e.asset_id = $1', [row.id]);

  const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : v == null ? null : String(v));
  const siteSince = iso(row.site_since);
  return {
    asset: {
      id: row.id as number,
      grai: row.grai as string,
      serial: row.serial as string,
      binTypeId: row.bin_type_id as number,
      status: row.status as Status,
      version: row.version as number,
      manufactureMonth: String(row.manufacture_month).slice(0, 7),
      unMarking: (row.un_marking as string) ?? null,
      tripCount: row.trip_count as number,
      lastScanAt: iso(row.last_scan_at),
      siteSince,
      labelPrintedAt: iso(row.label_printed_at),
      filled: row.filled as boolean,
      prepChecked: row.prep_checked as boolean,
      leg: (row.leg as Leg) ?? null,
      lastInspectionOn: (row.last_inspection_on as string) ?? null,
      nextIntermediateDue: (row.next_intermediate_due as string) ?? null,
      nextFullDue: (row.next_full_due as string) ?? null,
      nextDue: (row.next_due as string) ?? null,
      testStatus: row.next_due ? testStatus(row.next_due as string, today) : null,
      daysAtSite: siteSince ? Math.max(0, daysBetween(localDate(siteSince, settings.timeZone), today)) : null,
      innerMadeMonth: row.inner_made_month ? String(row.inner_made_month).slice(0, 7) : null,
      serviceLifeEndsOn:
        row.service_life_applies && row.inner_made_month
          ? serviceLifeEnd({ applies: true, years: row.service_life_years as number }, String(row.inner_made_month).slice(0, 7))
          : null,
    },
    binType: {
      code: row.bt_code as string,
      name: row.bt_name as string,
      nominalCapacityL: row.nominal_capacity_l as number,
      tareKg: Number(row.tare_kg),
      maxGrossKg: Number(row.max_gross_kg),
      unCode: (row.un_code as string) ?? null,
      policyKind: row.policy_kind as 'un' | 'own',
      intermediateMonths: row.intermediate_months as number,
      fullMonths: row.full_months as number,
    },
    site: row.site_id ? { id: row.site_id as number, code: row.site_code as string, name: row.site_name as string, kind: row.site_kind as SiteKind } : null,
    customer: row.customer_id ? { id: row.customer_id as number, name: row.customer_name as string, freeDays: row.free_days as number } : null,
    trip: row.current_trip_id
      ? {
          id: row.current_trip_id as number,
          dispatchedAt: iso(row.dispatched_at)!,
          deliveredAt: iso(row.delivered_at),
          orderRef: (row.order_ref as string) ?? null,
          customerSite: (row.customer_site_name as string) ?? null,
          fillProduct: (row.fill_product as string) ?? null,
          sealsApplied: (row.seals_applied as string[]) ?? [],
        }
      : null,
    linerLot: row.liner_lot_id
      ? {
          id: row.liner_lot_id as number,
          lotNumber: row.lot_number as string,
          supplier: row.supplier as string,
          expiryDate: row.expiry_date as string,
          status: row.lot_status as string,
        }
      : null,
    marking: row.un_marking ? parseUnMarking(row.un_marking as string) : null,
    events,
    today,
    timeZone: settings.timeZone,
  };
}

/** The actions this user may take on the bin from the given site (the bin page's buttons). */
export function actionsFor(view: BinView, user: SessionUser, site: { id: number; kind: SiteKind } | null): Action[] {
  return allowedActions(
    {
      status: view.asset.status,
      siteId: view.site ? String(view.site.id) : null,
      siteKind: view.site?.kind ?? null,
      leg: view.asset.leg,
      prepChecked: view.asset.prepChecked,
      linerLotId: view.linerLot ? String(view.linerLot.id) : null,
      filled: view.asset.filled,
      tripOpen: view.trip !== null,
      nextDue: view.asset.nextDue,
    },
    { role: user.role, today: view.today, siteId: site ? String(site.id) : null, siteKind: site?.kind ?? null },
  );
}
