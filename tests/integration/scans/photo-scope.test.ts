// A scan's photos must be its own organisation's uploads and belong to that
// bin: a customer naming another organisation's photo, or a photo already
// claimed by another bin, is refused, with one answer whatever the reason, so
// the refusal says nothing about which ids exist.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { recordScan, type Actor, type ScanInput } from '@/lib/scans/scan-service.server';
import { Attachment, Organisation, ScanEvent } from '@/models';
import { sqlRows } from '../support/hand-made';

const w = usePoolWorld();
const NOW = { now: new Date('2026-12-01T12:00:00Z') };
const PNG = Buffer.from('89504e470d0a1a0a0000000d4948445200000001000000010806000000', 'hex');

async function photo(organisationId: number | null, uploadedBy: number | null = null) {
  const row = await Attachment.create({
    content: PNG,
    contentType: 'image/png',
    byteSize: PNG.byteLength,
    sha256: 'a'.repeat(64),
    filename: 'p.png',
    purpose: 'photo',
    organisationId,
    uploadedBy,
  });
  return row.id;
}

/** A bin on hire at the customer's site, ready for fill_seal. */
async function binOnHire() {
  const bin = await newBin(w);
  for (const input of [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId: w.customerSite.id },
  ] as const) {
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, ...input }, NOW);
  }
  return bin;
}

const fill = (assetId: number, photoIds: number[]): ScanInput => ({
  clientEventId: randomUUID(),
  assetId,
  action: 'fill_seal',
  siteId: w.customerSite.id,
  photoIds,
  fill: { product: 'Test oil', seals: ['TP1', 'TP2'] },
});

async function refusal(actor: Actor, input: ScanInput) {
  const err = await appErrorOf(recordScan(actor, input, NOW));
  return { code: err.code, message: err.message, details: err.details };
}

describe('photos named by a scan', () => {
  test('a customer’s own photo of their own bin is accepted and then belongs to that bin', async () => {
    const bin = await binOnHire();
    const mine = await photo(w.customer.id, w.customerUser.id);
    const out = await recordScan(w.customerUser, fill(bin.id, [mine]), NOW);
    expect(out.statusTo).toBe('on_hire');
    expect((await Attachment.findByPk(mine))!.assetId).toBe(bin.id);
  });

  test('another organisation’s photo, an unknown id and another bin’s photo get the same refusal, and nothing is written', async () => {
    const bin = await binOnHire();
    const other = await Organisation.create({ name: 'Other Customer', kind: 'customer', contactEmail: null, freeDays: 14 });
    const theirs = await photo(other.id);
    const operators = await photo(w.operator.id);
    const [{ max }] = await sqlRows<{ max: number }>('SELECT max(id)::int AS max FROM attachments');
    const unknown = max + 1000;
    // a photo of the customer's that a scan of another of their bins already claimed
    const otherBin = await binOnHire();
    const claimed = await photo(w.customer.id, w.customerUser.id);
    await recordScan(w.customerUser, fill(otherBin.id, [claimed]), NOW);

    const answers = [];
    for (const ids of [[theirs], [operators], [unknown], [claimed], [await photo(w.customer.id), theirs]]) {
      answers.push(await refusal(w.customerUser, fill(bin.id, ids)));
    }
    expect(answers[0]).toEqual({
      code: 'unprocessable',
      message: 'A photo named with this scan is not one your organisation uploaded for this bin. Take the photo again.',
      details: { field: 'photoIds' },
    });
    for (const a of answers) expect(a).toEqual(answers[0]);
    expect(JSON.stringify(answers)).not.toContain(String(theirs));

    // nothing written: no fill event, no photo claimed
    expect(await ScanEvent.count({ where: { assetId: bin.id, action: 'fill_seal' } })).toBe(0);
    const rows = await sqlRows<{ id: number; asset_id: number | null }>('SELECT id, asset_id FROM attachments WHERE id = ANY($1::int[])', [[theirs, operators]]);
    expect(rows.every((r) => r.asset_id === null)).toBe(true);
  });

  test('operator staff cannot name a customer’s photo either (organisation, not role)', async () => {
    const bin = await newBin(w);
    const customers = await photo(w.customer.id);
    const err = await refusal(w.yard, {
      clientEventId: randomUUID(),
      assetId: bin.id,
      action: 'prep_check',
      prepResult: 'fail',
      faults: 'Dent',
      photoIds: [customers],
      siteId: w.depot.id,
    });
    expect(err.code).toBe('unprocessable');
    const ours = await photo(w.operator.id);
    const ok = await recordScan(
      w.yard,
      { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', prepResult: 'fail', faults: 'Dent', photoIds: [ours], siteId: w.depot.id },
      NOW,
    );
    expect(ok.replayed).toBe(false);
  });
});
