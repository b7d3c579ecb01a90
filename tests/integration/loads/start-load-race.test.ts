// Two people starting loads (or saving collection runs) at one depot at the same moment: for one order they get the same load (never two, never
// a refused duplicate number); for two orders they get two loads numbered one after the other.
import { describe, expect, test } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { HireOrder, Load } from '@/models';
import { startLoad } from '@/lib/loads/load-service.server';
import { createRun } from '@/lib/planning/truck-runs.server';

const w = usePoolWorld();

describe('starting loads at once', () => {
  test('one order: both starts answer the same load', async () => {
    const actor = { ...w.yard, id: w.yard.id! };
    const [a, b] = await Promise.all([startLoad(actor, { purpose: 'hire', hireOrderId: w.order.id }), startLoad(actor, { purpose: 'hire', hireOrderId: w.order.id })]);
    expect(a.id).toBe(b.id);
    expect(await Load.count({ where: { hireOrderId: w.order.id } })).toBe(1);
  });

  test('two orders at one depot: two loads, numbers in sequence, none repeated', async () => {
    const second = await HireOrder.create({
      reference: 'HO-RACE-2',
      customerId: w.customer.id,
      deliverySiteId: w.customerSite.id,
      depotSiteId: w.depot.id,
      binTypeId: w.binType.id,
      quantity: 3,
      neededBy: '2026-12-20',
      product: null,
      notes: null,
      status: 'confirmed',
    } as never);
    const actor = { ...w.yard, id: w.yard.id! };
    const loads = await Promise.all([
      startLoad(actor, { purpose: 'hire', hireOrderId: second.id }),
      startLoad(actor, { purpose: 'transfer', destinationSiteId: w.depot2.id }),
      startLoad(actor, { purpose: 'transfer', destinationSiteId: w.depot2.id }),
    ]);
    const references = loads.map((l) => l.reference);
    expect(new Set(references).size).toBe(3);
    const numbers = references.map((r) => Number(r.slice(-3))).sort((x, y) => x - y);
    expect(numbers[2]! - numbers[0]!).toBe(2); // consecutive
  });
});

describe('creating runs at once', () => {
  test('five runs for one depot and day created at the same moment get five different numbers in sequence', async () => {
    const actor = { userId: w.planner.id, ip: '127.0.0.1' };
    const made = await Promise.all(
      Array.from({ length: 5 }, () =>
        createRun({ depotId: w.depot.id, plannedOn: '2027-02-01', binTypeId: w.binType.id, stops: [{ siteId: w.customerSite.id, expectedBins: 2 }] }, actor),
      ),
    );
    expect(made.map((r) => r.reference).sort()).toEqual(['01', '02', '03', '04', '05'].map((n) => `RUN-270201-T1-${n}`));
  });
});
