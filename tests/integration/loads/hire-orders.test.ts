// One query for a depot's open hire orders (yard home, depot snapshot, the bin page's dispatch form, the load
// page) and one list of depot choices (active only).
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { handBin, handTrip } from '../support/hand-made';
import { HireOrder, Site } from '@/models';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';
import { depotChoices } from '@/lib/fleet/choices.server';
import { ordersAt } from '@/lib/yard/action-options.server';
import { loadDepotSnapshot } from '@/lib/yard/depot-snapshot.server';

const w = usePoolWorld();

describe('open hire orders at a depot', () => {
  test('confirmed and loading ones (never drafts), soonest first, with the bins gone out on each; filters by type, day and count', async () => {
    const order = (reference: string, neededBy: string, status: string, depotSiteId = w.depot.id) =>
      HireOrder.create({
        reference,
        customerId: w.customer.id,
        deliverySiteId: w.customerSite.id,
        depotSiteId,
        binTypeId: w.binType.id,
        quantity: 5,
        neededBy,
        product: null,
        notes: null,
        status,
      } as never);
    const loading = await order('HO-B', '2026-12-05', 'loading');
    await order('HO-C', '2026-12-20', 'confirmed');
    await order('HO-F', '2026-12-03', 'draft'); // a draft counts nowhere
    await order('HO-D', '2026-12-01', 'dispatched'); // gone: not open
    await order('HO-E', '2026-12-02', 'confirmed', w.depot2.id); // another depot
    const bin = await handBin(w.planner, { serial: '901', binTypeId: w.binType.id, siteId: w.depot.id, registeredAt: '2026-11-01T08:00:00Z' });
    const tripId = await handTrip({ assetId: bin.id, customerId: w.customer.id, depotSiteId: w.depot.id, dispatchedAt: '2026-11-30T08:00:00Z' });
    await HireOrder.sequelize!.query('UPDATE trips SET hire_order_id = $1 WHERE id = $2', { bind: [loading.id, tripId] });

    const all = await openOrdersAt(w.depot.id);
    expect(all.map((o) => [o.reference, o.loaded])).toEqual([
      ['HO-B', 1],
      ['HO-TEST-1', 0],
      ['HO-C', 0],
    ]); // HO-TEST-1 needed 10 Dec
    expect(all[0]).toMatchObject({
      customer: 'Test Customer',
      neededBy: '2026-12-05',
      quantity: 5,
      binType: 'Test bin 1000 L',
      deliverySite: 'Customer site',
      binTypeId: w.binType.id,
    });
    expect((await openOrdersAt(w.depot.id, { neededBy: '2026-12-10' })).map((o) => o.reference)).toEqual(['HO-B', 'HO-TEST-1']);
    expect((await openOrdersAt(w.depot.id, { limit: 1 })).map((o) => o.reference)).toEqual(['HO-B']);
    expect(await openOrdersAt(w.depot.id, { binTypeId: w.binType.id + 999 })).toEqual([]);

    // the bin page's form and the phone's snapshot read the same list
    expect((await ordersAt(w.depot.id, w.binType.id)).map((o) => o.reference)).toEqual(['HO-B', 'HO-TEST-1', 'HO-C']);
    const snapshot = await loadDepotSnapshot(w.depot.id);
    expect(snapshot!.orders.map((o) => o.reference)).toEqual(['HO-B', 'HO-TEST-1', 'HO-C']);
    expect(Object.keys(snapshot!.orders[0]!).sort()).toEqual(['binTypeId', 'customer', 'id', 'loaded', 'neededBy', 'quantity', 'reference']);
  });

  test('depot choices: active depots only, by name', async () => {
    await Site.create({
      organisationId: w.operator.id,
      code: 'DEP-OLD',
      name: 'Closed depot',
      kind: 'depot',
      address: null,
      latitude: null,
      longitude: null,
      active: false,
    } as never);
    expect((await depotChoices()).map((d) => d.name)).toEqual(['Second depot', 'Test depot']);
  });
});
