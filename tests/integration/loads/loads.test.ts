import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { startLoad, addBinToLoad, dispatchLoad, deliveryToken, loadFromToken, confirmDelivery, loadView } from '@/lib/loads/load-service.server';
import { Asset, HireOrder, Load, Trailer } from '@/models';
import { AppError } from '@/lib/api-errors';

process.env.AUTH_SECRET ??= 'test-secret'; // delivery links are signed with it
const w = usePoolWorld();

async function preparedBin() {
  const bin = await newBin(w);
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
  return bin;
}

describe('a load against a hire order (story: a load goes out)', () => {
  test('prepared bins go on, a bin that is not ready is refused with the reason, the load stops at its target', async () => {
    const yardUser = { ...w.yard, id: w.yard.id! };
    const load = await startLoad(yardUser, { purpose: 'hire', hireOrderId: w.order.id, targetCount: 2 });
    expect(load.status).toBe('loading');
    const again = await startLoad(yardUser, { purpose: 'hire', hireOrderId: w.order.id });
    expect(again.id).toBe(load.id); // resumes the load already being filled

    const a = await preparedBin();
    const b = await preparedBin();
    const c = await preparedBin();
    const notReady = await newBin(w);

    const first = await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: a.id });
    expect(first).toMatchObject({ statusTo: 'in_transit', loaded: 1, target: 2 });
    const refusal = await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: notReady.id }).catch((e: AppError) => e);
    expect(refusal).toBeInstanceOf(AppError);
    expect((refusal as AppError).code).toBe('transition_refused');
    expect((refusal as AppError).message).toMatch(/Dispatch is not possible while the bin is available/);
    await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: b.id });
    const full = await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: c.id }).catch((e: AppError) => e);
    expect((full as AppError).details).toMatchObject({ reason: 'load_full' });
    expect((await Asset.findByPk(c.id))!.status).toBe('prepared');

    // carrier details, then the order shows loading; the note lists both bins with their liner lot
    await dispatchLoad(load.id, { carrier: 'Test Haulage', vehicleRegistration: 'AB-123-C', driverName: 'D. Driver', trailerSeals: ['TS1'] });
    const view = await loadView(load.reference);
    expect(view!.bins.map((x) => x.grai).sort()).toEqual([a.grai, b.grai].sort());
    expect(view!.bins.every((x) => x.lotNumber === 'TL-001')).toBe(true);
    expect((await HireOrder.findByPk(w.order.id))!.status).toBe('loading'); // 2 of 24

    // the receiving end confirms through the note's link, once
    const token = deliveryToken(load);
    expect(await loadFromToken(token.replace(/.$/, (ch) => (ch === 'A' ? 'B' : 'A')))).toBeNull();
    const found = await loadFromToken(token);
    const res = await confirmDelivery(found!, { receivedByName: 'R. Receiver', photoId: null, userId: null });
    expect(res.delivered).toBe(2);
    expect((await Asset.findByPk(a.id))!.status).toBe('on_hire');
    expect((await Asset.findByPk(a.id))!.siteId).toBe(w.customerSite.id);
    const twice = await confirmDelivery((await Load.findByPk(load.id))!, { receivedByName: 'R. Receiver', photoId: null, userId: null });
    expect(twice.already).toBe(true);
  });
});

describe('the trailer a load leaves on', () => {
  test('a trailer too small for the bins on is refused with its capacity; the chosen trailer is on the note', async () => {
    const yardUser = { ...w.yard, id: w.yard.id! };
    // One floor position (1,300 × 1,100 mm for a 1,200 × 1,000 mm bin) and one level: it takes one bin, erected.
    const small = await Trailer.create({ name: 'Test box van', insideLengthMm: 1300, insideWidthMm: 1100, insideHeightMm: 1500, payloadKg: 3000 });
    const big = await Trailer.create({ name: 'Test semi-trailer', insideLengthMm: 13600, insideWidthMm: 2450, insideHeightMm: 2700, payloadKg: 24000 });
    const load = await startLoad(yardUser, { purpose: 'hire', hireOrderId: w.order.id, targetCount: 2 });
    for (const bin of [await preparedBin(), await preparedBin()]) await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: bin.id });
    const send = (trailerId: number) => dispatchLoad(load.id, { carrier: 'Test Haulage', vehicleRegistration: 'TR-1', trailerSeals: [], trailerId });
    const refused = await send(small.id).catch((e: AppError) => e);
    expect(refused).toBeInstanceOf(AppError);
    expect((refused as AppError).message).toMatch(/^2 bins are on the load but the Test box van takes 1 /);
    expect((await Load.findByPk(load.id))!.status).toBe('loading'); // nothing changed
    await send(big.id);
    const view = await loadView(load.reference);
    expect(view).toMatchObject({ status: 'dispatched', trailer: 'Test semi-trailer' });
  });
});
