import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { Asset, ScanEvent, ScanEventKey, Trip } from '@/models';
import type { AppError } from '@/lib/api-errors';
import { sealState } from '@/lib/trips/seal-check';

const w = usePoolWorld();

const at = (iso: string) => new Date(iso);
const NOW = { now: at('2026-12-01T12:00:00Z') };
function scan(assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>, id = randomUUID()): ScanInput {
  return { clientEventId: id, assetId, ...input };
}

describe('a full rotation through the scan service', () => {
  test('prep check → liner → dispatch → deliver → fill → discharge → fold → collect → receive closes one trip', async () => {
    const bin = await newBin(w);
    const steps: Array<[ScanInput['action'], Partial<ScanInput>, typeof w.yard, string]> = [
      ['prep_check', { prepResult: 'pass', siteId: w.depot.id }, w.yard, 'available'],
      ['fit_liner', { linerLotId: w.lot.id, siteId: w.depot.id }, w.yard, 'prepared'],
      ['dispatch', { hireOrderId: w.order.id, siteId: w.depot.id }, w.yard, 'in_transit'],
      ['deliver', { siteId: w.customerSite.id }, w.yard, 'on_hire'],
      ['fill_seal', { siteId: w.customerSite.id, fill: { product: 'Test oil', volumeL: 950, massKg: 874, temperatureC: 18, seals: ['TE1', 'TE2'] } }, w.customerUser, 'on_hire'],
      ['discharge', { siteId: w.customerSite.id, sealsVerified: ['TE1', 'TE2'] }, w.customerUser, 'on_hire'],
      ['fold', { siteId: w.customerSite.id }, w.customerUser, 'awaiting_collection'],
      ['collect', { siteId: w.customerSite.id }, w.yard, 'in_transit'],
      ['receive', { siteId: w.depot2.id }, w.yard, 'available'],
    ];
    let minute = 0;
    for (const [action, extra, actor, expected] of steps) {
      const out = await recordScan(actor, scan(bin.id, { action, occurredAt: at(`2026-11-20T08:${String(minute++).padStart(2, '0')}:00Z`), ...extra }), NOW);
      expect(out.statusTo).toBe(expected);
    }
    const asset = await Asset.findByPk(bin.id);
    expect(asset!.status).toBe('available');
    expect(asset!.siteId).toBe(w.depot2.id);
    expect(asset!.tripCount).toBe(1);
    expect(asset!.currentTripId).toBeNull();
    expect(asset!.customerId).toBeNull();
    const trips = await Trip.findAll({ where: { assetId: bin.id } });
    expect(trips).toHaveLength(1);
    expect(trips[0]!.status).toBe('closed');
    expect(trips[0]!.sealsApplied).toEqual(['TE1', 'TE2']);
    expect(trips[0]!.sealMismatch).toBe(false);
    expect(trips[0]!.linerLotId).toBe(w.lot.id);
    expect(await ScanEvent.count({ where: { assetId: bin.id } })).toBe(10); // register + 9
  });
});

describe('idempotency', () => {
  test('a replayed client event id returns the original answer and records nothing twice', async () => {
    const bin = await newBin(w);
    const input = scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
    const first = await recordScan(w.yard, input, NOW);
    const again = await recordScan(w.yard, input, NOW);
    expect(first.replayed).toBe(false);
    expect(again.replayed).toBe(true);
    expect(again.eventId).toBe(first.eventId);
    expect(await ScanEvent.count({ where: { assetId: bin.id, action: 'prep_check' } })).toBe(1);
    expect((await Asset.findByPk(bin.id))!.version).toBe(first.version);
  });

  test('two replays at the same moment still record once', async () => {
    const bin = await newBin(w);
    const input = scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
    const results = await Promise.all([recordScan(w.yard, input, NOW), recordScan(w.yard, input, NOW)]);
    expect(results.filter((r) => !r.replayed)).toHaveLength(1);
    expect(await ScanEvent.count({ where: { assetId: bin.id, action: 'prep_check' } })).toBe(1);
  });

  test("another user cannot reuse someone else's event id", async () => {
    const bin = await newBin(w);
    const input = scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
    await recordScan(w.yard, input, NOW);
    expect((await appErrorOf(recordScan(w.planner, input, NOW))).code).toBe('duplicate');
  });

  test('the key table itself refuses a duplicate client event id', async () => {
    const id = randomUUID();
    await ScanEventKey.create({ clientEventId: id, userId: null, scanEventId: null, outcome: {} });
    await expect(ScanEventKey.create({ clientEventId: id, userId: null, scanEventId: null, outcome: {} })).rejects.toThrow();
  });
});

