// One trip for the trip page: the list row's figures, the places and papers around it, and its events
// shaped for the bin timeline (src/components/bin/EventTimeline.astro).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { tripRowById, type TripListRow } from './trip-list.server';
import { timelineEvents, type BinEvent } from '@/lib/scans/event-timeline.server';
import { localDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';

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
  filled_at: Date | null;
  discharged_at: Date | null;
  order_ref: string | null;
  load_ref: string | null;
  discharge_site: string | null;
  closing_site: string | null;
  supplier: string | null;
  expiry_date: string | null;
  lot_status: string | null;
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
  const events = await timelineEvents('e.trip_id = $1', [id], 1000);
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
    events,
    timeZone: settings.timeZone,
    today: localDate(new Date(), settings.timeZone),
    gs1PrefixLength: settings.gs1PrefixLength,
  };
}
