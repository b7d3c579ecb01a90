// One trip for the trip page: the list row's figures, the places and papers around it, and its events
// shaped for the bin timeline (src/components/bin/EventTimeline.astro).
import { QueryTypes } from 'sequelize';
import { sequelize } from './db';
import { getSettings } from './settings';
import { tripRowById, type TripListRow } from './trip-list';
import type { BinEvent } from './bin-view';
import type { Action, Status } from '../lifecycle';
import { localDate } from '../calendar';
import type { LocalDate } from '../calendar';

export interface TripView {
  trip: TripListRow & {
    filledAt: string | null;
    dischargedAt: string | null;
    hireOrderRef: string | null;
    loadReference: string | null;
    dischargeSiteName: string | null;
    closingSiteName: string | null;
    linerLot: { supplier: string; expiryDate: LocalDate; status: string } | null;
  };
  events: BinEvent[];
  timeZone: string;
  today: LocalDate;
  gs1PrefixLength: number;
}

interface DetailRow {
  filled_at: Date | null; discharged_at: Date | null; order_ref: string | null; load_ref: string | null; discharge_site: string | null;
  closing_site: string | null; supplier: string | null; expiry_date: string | null; lot_status: string | null;
}

interface EventRow {
  id: number; action: Action; occurred_at: Date; status_from: Status | null; status_to: Status; inferred: boolean; flagged: boolean;
  voided_at: Date | null; void_reason: string | null; payload: Record<string, unknown> | null; trip_id: number | null;
  site_name: string | null; user_name: string | null;
}

const iso = (v: Date | string | null) => (v === null ? null : new Date(v).toISOString());

export async function loadTripView(id: number): Promise<TripView | null> {
  const row = await tripRowById(id);
  if (!row) return null;
  const settings = await getSettings();
  const [detail] = await sequelize.query<DetailRow>(
    `SELECT t.filled_at, t.discharged_at, ho.reference AS order_ref, ld.reference AS load_ref, dsc.name AS discharge_site,
            cls.name AS closing_site, l.supplier, l.expiry_date, l.status AS lot_status
       FROM trips t
       LEFT JOIN hire_orders ho ON ho.id = t.hire_order_id
       LEFT JOIN loads ld ON ld.id = t.load_id
       LEFT JOIN sites dsc ON dsc.id = t.discharge_site_id
       LEFT JOIN sites cls ON cls.id = t.closing_site_id
       LEFT JOIN liner_lots l ON l.id = t.liner_lot_id
      WHERE t.id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  const events = await sequelize.query<EventRow>(
    `SELECT e.id, e.action, e.occurred_at, e.status_from, e.status_to, e.inferred, e.flagged, e.voided_at, e.void_reason, e.payload,
            e.trip_id, s.name AS site_name, u.name AS user_name
       FROM scan_events e
       LEFT JOIN sites s ON s.id = e.site_id
       LEFT JOIN users u ON u.id = e.user_id
      WHERE e.trip_id = $1
      ORDER BY e.occurred_at DESC, e.id DESC`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  return {
    trip: {
      ...row,
      filledAt: iso(detail?.filled_at ?? null),
      dischargedAt: iso(detail?.discharged_at ?? null),
      hireOrderRef: detail?.order_ref ?? null,
      loadReference: detail?.load_ref ?? null,
      dischargeSiteName: detail?.discharge_site ?? null,
      closingSiteName: detail?.closing_site ?? null,
      linerLot: detail?.supplier ? { supplier: detail.supplier, expiryDate: detail.expiry_date!, status: detail.lot_status! } : null,
    },
    events: events.map((e) => ({
      id: e.id, action: e.action, occurredAt: iso(e.occurred_at)!, siteName: e.site_name, userName: e.user_name, statusFrom: e.status_from,
      statusTo: e.status_to, inferred: e.inferred, flagged: e.flagged, voided: e.voided_at ? { at: iso(e.voided_at)!, reason: e.void_reason ?? '' } : null,
      payload: e.payload ?? {}, tripId: e.trip_id,
    })),
    timeZone: settings.timeZone,
    today: localDate(new Date(), settings.timeZone),
    gs1PrefixLength: settings.gs1PrefixLength,
  };
}
