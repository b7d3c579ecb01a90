// Purchase orders and the reorder alert job: a suggested order becomes an order wanted by the lead time, mailed
// to the supplier; deliveries against it (partial ones too) close it; the job mails planners once when stock
// falls below the reorder point and again only after it recovered.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { usePoolWorld, appErrorOf, makeUser } from '../support/fixtures';
import { startSmtpCapture } from '../support/smtp';
import { receiveLot } from '@/lib/liners/liner-ledger.server';
import { createSpec, createSupplier } from '@/lib/liners/liner-specs.server';
import { createPurchaseOrder, mailPurchaseOrder, getPurchaseOrder, closePurchaseOrder } from '@/lib/liners/purchase-orders.server';
import { openReorderAlerts } from '@/lib/liners/reorder-alerts.server';
import { runJobNow } from '@/lib/jobs/registry.server';
import { MailMessage } from '@/models';

const w = usePoolWorld();
const ACTOR = { userId: null, ip: null, name: 'Test planner' };
let smtp: Awaited<ReturnType<typeof startSmtpCapture>>;
beforeAll(async () => {
  smtp = await startSmtpCapture();
});
afterAll(async () => {
  await smtp.stop();
});

// The clock: 1 Dec 2026. The world's open order HO-TEST-1 wants 24 bins by 10 Dec from the depot.
const NOW = new Date('2026-12-01T09:00:00Z');
const at = (iso: string) => ({ now: new Date(iso) });

