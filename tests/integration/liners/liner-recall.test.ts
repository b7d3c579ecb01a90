// Hold and recall: fits stop at once; a fit made offline before the phone could know is kept and flagged;
// the trace lists exactly the trips (and lined bins, kits) that used the lot; the notice is mailed and recorded.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { receiveLot, sendKits } from '@/lib/liners/liner-ledger.server';
import { setLotStatus, lotTrace, lotHeader, sendLotNotice, noticesOf } from '@/lib/liners/liner-recall.server';
import { FIT_FROM_STOPPED_LOT } from '@/lib/liners/liner-recall';
import { ScanEvent } from '@/models';

const w = usePoolWorld();
const ACTOR = { userId: null, ip: null };
const at = (iso: string) => new Date(iso);
let minute = 0;
const next = () => at(`2026-11-20T08:${String(minute++).padStart(2, '0')}:00Z`);
const scan = (assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>, now = at('2026-11-20T12:00:00Z')) =>
  recordScan(w.yard, { clientEventId: randomUUID(), assetId, occurredAt: next(), ...input }, { now });

async function lined(lotId: number) {
  const bin = await newBin(w);
  await scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  await scan(bin.id, { action: 'fit_liner', linerLotId: lotId, siteId: w.depot.id });
  return bin;
}
async function outOnHire(lotId: number) {
  const bin = await lined(lotId);
  const out = await scan(bin.id, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id });
  return { bin, tripId: out.tripId! };
}