describe('refusals leave no trace', () => {
  test('fitting a liner before the prep check is refused and changes nothing', async () => {
    const bin = await newBin(w);
    const before = await Asset.findByPk(bin.id);
    const input = scan(bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
    const err = await appErrorOf(recordScan(w.yard, input, NOW));
    expect(err.code).toBe('transition_refused');
    expect((err.details as { reason: string }).reason).toBe('prep_check_needed');
    const after = await Asset.findByPk(bin.id);
    expect(after!.version).toBe(before!.version);
    expect(await ScanEvent.count({ where: { assetId: bin.id } })).toBe(1);
    expect(await ScanEventKey.findByPk(input.clientEventId)).toBeNull();
  });

  test('a bin whose periodic test lapsed cannot be lined (story: the app says no)', async () => {
    // made 2023-01 → 2.5-year test due 2025-07-31; scanned 2025-08-05
    const bin = await newBin(w, { manufactureMonth: '2023-01' });
    await recordScan(w.yard, scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id, occurredAt: at('2025-08-05T08:00:00Z') }), NOW);
    const err = await appErrorOf(recordScan(w.yard, scan(bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id, occurredAt: at('2025-08-05T08:05:00Z') }), NOW));
    expect((err.details as { reason: string }).reason).toBe('inspection_lapsed');
    expect(err.message).toMatch(/lapsed on 2025-07-31/);
    expect((await Asset.findByPk(bin.id))!.status).toBe('available');
  });

  test('a recalled liner lot is refused', async () => {
    const bin = await newBin(w);
    await recordScan(w.yard, scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id }), NOW);
    await w.lot.update({ status: 'recalled' });
    try {
      const err = await appErrorOf(recordScan(w.yard, scan(bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }), NOW));
      expect((err.details as { reason: string }).reason).toBe('lot_recalled');
      expect(await ScanEvent.count({ where: { assetId: bin.id, action: 'fit_liner' } })).toBe(0);
    } finally {
      await w.lot.update({ status: 'released' });
    }
  });

  test('a customer cannot act on a bin that is not on hire to them', async () => {
    const bin = await newBin(w);
    const err = await appErrorOf(recordScan(w.customerUser, scan(bin.id, { action: 'fold', siteId: w.customerSite.id }), NOW));
    expect(err.code).toBe('not_found');
  });
});

describe('two people acting on the same bin at once', () => {
  test('one succeeds and the other is told it changed meanwhile — never a lost update', async () => {
    const bin = await newBin(w);
    const v = (await Asset.findByPk(bin.id))!.version;
    const a = recordScan(w.yard, scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id, expectedVersion: v }), NOW);
    const b = recordScan(w.planner, scan(bin.id, { action: 'quarantine', siteId: w.depot.id, expectedVersion: v }), NOW);
    const settled = await Promise.allSettled([a, b]);
    const ok = settled.filter((s) => s.status === 'fulfilled');
    const failed = settled.filter((s) => s.status === 'rejected') as PromiseRejectedResult[];
    expect(ok).toHaveLength(1);
    expect(failed).toHaveLength(1);
    expect((failed[0]!.reason as AppError).code).toBe('changed_meanwhile');
    const asset = await Asset.findByPk(bin.id);
    expect(asset!.version).toBe(v + 1);
    expect(await ScanEvent.count({ where: { assetId: bin.id } })).toBe(2);
  });
});

