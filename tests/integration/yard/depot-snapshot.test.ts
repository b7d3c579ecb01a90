import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin } from '../support/fixtures';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { loadDepotSnapshot } from '@/lib/yard/depot-snapshot.server';
import { receiveLot } from '@/lib/liners/liner-ledger.server';

const w = usePoolWorld();

const NOW = new Date('2026-12-01T12:00:00Z');
let minute = 0;
const scan = (actor: typeof w.yard, assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>) =>
  recordScan(actor, { clientEventId: randomUUID(), assetId, occurredAt: new Date(Date.UTC(2026, 10, 20, 8, minute++)), ...input }, { now: NOW });

describe('the depot snapshot a yard phone keeps', () => {
  test('bins here and bins on their way back here, with the state the rule table reads; lots first-expiry-first-out; open orders', async () => {
    const here = await newBin(w);
    const checked = await newBin(w);
    await scan(w.yard, checked.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
    const out = await newBin(w);
    for (const [action, extra] of [
      ['prep_check', { prepResult: 'pass', siteId: w.depot.id }],
      ['fit_liner', { linerLotId: w.lot.id, siteId: w.depot.id }],
      ['dispatch', { hireOrderId: w.order.id, siteId: w.depot.id }],
      ['deliver', { siteId: w.customerSite.id }],
    ] as const) {
      await scan(w.yard, out.id, { action, ...extra });
    }
    const elsewhere = await newBin(w);
    await scan(w.planner, elsewhere.id, { action: 'dispatch', purpose: 'transfer', siteId: w.depot.id });
    await scan(w.planner, elsewhere.id, { action: 'receive', siteId: w.depot2.id });
    const earlier = { lotNumber: 'TL-000' };
    await receiveLot(
      { id: null },
      { supplier: 'Test Liners', lotNumber: 'TL-000', spec: 'PE bag', quantity: 50, receivedOn: '2026-02-01', expiryDate: '2027-03-01', siteId: w.depot.id },
    );

    const s = await loadDepotSnapshot(w.depot.id, NOW);
    expect(s).not.toBeNull();
    expect(s!.depot).toEqual({ id: w.depot.id, name: 'Test depot', kind: 'depot' });
    expect(s!.today).toBe('2026-12-01');
    expect(s!.timeZone).toBe('Europe/Amsterdam');
    const byId = new Map(s!.bins.map((b) => [b.id, b]));
    expect(byId.get(here.id)).toMatchObject({
      grai: here.grai,
      status: 'available',
      where: 'here',
      siteId: w.depot.id,
      siteKind: 'depot',
      prepChecked: false,
      tripOpen: false,
      binTypeId: w.binType.id,
    });
    expect(byId.get(checked.id)).toMatchObject({ status: 'available', prepChecked: true, where: 'here' });
    expect(byId.get(out.id)).toMatchObject({ status: 'on_hire', where: 'expected', siteKind: 'customer', tripOpen: true, linerLotId: w.lot.id });
    expect(byId.has(elsewhere.id)).toBe(false);
    expect(typeof byId.get(here.id)!.version).toBe('number');
    expect(s!.lots.map((l) => l.lotNumber)).toEqual([earlier.lotNumber, w.lot.lotNumber]);
    expect(s!.orders).toEqual([expect.objectContaining({ id: w.order.id, reference: 'HO-TEST-1', binTypeId: w.binType.id, loaded: 1, quantity: 24 })]);
  });

  test('an unknown depot has no snapshot', async () => {
    expect(await loadDepotSnapshot(99_999, NOW)).toBeNull();
  });
});