describe('hold and recall of a liner lot', () => {
  test('the trace returns exactly the trips that used the lot; a recall stops fits, blocks lined bins and keeps the offline fit', async () => {
    const other = await receiveLot(
      { id: null },
      { supplier: 'Test Liners', lotNumber: 'TL-OTHER', spec: 'PE bag', quantity: 20, receivedOn: '2026-01-01', expiryDate: '2028-01-01', siteId: w.depot.id },
    );
    const a = await outOnHire(w.lot.id);
    const b = await outOnHire(w.lot.id);
    await scan(a.bin.id, { action: 'deliver', siteId: w.customerSite.id });
    await recordScan(
      w.customerUser,
      { clientEventId: randomUUID(), assetId: a.bin.id, action: 'fill_seal', occurredAt: next(), siteId: w.customerSite.id, fill: { product: 'Sunflower oil', seals: ['S1'] } },
      { now: at('2026-11-20T12:00:00Z') },
    );
    const notThisLot = await outOnHire(other.lotId);
    const waiting = await lined(w.lot.id);
    await sendKits({ id: null }, { lotId: w.lot.id, siteId: w.depot.id, hireOrderId: w.order.id, quantity: 3, foldedBins: 3 }, { now: at('2026-11-20T09:30:00Z') });
    // Two bins prep-checked on a phone that then lost its signal.
    const offlineEarly = await newBin(w);
    const offlineLate = await newBin(w);
    const onlineLate = await newBin(w);
    for (const bin of [offlineEarly, offlineLate, onlineLate]) await scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });

    // The recall, recorded at 10:30.
    const before = (await lotHeader(w.lot.id))!;
    const recalled = await setLotStatus(
      ACTOR,
      w.lot.id,
      { action: 'recall', reason: 'Supplier reports a seam defect', version: before.version },
      { now: at('2026-11-20T10:30:00Z') },
    );
    expect(recalled.status).toBe('recalled');
    expect((await appErrorOf(setLotStatus(ACTOR, w.lot.id, { action: 'hold', reason: 'x', version: before.version }))).code).toBe('changed_meanwhile');

    // Online, after the recall: refused, nothing recorded.
    const online = await appErrorOf(
      recordScan(
        w.yard,
        { clientEventId: randomUUID(), assetId: onlineLate.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id, occurredAt: at('2026-11-20T10:40:00Z') },
        { now: at('2026-11-20T10:40:05Z') },
      ),
    );
    expect((online.details as { reason: string }).reason).toBe('lot_recalled');
    // The same phone with an old snapshot, but online (sent within seconds): still refused.
    const stale = await appErrorOf(
      recordScan(
        w.yard,
        {
          clientEventId: randomUUID(),
          assetId: onlineLate.id,
          action: 'fit_liner',
          linerLotId: w.lot.id,
          siteId: w.depot.id,
          occurredAt: at('2026-11-20T10:41:00Z'),
          lotsAsOf: at('2026-11-20T09:00:00Z'),
        },
        { now: at('2026-11-20T10:41:10Z') },
      ),
    );
    expect((stale.details as { reason: string }).reason).toBe('lot_recalled');
    // Offline: fitted at 10:10 (before the recall) and at 11:00 from a 09:00 snapshot, both sent at 12:00: kept and flagged.
    const early = await recordScan(
      w.yard,
      { clientEventId: randomUUID(), assetId: offlineEarly.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id, occurredAt: at('2026-11-20T10:10:00Z') },
      { now: at('2026-11-20T12:00:00Z') },
    );
    const late = await recordScan(
      w.yard,
      {
        clientEventId: randomUUID(),
        assetId: offlineLate.id,
        action: 'fit_liner',
        linerLotId: w.lot.id,
        siteId: w.depot.id,
        occurredAt: at('2026-11-20T11:00:00Z'),
        lotsAsOf: at('2026-11-20T09:00:00Z'),
      },
      { now: at('2026-11-20T12:00:00Z') },
    );
    for (const out of [early, late]) {
      expect(out.flags).toContain(FIT_FROM_STOPPED_LOT);
      expect((await ScanEvent.findByPk(out.eventId))!.flagged).toBe(true);
    }

    // A bin lined from the lot cannot go out until it is lined again.
    const blocked = await appErrorOf(scan(waiting.id, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id }));
    expect((blocked.details as { reason: string }).reason).toBe('lined_from_stopped_lot');

    const trace = await lotTrace(w.lot.id);
    const expectedTrips = await sequelize.query<{ id: number }>('SELECT id FROM trips WHERE liner_lot_id = $1 ORDER BY id', { bind: [w.lot.id], type: QueryTypes.SELECT });
    const tracedTrips = trace.filter((u) => u.kind === 'trip').map((u) => u.tripId);
    expect(tracedTrips.sort()).toEqual([a.tripId, b.tripId].sort());
    expect(tracedTrips.sort()).toEqual(expectedTrips.map((r) => r.id).sort());
    expect(tracedTrips).not.toContain(notThisLot.tripId);
    const filled = trace.find((u) => u.tripId === a.tripId)!;
    expect(filled).toMatchObject({ customer: 'Test Customer', fillingSite: 'Customer site', product: 'Sunflower oil', binStatus: 'on_hire', now: 'Customer site' });
    expect(filled.filledAt).not.toBeNull();
    const liningBins = trace.filter((u) => u.kind === 'lined');
    expect(liningBins.map((u) => u.assetId).sort()).toEqual([waiting.id, offlineEarly.id, offlineLate.id].sort());
    expect(
      liningBins
        .filter((u) => u.flaggedFit)
        .map((u) => u.assetId)
        .sort(),
    ).toEqual([offlineEarly.id, offlineLate.id].sort());
    expect(trace.filter((u) => u.kind === 'kit')).toMatchObject([{ liners: 3, orderRef: 'HO-TEST-1', customer: 'Test Customer' }]);

    // The notice goes to the customer's contact address and is recorded with who received it.
    const notice = await sendLotNotice(ACTOR, w.lot.id, { message: 'Set aside product filled in these bins.' }, { now: at('2026-11-20T12:30:00Z') });
    expect(notice.recipients).toEqual([{ organisation: 'Test Customer', email: 'c@test.example', status: expect.any(String), uses: 3 }]);
    const [mail] = await sequelize.query<{ subject: string; text_body: string; kind: string }>(
      `SELECT subject, text_body, kind FROM mail_outbox WHERE kind = 'liner_lot_notice' ORDER BY id DESC LIMIT 1`,
      { type: QueryTypes.SELECT },
    );
    expect(mail!.subject).toBe('Liner lot TL-001 recalled: 3 of your bins concerned');
    expect(mail!.text_body).toContain('Sunflower oil');
    expect(mail!.text_body).toContain('kit of 3 liners');
    expect(await noticesOf(w.lot.id)).toHaveLength(1);
  });
});
