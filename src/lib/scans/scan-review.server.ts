// Scans that need a planner's look: those that implied missed steps (inferred
// and flagged) and those whose seal numbers did not match. The planner either
// confirms them ("looks right") or opens the bin and voids the wrong scan.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { Action } from './lifecycle';
import { recordAudit } from '@/lib/audit.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { voidScan } from './scan-corrections.server';
import { ageWindow, bulkSummary, FLAGS_PER_PAGE, type BulkOutcome, type BulkReview, type FlagFilter } from './flag-review';

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

/** The queue's WHERE for a filter (the same for the rows, the total and the counts per kind). */
function queueWhere(filter: Partial<FlagFilter>, now: Date, bind: unknown[], withKind = true): string {
  const where = ['e.flagged', 'NOT e.inferred', 'e.voided_at IS NULL', 'e.reviewed_at IS NULL'];
  if (filter.depotId) where.push(`e.site_id = $${bind.push(filter.depotId)}`);
  if (withKind && filter.kind) where.push(`e.payload->'flags' ? $${bind.push(filter.kind)}`);
  if (filter.age) {
    const w = ageWindow(filter.age, now);
    where.push(`e.occurred_at <= $${bind.push(w.before)}`);
    if (w.notBefore) where.push(`e.occurred_at > $${bind.push(w.notBefore)}`);
  }
  return where.join(' AND ');
}

/** One page of the queue, newest first, with the total for the filter. */
export async function listFlaggedScans(filter: Partial<FlagFilter> = {}, now = new Date()): Promise<{ rows: FlaggedScan[]; total: number }> {
  const bind: unknown[] = [];
  const where = queueWhere(filter, now, bind);
  const page = filter.page ?? 1;
  const rows = await sequelize.query<FlaggedScan & { total: number }>(
    `SELECT e.id, a.grai, a.serial, e.action, e.occurred_at AS "occurredAt", s.name AS site, u.name AS "user",
            COALESCE(ARRAY(SELECT jsonb_array_elements_text(e.payload->'inferred')), '{}') AS inferred,
            COALESCE(ARRAY(SELECT jsonb_array_elements_text(e.payload->'flags')), '{}') AS flags,
            count(*) OVER ()::int AS total
       FROM scan_events e JOIN assets a ON a.id = e.asset_id
       LEFT JOIN sites s ON s.id = e.site_id LEFT JOIN users u ON u.id = e.user_id
      WHERE ${where}
      ORDER BY e.occurred_at DESC, e.id DESC LIMIT ${FLAGS_PER_PAGE} OFFSET ${(page - 1) * FLAGS_PER_PAGE}`,
    { bind, type: QueryTypes.SELECT },
  );
  return {
    rows: rows.map(({ total: _t, ...r }) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
    total: rows[0]?.total ?? 0,
  };
}

/** Scans waiting per kind of flag under the filter's depot and age (a scan with two flags counts under both). */
export async function flagCountsByKind(filter: Partial<FlagFilter> = {}, now = new Date()): Promise<Record<string, number>> {
  const bind: unknown[] = [];
  const where = queueWhere(filter, now, bind, false);
  const rows = await sequelize.query<{ kind: string; n: number }>(
    `SELECT f.kind, count(*)::int AS n FROM scan_events e CROSS JOIN LATERAL jsonb_array_elements_text(COALESCE(e.payload->'flags', '[]'::jsonb)) AS f(kind)
      WHERE ${where} GROUP BY f.kind`,
    { bind, type: QueryTypes.SELECT },
  );
  return Object.fromEntries(rows.map((r) => [r.kind, r.n]));
}

/** The depots a flagged scan can be filtered by. */
export async function reviewDepots(): Promise<Array<{ id: number; name: string }>> {
  return sequelize.query(`SELECT id, name FROM sites WHERE kind = 'depot' AND active ORDER BY name`, { type: QueryTypes.SELECT });
}

/**
 * Confirms or voids the scans ticked on the page, one at a time and each on its own record (an audit entry per
 * scan; a void rebuilds its bin's state like a void on the bin page). A scan that left the queue meanwhile, or
 * whose void is refused, is reported with the reason and the others still go through.
 */
export async function reviewFlaggedScans(user: SessionUser, input: BulkReview, ip: string | null): Promise<{ outcomes: BulkOutcome[]; summary: string }> {
  const outcomes: BulkOutcome[] = [];
  for (const id of input.ids) {
    try {
      if (input.decision === 'confirm') await markReviewed(user, id, ip);
      else {
        const [waiting] = await sequelize.query<{ id: number }>(
          'SELECT id FROM scan_events WHERE id = $1 AND flagged AND NOT inferred AND voided_at IS NULL AND reviewed_at IS NULL',
          { bind: [id], type: QueryTypes.SELECT },
        );
        if (!waiting) throw new AppError('conflict', 'This scan is not waiting for review (already reviewed or voided).');
        await voidScan(user, id, input.reason!, ip);
      }
      outcomes.push({ id, ok: true });
    } catch (e) {
      if (!(e instanceof AppError)) throw e;
      outcomes.push({ id, ok: false, message: e.message });
    }
  }
  return { outcomes, summary: bulkSummary(input.decision, outcomes) };
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