describe('missed scans are inferred and flagged', () => {
  test('a bin received at a depot that was never scanned as folded or collected', async () => {
    const bin = await newBin(w);
    for (const [action, extra] of [
      ['prep_check', { prepResult: 'pass', siteId: w.depot.id }],
      ['fit_liner', { linerLotId: w.lot.id, siteId: w.depot.id }],
      ['dispatch', { hireOrderId: w.order.id, siteId: w.depot.id }],
      ['deliver', { siteId: w.customerSite.id }],
    ] as const) {
      await recordScan(w.yard, scan(bin.id, { action, ...extra }), NOW);
    }
    const out = await recordScan(w.yard, scan(bin.id, { action: 'receive', siteId: w.depot.id }), NOW);
    expect(out.inferred).toEqual(['fold', 'collect']);
    const inferred = await ScanEvent.findAll({
      where: { assetId: bin.id, inferred: true },
      order: [
        ['occurredAt', 'ASC'],
        ['id', 'ASC'],
      ],
    });
    expect(inferred.map((e) => e.action)).toEqual(['fold', 'collect']);
    expect(inferred.every((e) => e.flagged)).toBe(true);
    const asset = await Asset.findByPk(bin.id);
    expect(asset!.tripCount).toBe(1);
    expect(asset!.status).toBe('available');
  });

  test('a seal number that differs at discharge flags the trip', async () => {
    const bin = await newBin(w);
    const steps: Array<[typeof w.yard, Omit<ScanInput, 'clientEventId' | 'assetId'>]> = [
      [w.yard, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id }],
      [w.yard, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }],
      [w.yard, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id }],
      [w.yard, { action: 'deliver', siteId: w.customerSite.id }],
      [w.customerUser, { action: 'fill_seal', siteId: w.customerSite.id, fill: { product: 'Oil', seals: ['TE100', 'TE101'] } }],
    ];
    for (const [actor, input] of steps) await recordScan(actor, scan(bin.id, input), NOW);
    const out = await recordScan(w.customerUser, scan(bin.id, { action: 'discharge', siteId: w.customerSite.id, sealsVerified: ['TE100', 'TE999'] }), NOW);
    expect(out.flags).toContain('seal_mismatch');
    const trip = await Trip.findByPk(out.tripId!);
    expect(trip!.sealMismatch).toBe(true);
  });

  // The scan and sealState() (src/lib/trips/seal-check.ts) are one rule: equal as multisets, order does not matter.
  test.each([
    ['re-ordered numbers match', ['TE200', 'TE201'], ['TE201', 'TE200'], false],
    ['the same number twice where two were fitted is a mismatch', ['TE200', 'TE201'], ['TE200', 'TE200'], true],
  ])('%s', async (_name, applied, verified, flagged) => {
    const bin = await newBin(w);
    const steps: Array<[typeof w.yard, Omit<ScanInput, 'clientEventId' | 'assetId'>]> = [
      [w.yard, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id }],
      [w.yard, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }],
      [w.yard, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id }],
      [w.customerUser, { action: 'fill_seal', siteId: w.customerSite.id, fill: { product: 'Oil', seals: applied } }],
    ];
    for (const [actor, input] of steps) await recordScan(actor, scan(bin.id, input), NOW);
    const out = await recordScan(w.customerUser, scan(bin.id, { action: 'discharge', siteId: w.customerSite.id, sealsVerified: verified }), NOW);
    expect(out.flags.includes('seal_mismatch')).toBe(flagged);
    const trip = await Trip.findByPk(out.tripId!);
    expect(trip!.sealMismatch).toBe(flagged);
    expect(sealState(trip!.sealsApplied, trip!.sealsVerified, false) === 'mismatch').toBe(flagged);
  });
});
