// Scans that need a planner's look: those that implied missed steps (inferred
// and flagged) and those whose seal numbers did not match. The planner either
// confirms them ("looks right") or opens the bin and voids the wrong scan.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { Action } from './lifecycle';
import { recordAudit } from '@/lib/audit.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';

export interface FlaggedScan {
  id: number;
  grai: string;
  serial: string;
  action: Action;
  occurredAt: string;
  site: string | null;
  user: string | null;
  inferred: Action[];
  flags: string[];
}

export async function listFlaggedScans(limit = 50, offset = 0): Promise<{ rows: FlaggedScan[]; total: number }> {
  const rows = await sequelize.query<FlaggedScan & { total: number }>(
    `SELECT e.id, a.grai, a.serial, e.action, e.occurred_at AS "occurredAt", s.name AS site, u.name AS "user",
            COALESCE(ARRAY(SELECT jsonb_array_elements_text(e.payload->'inferred')), '{}') AS inferred,
            COALESCE(ARRAY(SELECT jsonb_array_elements_text(e.payload->'flags')), '{}') AS flags,
            count(*) OVER ()::int AS total
       FROM scan_events e JOIN assets a ON a.id = e.asset_id
       LEFT JOIN sites s ON s.id = e.site_id LEFT JOIN users u ON u.id = e.user_id
      WHERE e.flagged AND NOT e.inferred AND e.voided_at IS NULL AND e.reviewed_at IS NULL
      ORDER BY e.occurred_at DESC, e.id DESC LIMIT $1 OFFSET $2`,
    { bind: [limit, offset], type: QueryTypes.SELECT },
  );
  return {
    rows: rows.map(({ total: _t, ...r }) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
    total: rows[0]?.total ?? 0,
  };
}

/** "Looks right": the planner has seen the flagged scan and keeps it. */
export async function markReviewed(user: SessionUser, eventId: number, ip: string | null) {
  return sequelize.transaction(async (transaction) => {
    const [row] = await sequelize.query<{ id: number }>(
      `UPDATE scan_events SET reviewed_at = now(), reviewed_by = $2
        WHERE id = $1 AND flagged AND NOT inferred AND voided_at IS NULL AND reviewed_at IS NULL RETURNING id`,
      { bind: [eventId, user.id], type: QueryTypes.SELECT, transaction },
    );
    if (!row) throw new AppError('conflict', 'This scan is not waiting for review (already reviewed or voided).');
    await recordAudit({ actor: { userId: user.id, ip }, action: 'scan.review', entityType: 'scan_event', entityId: eventId, after: { reviewed: true } }, { transaction });
    return { reviewed: eventId };
  });
}
