import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { callRoute, json, sessionUser } from '../support/route';
import { makeUser } from '../support/fixtures';
import { tariffOn } from '@/lib/planning/orders.server';
import { Tariff } from '@/models';
import * as route from '@/pages/api/admin/tariffs';

const w = usePoolWorld();
const body = (extra: Record<string, unknown> = {}) => ({
  customerId: w.customer.id,
  freeDays: 14,
  dailyRate: '1.60',
  perTripFee: '24.00',
  lostBinFee: '780.00',
  currency: 'EUR',
  validFrom: '2026-01-01',
  ...extra,
});

describe('entering tariffs (admin)', () => {
  test('a first tariff, then a price change that ends it the day before; overlaps refused; others may not', async () => {
    const admin = sessionUser(await makeUser('admin', w.operator.id));
    const first = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body() });
    expect(first.status).toBe(201);
    expect((await json<{ data: { endedPrevious: unknown } }>(first)).data.endedPrevious).toBeNull();

    const change = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ dailyRate: '1.75', validFrom: '2027-03-01' }) });
    expect(change.status).toBe(201);
    // 1 Mar 2027 − 1 day = 28 Feb 2027 (2027 is not a leap year)
    expect((await json<{ data: { endedPrevious: { validTo: string } } }>(change)).data.endedPrevious.validTo).toBe('2027-02-28');
    expect((await tariffOn(w.customer.id, '2027-02-28'))?.dailyRate).toBe('1.60');
    expect((await tariffOn(w.customer.id, '2027-03-01'))?.dailyRate).toBe('1.75');

    const overlap = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ validFrom: '2026-06-01', validTo: '2026-06-30' }) });
    expect(overlap.status).toBe(422);
    expect((await json(overlap)).error?.message).toContain('1 Jan 2026 to 28 Feb 2027');
    const bad = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ dailyRate: '1.605', currency: 'eur' }) });
    expect(bad.status).toBe(400);
    expect(await Tariff.count({ where: { customerId: w.customer.id } })).toBe(2);

    const list = await callRoute(route.GET, { user: admin, path: '/api/admin/tariffs', query: { customer: String(w.customer.id) } });
    expect((await json<{ data: { validFrom: string }[] }>(list)).data.map((t) => t.validFrom)).toEqual(['2027-03-01', '2026-01-01']);
    const planner = await callRoute(route.POST, { user: sessionUser(w.planner), path: '/api/admin/tariffs', method: 'POST', body: body({ validFrom: '2030-01-01' }) });
    expect(planner.status).toBe(403);
    const audit = await Tariff.sequelize!.query(`SELECT action FROM audit_entries WHERE entity_type = 'tariff' ORDER BY id`, { type: 'SELECT' });
    expect(audit.map((a) => (a as { action: string }).action)).toEqual(['tariff.create', 'tariff.end', 'tariff.create']);
  });

  test('the billing terms: liner and stop fees and the day count are kept; left out, the overdue rule’s defaults; bad ones refused', async () => {
    const admin = sessionUser(await makeUser('admin', w.operator.id));
    const terms = { linerFee: '6.50', stopFee: '45.00', firstDayCounts: true, lastDayCounts: false, hireStartsAt: 'dispatch', hireStopsAt: 'depot_receipt' };
    const res = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ validFrom: '2028-01-01', ...terms }) });
    expect(res.status).toBe(201);
    const t = (await tariffOn(w.customer.id, '2028-01-01'))!;
    expect([t.linerFee, t.stopFee, t.firstDayCounts, t.lastDayCounts, t.hireStartsAt, t.hireStopsAt]).toEqual(['6.50', '45.00', true, false, 'dispatch', 'depot_receipt']);
    const before = (await tariffOn(w.customer.id, '2027-06-01'))!; // entered without them above
    expect([before.linerFee, before.stopFee, before.firstDayCounts, before.lastDayCounts, before.hireStartsAt, before.hireStopsAt]).toEqual([
      '0.00',
      '0.00',
      false,
      true,
      'delivery',
      'collection',
    ]);
    for (const bad of [{ hireStopsAt: 'whenever' }, { linerFee: '-1' }, { firstDayCounts: 'yes' }]) {
      const r = await callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ validFrom: '2029-01-01', ...bad }) });
      expect(r.status, JSON.stringify(bad)).toBe(400);
    }
  });

  test('the customer’s own term columns follow the tariff in force: at once for one in force today, by the daily job for a later one', async () => {
    const { Organisation } = await import('@/models');
    const { runJobNow } = await import('@/lib/jobs/registry.server');
    const other = await Organisation.create({ name: 'Terms Customer', kind: 'customer', contactEmail: null, freeDays: 14 });
    const admin = sessionUser(await makeUser('admin', w.operator.id));
    const post = (extra: Record<string, unknown>) =>
      callRoute(route.POST, { user: admin, path: '/api/admin/tariffs', method: 'POST', body: body({ customerId: other.id, ...extra }) });
    expect((await post({ validFrom: '2020-01-01', freeDays: 21, dailyRate: '1.90' })).status).toBe(201);
    await other.reload();
    expect([other.freeDays, other.dailyRate]).toEqual([21, '1.90']);
    expect((await post({ validFrom: '2031-01-01', freeDays: 30, dailyRate: '2.10' })).status).toBe(201);
    await other.reload();
    expect(other.freeDays).toBe(21); // not in force yet
    expect(await runJobNow('tariff-terms', { now: new Date('2031-01-01T00:05:00Z') })).toMatchObject({ changed: 1 });
    await other.reload();
    expect([other.freeDays, other.dailyRate]).toEqual([30, '2.10']);
    expect(await runJobNow('tariff-terms', { now: new Date('2031-01-02T00:05:00Z') })).toMatchObject({ changed: 0 });
  });
});
