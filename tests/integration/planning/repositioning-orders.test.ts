// From plan to work: an approved repositioning plan creates repositioning orders (depot → depot) and collection
// runs (customer site → depot); transfer load scans close the orders and receive scans the runs.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan } from '@/lib/scans/scan-service.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { addBinToLoad, startLoad } from '@/lib/loads/load-service.server';
import { approveRepositioning, approvedPlans, withdrawPlan } from '@/lib/planning/repositioning-orders.server';
import { commandRun, runView, updateRun } from '@/lib/planning/truck-runs.server';
import { parsePlanSettings } from '@/lib/planning/repositioning-settings';
import { stopPlanSolver } from '@/lib/planning/plan-solver.server';
import { addDays, localDate } from '@/lib/calendar';
import { HireOrder } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

const w = usePoolWorld();
const actor = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
const sel = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
const settings = () => {
  const p = parsePlanSettings(new URLSearchParams('horizonDays=7'));
  if (!p.ok) throw new Error('settings');
  return p.settings;
};
afterAll(stopPlanSolver);

const spare: Array<{ id: number }> = [];
const waiting: Array<{ id: number }> = [];

beforeAll(async () => {
  // The world's big order at the first depot goes; the second depot needs 3 bins tomorrow and holds none; the first
  // depot holds 5 it does not need; two folded empties wait at the customer's site (nearer the first depot).
  await HireOrder.update({ status: 'cancelled' }, { where: { id: w.order.id } });
  await HireOrder.create({
    reference: 'HO-SECOND-1',
    customerId: w.customer.id,
    deliverySiteId: w.customerSite.id,
    depotSiteId: w.depot2.id,
    binTypeId: w.binType.id,
    quantity: 3,
    neededBy: addDays(localDate(new Date(), 'Europe/Amsterdam'), 1),
    status: 'confirmed',
    product: null,
    notes: null,
  });
  for (let i = 0; i < 5; i++) spare.push(await newBin(w));
  for (let i = 0; i < 2; i++) {
    const bin = await newBin(w);
    // Out on a transfer-free route: received at the customer's site as folded empties awaiting collection.
    await HireOrder.update({ status: 'confirmed' }, { where: { id: w.order.id } });
    for (const s of [
      { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
      { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
      { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
      { action: 'deliver', siteId: w.customerSite.id },
      { action: 'fold', siteId: w.customerSite.id },
    ] as const) {
      await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, ...s });
    }
    await HireOrder.update({ status: 'cancelled' }, { where: { id: w.order.id } });
    waiting.push(bin);
  }
}, 120_000);

describe('approving the repositioning plan', () => {
  let planId = 0;
  test('creates a repositioning order for the depot lane and a truck run for the collection lane', async () => {
    const approved = await approveRepositioning(settings(), actor());
    planId = approved.planId;
    const orders = await sel<{ from_site_id: number; to_site_id: number; bin_type_id: number; quantity: number; status: string }>(
      'SELECT from_site_id, to_site_id, bin_type_id, quantity, status FROM repositioning_orders WHERE plan_id = $1',
      [planId],
    );
    expect(orders).toEqual([{ from_site_id: w.depot.id, to_site_id: w.depot2.id, bin_type_id: w.binType.id, quantity: 3, status: 'open' }]);
    expect(approved.runs).toHaveLength(1);
    const run = (await runView(approved.runs[0]!))!;
    expect(run.status).toBe('planned');
    expect(run.stops.map((s) => [s.siteId, s.expected])).toEqual([[w.customerSite.id, 2]]);
    const [plan] = await approvedPlans(1);
    expect(plan).toMatchObject({ id: planId, done: 0, total: 2, open: true });
    // One approved plan at a time: a second approval is refused before anything is solved or written.
    const twice = await appErrorOf(approveRepositioning(settings(), actor()));
    expect(twice.code).toBe('conflict');
    expect((await sel<{ n: number }>('SELECT count(*)::int AS n FROM repositioning_plans'))[0]!.n).toBe(1);
  }, 120_000);

  test('transfer load scans close the order; a voided one opens it again', async () => {
    const yardUser = { ...w.yard, id: w.yard.id! };
    const load = await startLoad(yardUser, { purpose: 'transfer', destinationSiteId: w.depot2.id, targetCount: 3 });
    const outs = [];
    for (const bin of spare.slice(0, 3)) outs.push(await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: bin.id }));
    let [plan] = await approvedPlans(1);
    expect(plan!.orders[0]).toMatchObject({ sent: 3, quantity: 3, status: 'done' });
    const [event] = await sel<{ payload: Record<string, unknown> }>(`SELECT payload FROM scan_events WHERE id = $1`, [outs[2]!.eventId]);
    expect(event!.payload).toMatchObject({ purpose: 'transfer', loadId: load.id, repositioningOrderId: plan!.orders[0]!.id });

    const me: SessionUser = {
      id: w.planner.id!,
      email: 'p@test.example',
      name: 'Planner',
      role: 'planner',
      organisationId: w.operator.id,
      organisationName: '',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    await voidScan(me, outs[2]!.eventId, 'Wrong bin on the truck', '127.0.0.1');
    [plan] = await approvedPlans(1);
    expect(plan!.orders[0]).toMatchObject({ sent: 2, status: 'open' });
    await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: spare[3]!.id });
    [plan] = await approvedPlans(1);
    expect(plan!.orders[0]).toMatchObject({ sent: 3, status: 'done' });
  });

  test('the collection run is confirmed and received against; the plan is then all done', async () => {
    const [plan] = await approvedPlans(1);
    const runId = plan!.runs[0]!.id;
    let v = (await runView(runId))!;
    await updateRun(runId, { version: v.version, carrier: 'Plan Haulage' }, actor());
    v = (await runView(runId))!;
    await commandRun(runId, 'confirm', v.version, actor());
    const wrongDepot = await appErrorOf(recordScan(w.yard, { clientEventId: randomUUID(), assetId: waiting[0]!.id, action: 'receive', siteId: w.depot2.id, runId }));
    expect(wrongDepot.code).toBe('transition_refused');
    for (const bin of waiting) await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'receive', siteId: v.depot.id, runId });
    const [after] = await approvedPlans(1);
    expect(after!.runs[0]).toMatchObject({ status: 'done', received: 2, expected: 2 });
    expect(after).toMatchObject({ done: 2, total: 2 });
    expect(after!.open).toBe(false);
    const audit = await sel<{ action: string }>(`SELECT action FROM audit_entries WHERE entity_type = 'repositioning_plan' AND entity_id = $1`, [String(planId)]);
    expect(audit.map((a) => a.action)).toEqual(['repositioning_plan.approve']);
  });

  test('a plan is withdrawn: its open orders and untouched runs are cancelled, and another may be approved', async () => {
    // Three more spare bins would move again if the shortage came back: a new order at the second depot.
    await HireOrder.create({
      reference: 'HO-SECOND-2',
      customerId: w.customer.id,
      deliverySiteId: w.customerSite.id,
      depotSiteId: w.depot2.id,
      binTypeId: w.binType.id,
      quantity: 5,
      neededBy: addDays(localDate(new Date(), 'Europe/Amsterdam'), 1),
      status: 'confirmed',
      product: null,
      notes: null,
    });
    const second = await approveRepositioning(settings(), actor());
    expect(second.orders.length).toBeGreaterThan(0);
    expect(await withdrawPlan(second.planId, actor())).toMatchObject({ orders: second.orders.length, runs: second.runs.length });
    const [plan] = await approvedPlans(1);
    expect(plan).toMatchObject({ id: second.planId, open: false });
    expect(plan!.orders.every((o) => o.status === 'cancelled')).toBe(true);
  }, 120_000);
});
