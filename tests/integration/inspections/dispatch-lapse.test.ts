// Dispatch on a hire order through the API (ADR/RID 4.1.2.2: no filling after the periodic test has lapsed):
// a bin whose test runs out before the order's wanted date is refused and no one may override it; one whose
// test would run out while it is likely still out (the customer's usual days on hire, 90th percentile) is
// refused unless a planner overrides with a reason, which the log keeps. Dates are relative to today
// (the route reads the clock), worked out with date-fns, which the code does not use.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { addDays, format } from 'date-fns';
import { usePoolWorld, newBin } from '../support/fixtures';
import { sequelize } from '../support/db';
import { setAsset, handTrip } from '../support/hand-made';
import { callRoute, json, sessionUser } from '../support/route';
import { recordScan } from '@/lib/scans/scan-service.server';
import { localDate } from '@/lib/calendar';
import { HireOrder } from '@/models';
import { POST } from '@/pages/api/scan-events/index';

const w = usePoolWorld();
const today = localDate(new Date(), 'Europe/Amsterdam');
const day = (n: number) => format(addDays(new Date(`${today}T12:00:00`), n), 'yyyy-MM-dd');

async function preparedBin(dueInDays: number) {
  const bin = await newBin(w, { manufactureMonth: '2025-01', registeredAt: new Date(Date.now() - 86_400_000).toISOString() });
  await setAsset(bin.id, { next_intermediate_due: day(dueInDays), next_full_due: day(dueInDays + 400), next_due: day(dueInDays) });
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
  return bin;
}

const dispatch = (as: 'yard' | 'planner', assetId: number, extra: Record<string, unknown> = {}) =>
  callRoute(POST, {
    user: sessionUser(as === 'yard' ? w.yard : w.planner),
    path: '/api/scan-events',
    method: 'POST',
    body: { clientEventId: randomUUID(), assetId, action: 'dispatch', purpose: 'hire', hireOrderId: w.order.id, siteId: w.depot.id, ...extra },
  });

describe('dispatch refused for a bin whose test runs out (through the API)', () => {
  test('setup: the order is wanted in 7 days; the customer keeps bins 30 days (10 returned trips)', async () => {
    await HireOrder.update({ neededBy: day(7) }, { where: { id: w.order.id } });
    for (let i = 0; i < 10; i++) {
      const b = await newBin(w);
      const out = new Date(Date.UTC(2026, i % 8, 1, 10));
      await handTrip({
        assetId: b.id,
        customerId: w.customer.id,
        depotSiteId: w.depot.id,
        dispatchedAt: out.toISOString(),
        returnedAt: new Date(out.getTime() + 30 * 86_400_000).toISOString(),
      });
    }
  });

  test('already lapsed: refused by the rule table', async () => {
    // Prepared first, then the test date passes.
    const b2 = await preparedBin(60);
    await setAsset(b2.id, { next_intermediate_due: day(-1), next_due: day(-1) });
    const res = await dispatch('yard', b2.id);
    expect(res.status).toBe(422);
    expect((await json(res)).error).toMatchObject({ code: 'transition_refused', details: { reason: 'inspection_lapsed' } });
  });

  test('lapses before the wanted fill date: refused, and not even a planner may override it', async () => {
    const bin = await preparedBin(3); // due in 3 days, wanted in 7
    const res = await dispatch('yard', bin.id);
    const body = await json(res);
    expect(res.status).toBe(422);
    expect(body.error).toMatchObject({ code: 'transition_refused', details: { reason: 'lapses_before_fill', overridable: false, lastDay: day(3) } });
    expect(body.error!.message).toContain(`runs out on ${day(3)}, before the order's wanted date ${day(7)}`);
    const forced = await dispatch('planner', bin.id, { overrideReason: 'Customer insists, it will be fine' });
    expect(forced.status).toBe(422);
    const [{ n }] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM scan_events WHERE asset_id = $1 AND action = 'dispatch'`, {
      bind: [bin.id],
      type: QueryTypes.SELECT,
    });
    expect(n).toBe(0);
  });

  test('about to lapse while out: refused; a yard hand cannot override; a planner can, with a reason that is recorded', async () => {
    // Wanted in 7 days + 30 usual days = back in 37 days; due in 20 days.
    const bin = await preparedBin(20);
    const res = await dispatch('yard', bin.id);
    expect(res.status).toBe(422);
    expect((await json(res)).error).toMatchObject({ details: { reason: 'lapses_while_out', overridable: true, lastDay: day(20), expectedBackOn: day(37) } });
    const yard = await dispatch('yard', bin.id, { overrideReason: 'Back in a week, agreed' });
    expect((await json(yard)).error!.message).toMatch(/Only a planner may override/);
    const short = await dispatch('planner', bin.id, { overrideReason: 'ok' });
    expect(short.status).toBe(400);
    const ok = await dispatch('planner', bin.id, { overrideReason: 'Customer returns it within 10 days, agreed by phone' });
    expect(ok.status).toBe(201);
    const [ev] = await sequelize.query<{ flagged: boolean; payload: { override?: Record<string, unknown>; flags?: string[] } }>(
      `SELECT flagged, payload FROM scan_events WHERE asset_id = $1 AND action = 'dispatch'`,
      { bind: [bin.id], type: QueryTypes.SELECT },
    );
    expect(ev!.flagged).toBe(true);
    expect(ev!.payload.flags).toContain('lapse_margin_overridden');
    expect(ev!.payload.override).toMatchObject({
      code: 'lapses_while_out',
      lastDay: day(20),
      expectedBackOn: day(37),
      reason: 'Customer returns it within 10 days, agreed by phone',
      by: w.planner.id,
    });
  });

  test('in date for the whole usual hire: dispatched', async () => {
    const bin = await preparedBin(60);
    const res = await dispatch('yard', bin.id);
    expect(res.status).toBe(201);
  });
});
