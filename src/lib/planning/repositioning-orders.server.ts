/**
 * From plan to work. Approving the repositioning plan stores it and turns its lanes into work: a lane from a depot
 * becomes one repositioning order per bin type (depot → depot, so many bins), a lane from a customer site becomes
 * truck runs (one per truck of the lane, back to the lane's depot). The plan is solved again on the server when it
 * is approved, so what is approved is what the page showed for those settings, never lanes a client made up.
 *
 * Orders are carried out by transfer loads (./repositioning-execution.server.ts).
 */
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { nextReference } from '@/lib/reference-numbers.server';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { localDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { repositioningView } from './repositioning.server';
import type { PlanSettings } from './repositioning-settings';
import { commandRun, createRun } from './truck-runs.server';
import type { RunStatus } from './run-status';
import { SENT_SQL } from './repositioning-execution.server';

const q = <T extends object>(sql: string, bind: unknown[] = [], t?: Transaction) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });

/** A plan with work still open: an order not done or cancelled, or a run still planned or confirmed. */
const OPEN_WORK_SQL = `(EXISTS (SELECT 1 FROM repositioning_orders ro WHERE ro.plan_id = p.id AND ro.status = 'open')
  OR EXISTS (SELECT 1 FROM truck_runs r WHERE r.repositioning_plan_id = p.id AND r.status IN ('planned', 'confirmed')))`;

export interface ApprovedPlan {
  planId: number;
  orders: number[];
  runs: number[];
}