describe('liner purchase orders and reorder alerts', () => {
  test('order, mail, partial and final delivery; the job mails once per fall below the reorder point', async () => {
    await makeUser('planner', w.operator.id, { email: 'second.planner@test.example' });
    const supplier = await createSupplier(
      { name: 'Order Liners', orderEmail: 'orders@orderliners.example', leadTimeDays: 10, orderCost: 50, packSize: 50, minOrderQty: 100, pricePerLiner: 4.2 },
      ACTOR,
    );
    const spec = await createSpec(
      {
        code: 'PO-1000',
        name: 'Order bag 1,000 L',
        material: 'PE',
        layers: 2,
        nominalCapacityL: 1000,
        valveType: 'butterfly',
        valveSize: 'DN50',
        glandSize: 'DN150',
        foodContact: false,
        maxFillTempC: null,
        supplierId: supplier.id,
        articleNumber: 'OL-1',
        binTypeIds: [w.binType.id],
      },
      ACTOR,
    );
    await receiveLot(
      { id: null },
      {
        supplier: 'Order Liners',
        lotNumber: 'OL-A',
        spec: 'PO-1000',
        quantity: 20,
        receivedOn: '2026-11-20',
        expiryDate: '2028-11-20',
        siteId: w.depot.id,
        linerSpecId: spec.id,
        supplierId: supplier.id,
      },
    );

    // Known demand: 24 bins by 10 Dec, all within the 10-day lead time → reorder point 24 (no history: no forecast,
    // no safety stock). Position 20 < 24: the alert opens and every planner gets one mail.
    const first = await runJobNow('liner-reorder-alerts', { now: NOW });
    expect(first).toMatchObject({ raised: 1, mailed: 2 });
    const alerts = await openReorderAlerts();
    expect(alerts).toMatchObject([{ specCode: 'PO-1000', position: 20, reorderPoint: 24 }]);
    expect(await MailMessage.count({ where: { kind: 'liner_reorder_alert' } })).toBe(2);
    const alertMail = smtp.lastTo('second.planner@test.example')!;
    expect(alertMail.parsed.subject).toBe('Liner stock below the reorder point: PO-1000 at Test depot');
    expect(alertMail.parsed.text).toContain('PO-1000 at Test depot: 20 against a reorder point of 24');
    // Later runs while it stays below: no more mail (not one per fit, not one per run).
    expect(await runJobNow('liner-reorder-alerts', at('2026-12-01T10:20:00Z'))).toMatchObject({ raised: 0, mailed: 0 });
    expect(await MailMessage.count({ where: { kind: 'liner_reorder_alert' } })).toBe(2);

    // The suggested order becomes a purchase order; the quantity must suit the cartons and the minimum.
    expect((await appErrorOf(createPurchaseOrder(ACTOR, { depotSiteId: w.depot.id, specId: spec.id, quantity: 120 }, { now: NOW }))).message).toMatch(/order 150 \(or 100\)/);
    expect((await appErrorOf(createPurchaseOrder(ACTOR, { depotSiteId: w.depot.id, specId: spec.id, quantity: 50 }, { now: NOW }))).message).toMatch(/minimum order is 100/);
    const po = await createPurchaseOrder(ACTOR, { depotSiteId: w.depot.id, specId: spec.id, quantity: 100 }, { now: NOW });
    expect(po).toMatchObject({
      reference: `LPO-${String(po.id).padStart(5, '0')}`,
      orderedOn: '2026-12-01',
      wantedBy: '2026-12-11',
      state: 'open',
      remaining: 100,
      pricePerLiner: '4.20',
    });
    const mailed = await mailPurchaseOrder(ACTOR, po.id);
    expect(mailed.mailedAt).not.toBeNull();
    const poMail = smtp.lastTo('orders@orderliners.example')!;
    expect(poMail.parsed.subject).toBe(`Purchase order ${po.reference}: 100 liners (OL-1)`);
    expect(poMail.parsed.text).toContain('Wanted by 11 Dec 2026');

    // On order counts in the position: 20 + 100 ≥ 24, the alert clears (no mail).
    expect(await runJobNow('liner-reorder-alerts', at('2026-12-01T11:20:00Z'))).toMatchObject({ cleared: 1, mailed: 0 });
    expect(await openReorderAlerts()).toEqual([]);

    // A partial delivery, then the rest: the second closes the order.
    const part = await receiveLot(
      { id: null },
      {
        supplier: 'Order Liners',
        lotNumber: 'OL-B',
        spec: 'PO-1000',
        quantity: 60,
        receivedOn: '2026-12-05',
        expiryDate: '2028-12-05',
        siteId: w.depot.id,
        linerSpecId: spec.id,
        supplierId: supplier.id,
        purchaseOrderId: po.id,
      },
    );
    expect(part.purchaseOrderClosed).toBe(false);
    expect(await getPurchaseOrder(po.id)).toMatchObject({ state: 'part_received', received: 60, remaining: 40 });
    expect(
      (
        await appErrorOf(
          receiveLot(
            { id: null },
            {
              supplier: 'Order Liners',
              lotNumber: 'OL-X',
              spec: 'PO-1000',
              quantity: 5,
              receivedOn: '2026-12-05',
              expiryDate: '2028-12-05',
              siteId: w.depot2.id,
              linerSpecId: spec.id,
              supplierId: supplier.id,
              purchaseOrderId: po.id,
            },
          ),
        )
      ).message,
    ).toMatch(/another depot/);
    const rest = await receiveLot(
      { id: null },
      {
        supplier: 'Order Liners',
        lotNumber: 'OL-C',
        spec: 'PO-1000',
        quantity: 40,
        receivedOn: '2026-12-08',
        expiryDate: '2028-12-08',
        siteId: w.depot.id,
        linerSpecId: spec.id,
        supplierId: supplier.id,
        purchaseOrderId: po.id,
      },
    );
    expect(rest.purchaseOrderClosed).toBe(true);
    const closed = (await getPurchaseOrder(po.id))!;
    expect(closed).toMatchObject({ status: 'closed', state: 'received', received: 100, remaining: 0 });
    expect(closed.lots.map((l) => l.lotNumber)).toEqual(['OL-B', 'OL-C']);
    expect(
      (
        await appErrorOf(
          receiveLot(
            { id: null },
            {
              supplier: 'Order Liners',
              lotNumber: 'OL-D',
              spec: 'PO-1000',
              quantity: 5,
              receivedOn: '2026-12-08',
              expiryDate: '2028-12-08',
              siteId: w.depot.id,
              linerSpecId: spec.id,
              supplierId: supplier.id,
              purchaseOrderId: po.id,
            },
          ),
        )
      ).code,
    ).toBe('conflict');

    // A second order cancelled unreceived is no longer on order.
    const spare = await createPurchaseOrder(ACTOR, { depotSiteId: w.depot.id, specId: spec.id, quantity: 100 }, { now: NOW });
    expect(await closePurchaseOrder(ACTOR, spare.id, { version: spare.version })).toMatchObject({ status: 'cancelled', state: 'cancelled' });
  });
});
