import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { receiveLot, sendTransfer, scrapLiners } from '@/lib/liners/liner-ledger.server';
import { createSpec, createSupplier } from '@/lib/liners/liner-specs.server';
import { stockPicture, ledgerAt } from '@/lib/liners/stock-view.server';
import { sequelize } from '../support/db';

const w = usePoolWorld();
const ACTOR = { userId: null, ip: null };

describe('the stock picture', () => {
  test('on hand, in transit, allocated to the open order, the plan from the supplier terms, lots FEFO with liners at risk', async () => {
    const supplier = await createSupplier(
      { name: 'Plan Liners', orderEmail: 'o@plan.example', leadTimeDays: 7, orderCost: 80, packSize: 50, minOrderQty: 200, pricePerLiner: 6 },
      ACTOR,
    );
    const spec = await createSpec(
      {
        code: 'PL-1000',
        name: 'Plan bag',
        material: 'PE',
        layers: 1,
        nominalCapacityL: 1000,
        valveType: 'butterfly',
        valveSize: 'DN50',
        glandSize: 'DN150',
        foodContact: false,
        maxFillTempC: null,
        supplierId: supplier.id,
        articleNumber: null,
        binTypeIds: [w.binType.id],
      },
      ACTOR,
    );
    // Today (1 Dec 2026 in Amsterdam): lot S 30 liners expiring 10 Dec, lot L 20 expiring 2028; 5 of L sent to the second depot.
    const now = new Date('2026-12-01T10:00:00Z');
    const s = await receiveLot(
      { id: null },
      {
        supplier: 'Plan Liners',
        lotNumber: 'PL-S',
        spec: 'x',
        quantity: 30,
        receivedOn: '2026-11-01',
        expiryDate: '2026-12-10',
        siteId: w.depot.id,
        linerSpecId: spec.id,
        supplierId: supplier.id,
      },
      { now: new Date('2026-11-01T10:00:00Z') },
    );
    const l = await receiveLot(
      { id: null },
      {
        supplier: 'Plan Liners',
        lotNumber: 'PL-L',
        spec: 'x',
        quantity: 20,
        receivedOn: '2026-11-01',
        expiryDate: '2028-01-01',
        siteId: w.depot.id,
        linerSpecId: spec.id,
        supplierId: supplier.id,
      },
      { now: new Date('2026-11-01T10:00:00Z') },
    );
    await sendTransfer({ id: null }, { lotId: l.lotId, fromSiteId: w.depot.id, toSiteId: w.depot2.id, quantity: 5 }, { now: new Date('2026-11-30T10:00:00Z') });
    await scrapLiners({ id: null }, { lotId: s.lotId, siteId: w.depot.id, quantity: 1, reason: 'Torn' }, { now: new Date('2026-11-30T11:00:00Z') });
    // The world's order (24 bins of the test bin type from the depot, needed 10 Dec) takes one liner a bin; one bin lined and fitted first.
    const bin = await newBin(w);
    for (const [action, extra] of [
      ['prep_check', { prepResult: 'pass' }],
      ['fit_liner', { linerLotId: s.lotId }],
    ] as const) {
      await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action, siteId: w.depot.id, occurredAt: new Date('2026-11-30T12:00:00Z'), ...extra }, { now });
    }

    const p = await stockPicture(now);
    expect(p.today).toBe('2026-12-01');
    const here = p.depots.find((d) => d.siteId === w.depot.id)!.specs.find((x) => x.code === 'PL-1000')!;
    expect(here.onHand).toBe(28 + 15); // S: 30 − 1 scrapped − 1 fitted; L: 20 − 5 sent
    expect(here.inTransit).toBe(0);
    // 24 bins still to go out, the lined one serves the first: 23 liners needed by 10 Dec.
    expect(here.allocated).toBe(23);
    expect(here.plan).not.toBeNull();
    expect(here.plan!.knownInLeadTime).toBe(0); // needed 10 Dec: beyond the 7-day lead time
    expect(here.plan!.suggestedQuantity % 50).toBe(0);
    // FEFO: S first; S holds 28 with 23 known on 10 Dec (its expiry day) and a forecast of 1/56 a day (the one fit):
    // it serves the order in full → 28 − 23 − 10 days × 1/56 → 5 at risk (rounded up).
    expect(here.lots.map((x) => [x.lotNumber, x.rank])).toEqual([
      ['PL-S', 1],
      ['PL-L', 2],
    ]);
    expect(here.lots[0]!.atRisk).toBe(5);
    const there = p.depots.find((d) => d.siteId === w.depot2.id)!.specs.find((x) => x.code === 'PL-1000')!;
    expect(there.inTransit).toBe(5);
    expect(there.onHand).toBe(0);

    const moves = await ledgerAt({ siteId: w.depot.id, lot: 'PL-', limit: 50 });
    expect(moves.map((m) => m.kind).sort()).toEqual(['fitted', 'receipt', 'receipt', 'scrapped', 'sent']);
    expect((await ledgerAt({ siteId: w.depot.id, kind: 'sent' })).map((m) => [m.quantity, m.otherSite])).toEqual([[-5, 'Second depot']]);
    expect(await ledgerAt({ siteId: w.depot.id, lot: 'PL-', from: '2026-12-01' })).toEqual([]);
    await sequelize.query('SELECT 1');
  });
});