/** Solves the plan for these settings again and turns every lane into work, in one transaction. */
export async function approveRepositioning(settings: PlanSettings, actor: AuditActor, now = new Date()): Promise<ApprovedPlan> {
  // One approved plan at a time: a second one would send the same bins twice.
  const [open] = await q<{ id: number }>(`SELECT p.id FROM repositioning_plans p WHERE ${OPEN_WORK_SQL} ORDER BY p.id DESC LIMIT 1`);
  if (open) {
    throw new AppError('conflict', 'An approved plan still has work open. Let it finish, or withdraw it, before approving another.', { planId: open.id });
  }
  const view = await repositioningView(settings, now);
  const { plan } = view.result;
  if (plan.lanes.length === 0) throw new AppError('unprocessable', 'The plan has no lanes: nothing needs to move, so there is nothing to approve.');
  const { timeZone } = await getSettings();
  const today = localDate(now, timeZone);
  return sequelize.transaction(async (t) => {
    const [{ id: planId }] = (await q<{ id: number }>(
      `INSERT INTO repositioning_plans (horizon_days, cost_per_km, road_factor, total_trucks, total_cost, approved_by) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`,
      [settings.horizonDays, settings.costPerKm, settings.roadFactor, plan.totalTrucks, plan.totalCost.toFixed(2), actor.userId],
      t,
    )) as [{ id: number }];
    const orders: number[] = [];
    const runs: number[] = [];
    for (const lane of plan.lanes) {
      if (lane.fromKind === 'depot') {
        for (const [k, bins] of lane.bins.entries()) {
          if (bins <= 0) continue;
          const reference = await nextReference('repositioning_orders', 'RP-', 5, t);
          const [{ id }] = (await q<{ id: number }>(
            `INSERT INTO repositioning_orders (reference, plan_id, from_site_id, to_site_id, bin_type_id, quantity, trucks) VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
            [reference, planId, Number(lane.fromKey), Number(lane.toKey), Number(view.types[k]!.key), bins, Math.max(1, lane.trucks)],
            t,
          )) as [{ id: number }];
          orders.push(id);
        }
      } else {
        // A collection lane: one run per truck, the lane's bins shared out between them.
        const total = lane.bins.reduce((a, b) => a + b, 0);
        const trucks = Math.max(1, lane.trucks);
        for (let i = 0; i < trucks; i++) {
          const expected = Math.floor(total / trucks) + (i < total % trucks ? 1 : 0);
          if (expected <= 0) continue;
          const run = await createRun({ depotId: Number(lane.toKey), plannedOn: today, stops: [{ siteId: Number(lane.fromKey), expectedBins: Math.min(500, expected) }] }, actor, {
            transaction: t,
            planId,
          });
          runs.push(run.id);
        }
      }
    }
    await recordAudit(
      { actor, action: 'repositioning_plan.approve', entityType: 'repositioning_plan', entityId: planId, after: { settings, trucks: plan.totalTrucks, orders, runs } },
      { transaction: t },
    );
    return { planId, orders, runs };
  });
}

/**
 * Withdraws what is left of an approved plan: its open orders are cancelled, and its runs that nothing was received
 * against yet (a run with bins in is closed on its page instead). Audited as `repositioning_plan.withdraw`.
 */
export async function withdrawPlan(planId: number, actor: AuditActor): Promise<{ orders: number; runs: number }> {
  const [plan] = await q<{ id: number }>('SELECT id FROM repositioning_plans WHERE id = $1', [planId]);
  if (!plan) throw new AppError('not_found', 'There is no such approved plan.');
  const cancelled = await sequelize.transaction(async (t) => {
    const rows = await q<{ id: number }>(
      `UPDATE repositioning_orders SET status = 'cancelled', version = version + 1, updated_at = now() WHERE plan_id = $1 AND status = 'open' RETURNING id`,
      [planId],
      t,
    );
    await recordAudit(
      { actor, action: 'repositioning_plan.withdraw', entityType: 'repositioning_plan', entityId: planId, after: { ordersCancelled: rows.length } },
      { transaction: t },
    );
    return rows.length;
  });
  const runs = await q<{ id: number; version: number }>(
    `SELECT r.id, r.version FROM truck_runs r WHERE r.repositioning_plan_id = $1 AND r.status IN ('planned', 'confirmed')
        AND NOT EXISTS (SELECT 1 FROM scan_events e WHERE e.action = 'receive' AND e.payload ? 'runId' AND (e.payload->>'runId')::int = r.id AND e.voided_at IS NULL)`,
    [planId],
  );
  for (const r of runs) await commandRun(r.id, 'cancel', r.version, actor);
  return { orders: cancelled, runs: runs.length };
}

export interface PlanProgress {
  id: number;
  approvedAt: string;
  horizonDays: number;
  totalTrucks: number;
  totalCost: number;
  orders: Array<{ id: number; reference: string; from: string; to: string; binType: string; quantity: number; sent: number; status: 'open' | 'done' | 'cancelled' }>;
  runs: Array<{ id: number; reference: string; site: string; depot: string; status: RunStatus; expected: number; received: number }>;
  done: number;
  total: number;
  /** Work is still open: the plan may be withdrawn, and no other plan approved. */
  open: boolean;
}

/** The latest approved plans with how far their orders and runs have got. */
export async function approvedPlans(limit = 5): Promise<PlanProgress[]> {
  const plans = await q<{ id: number; approvedAt: Date; horizonDays: number; totalTrucks: number; totalCost: string }>(
    `SELECT id, approved_at AS "approvedAt", horizon_days AS "horizonDays", total_trucks AS "totalTrucks", total_cost AS "totalCost" FROM repositioning_plans ORDER BY id DESC LIMIT $1`,
    [limit],
  );
  return Promise.all(
    plans.map(async (p) => {
      const orders = await q<PlanProgress['orders'][number]>(
        `SELECT ro.id, ro.reference, f.name AS "from", d.name AS "to", bt.name AS "binType", ro.quantity, ${SENT_SQL} AS sent, ro.status
           FROM repositioning_orders ro JOIN sites f ON f.id = ro.from_site_id JOIN sites d ON d.id = ro.to_site_id JOIN bin_types bt ON bt.id = ro.bin_type_id
          WHERE ro.plan_id = $1 ORDER BY ro.id`,
        [p.id],
      );
      const runs = await q<PlanProgress['runs'][number]>(
        `SELECT r.id, r.reference, s.name AS site, d.name AS depot, r.status, st.expected_bins AS expected,
                (SELECT count(*)::int FROM scan_events e WHERE e.action = 'receive' AND e.payload ? 'runId' AND (e.payload->>'runId')::int = r.id AND e.voided_at IS NULL AND NOT e.inferred) AS received
           FROM truck_runs r JOIN truck_run_stops st ON st.run_id = r.id AND st.position = 1 JOIN sites s ON s.id = st.site_id JOIN sites d ON d.id = r.depot_site_id
          WHERE r.repositioning_plan_id = $1 ORDER BY r.id`,
        [p.id],
      );
      const done = orders.filter((o) => o.status !== 'open').length + runs.filter((r) => r.status === 'done' || r.status === 'cancelled').length;
      const open = orders.some((o) => o.status === 'open') || runs.some((r) => r.status === 'planned' || r.status === 'confirmed');
      return { ...p, approvedAt: new Date(p.approvedAt).toISOString(), totalCost: Number(p.totalCost), orders, runs, done, total: orders.length + runs.length, open };
    }),
  );
}
