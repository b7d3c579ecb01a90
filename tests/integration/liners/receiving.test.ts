// Receiving at the home depot: the certificate is stored like other attachments (type sniffed), required for
// food-contact liners; an expired lot or a date after today is refused and nothing is written; transfers are
// booked in only at the depot they were sent to, kits go only on the depot's own orders.
import { describe, test, expect } from 'vitest';
import { usePoolWorld, appErrorOf } from '../support/fixtures';
import { createSpec, createSupplier } from '@/lib/liners/liner-specs.server';
import { receiveAtDepot } from '@/lib/liners/liner-receiving.server';
import { sendTransfer, onHand } from '@/lib/liners/liner-ledger.server';
import { checkArrivalHere, checkOrderHere, yardLinerView } from '@/lib/liners/yard-stock.server';
import { Attachment, LinerLot } from '@/models';

const w = usePoolWorld();
const ACTOR = { userId: null, ip: null };
const NOW = new Date('2026-12-01T10:00:00Z');
const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj<</Type/Catalog>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');

describe('receiving liners at the home depot', () => {
  test('certificate rules, refusals that write nothing, and the yard stock view', async () => {
    const supplier = await createSupplier({ name: 'Yard Liners', orderEmail: null, leadTimeDays: 7, orderCost: 0, packSize: 1, minOrderQty: 1, pricePerLiner: 3 }, ACTOR);
    const food = await createSpec(
      {
        code: 'FC-1',
        name: 'Food bag',
        material: 'PE',
        layers: 2,
        nominalCapacityL: 1000,
        valveType: 'butterfly',
        valveSize: 'DN50',
        glandSize: 'DN150',
        foodContact: true,
        maxFillTempC: 60,
        supplierId: supplier.id,
        articleNumber: null,
        binTypeIds: [],
      },
      ACTOR,
    );
    const yardUser = { id: w.yard.id!, organisationId: w.yard.organisationId, homeSiteId: w.depot.id };
    const base = { supplierId: supplier.id, linerSpecId: food.id, lotNumber: 'YL-1', quantity: 40, expiryDate: '2028-06-30', manufacturedOn: '2026-11-01' };

    expect((await appErrorOf(receiveAtDepot(yardUser, base, null, { now: NOW }))).message).toMatch(/declaration of compliance/);
    expect((await appErrorOf(receiveAtDepot(yardUser, { ...base, expiryDate: '2026-11-30' }, { bytes: PDF, filename: 'd.pdf' }, { now: NOW }))).message).toMatch(/expired already/);
    expect((await appErrorOf(receiveAtDepot(yardUser, base, { bytes: new TextEncoder().encode('plain text'), filename: 'd.pdf' }, { now: NOW }))).code).toBe(
      'unsupported_media_type',
    );
    expect(await LinerLot.count({ where: { lotNumber: 'YL-1' } })).toBe(0);
    expect(await Attachment.count({ where: { purpose: 'certificate' } })).toBe(0);

    const ok = await receiveAtDepot(yardUser, base, { bytes: PDF, filename: 'declaration.pdf' }, { now: NOW });
    const lot = (await LinerLot.findByPk(ok.lotId))!;
    expect(lot).toMatchObject({ siteId: w.depot.id, receivedOn: '2026-12-01', manufacturedOn: '2026-11-01', supplier: 'Yard Liners' });
    expect((await Attachment.findByPk(lot.certificateId!))!.contentType).toBe('application/pdf');
    expect(await onHand(ok.lotId, w.depot.id)).toBe(40);
    expect((await appErrorOf(receiveAtDepot({ ...yardUser, homeSiteId: null }, { ...base, lotNumber: 'YL-2' }, null, { now: NOW }))).message).toMatch(/no home depot/);

    const sent = await sendTransfer({ id: null }, { lotId: ok.lotId, fromSiteId: w.depot.id, toSiteId: w.depot2.id, quantity: 5 });
    await expect(checkArrivalHere(sent, w.depot2.id)).resolves.toBeUndefined();
    expect((await appErrorOf(checkArrivalHere(sent, w.depot.id))).code).toBe('not_found');
    await expect(checkOrderHere(w.order.id, w.depot.id)).resolves.toBeUndefined();
    expect((await appErrorOf(checkOrderHere(w.order.id, w.depot2.id))).code).toBe('unprocessable');

    const there = (await yardLinerView(w.depot2.id))!;
    expect(there.arriving).toMatchObject([{ sentMoveId: sent, lotNumber: 'YL-1', from: 'Test depot', quantity: 5 }]);
    const here = (await yardLinerView(w.depot.id))!;
    expect(here.lots.find((l) => l.lotNumber === 'YL-1')!.onHand).toBe(35);
  });
});
