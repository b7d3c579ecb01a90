// The scan-log entries a timeline shows (bin page, trip page), newest first,
// with the site and the person named.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import type { Action, Status } from './lifecycle';

export interface BinEvent {
  id: number;
  action: Action;
  occurredAt: string;
  siteName: string | null;
  userName: string | null;
  statusFrom: Status | null;
  statusTo: Status;
  inferred: boolean;
  flagged: boolean;
  voided: { at: string; reason: string } | null;
  payload: Record<string, unknown>;
  tripId: number | null;
}

interface EventRow {
  id: number;
  action: Action;
  occurred_at: Date;
  status_from: Status | null;
  status_to: Status;
  inferred: boolean;
  flagged: boolean;
  voided_at: Date | null;
  void_reason: string | null;
  payload: Record<string, unknown> | null;
  trip_id: number | null;
  site_name: string | null;
  user_name: string | null;
}

/** `filter` is a fixed SQL condition on `e` written by the caller, with its values in `bind` — never user text. */
export async function timelineEvents(filter: string, bind: unknown[], limit = 300): Promise<BinEvent[]> {
  const rows = await sequelize.query<EventRow>(
    `SELECT e.id, e.action, e.occurred_at, e.status_from, e.status_to, e.inferred, e.flagged, e.voided_at, e.void_reason, e.payload,
            e.trip_id, s.name AS site_name, u.name AS user_name
       FROM scan_events e
       LEFT JOIN sites s ON s.id = e.site_id
       LEFT JOIN users u ON u.id = e.user_id
      WHERE ${filter}
      ORDER BY e.occurred_at DESC, e.id DESC
      LIMIT ${Number(limit)}`,
    { bind, type: QueryTypes.SELECT },
  );
  return rows.map((e) => ({
    id: e.id,
    action: e.action,
    occurredAt: new Date(e.occurred_at).toISOString(),
    siteName: e.site_name,
    userName: e.user_name,
    statusFrom: e.status_from,
    statusTo: e.status_to,
    inferred: e.inferred,
    flagged: e.flagged,
    voided: e.voided_at ? { at: new Date(e.voided_at).toISOString(), reason: e.void_reason ?? '' } : null,
    payload: e.payload ?? {},
    tripId: e.trip_id,
  }));
}
