import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { receiveLot, onHand } from '@/lib/liners/liner-ledger.server';
import { createSpec, createSupplier, updateSpec, updateSupplier, listSpecs } from '@/lib/liners/liner-specs.server';
import { User } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import type { SpecInput } from '@/lib/liners/liner-schemas';

const w = usePoolWorld();
const NOW = new Date('2026-12-01T12:00:00Z');
const ACTOR = { userId: null, ip: null };
let minute = 0;
const scan = (assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>) =>
  recordScan(w.yard, { clientEventId: randomUUID(), assetId, occurredAt: new Date(Date.UTC(2026, 10, 20, 8, minute++)), ...input }, { now: NOW });

const base: SpecInput = {
  code: 'X',
  name: 'Test bag',
  material: 'PE',
  layers: 1,
  nominalCapacityL: 1000,
  valveType: 'butterfly',
  valveSize: 'DN50',
  glandSize: 'DN150',
  foodContact: true,
  maxFillTempC: 60,
  supplierId: null,
  articleNumber: null,
  binTypeIds: [],
};

async function lotOf(specId: number, lotNumber: string) {
  const { lotId } = await receiveLot(
    { id: null },
    { supplier: 'Spec Liners', lotNumber, spec: 'see spec', quantity: 10, receivedOn: '2026-10-01', expiryDate: '2028-10-01', siteId: w.depot.id, linerSpecId: specId },
  );
  return lotId;
}
async function checkedBin() {
  const bin = await newBin(w);
  await scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  return bin;
}

describe('liner specs and the fit', () => {
  test('a lot of a listed spec fits; capacity, valve and gland mismatches are refused with the reason, online and from the offline queue', async () => {
    const supplier = await createSupplier(
      { name: 'Spec Liners', orderEmail: 'orders@spec.example', leadTimeDays: 12, orderCost: 80, packSize: 50, minOrderQty: 200, pricePerLiner: 6.5 },
      ACTOR,
    );
    const good = await createSpec({ ...base, code: 'OK-1000', supplierId: supplier.id, articleNumber: 'A-1', binTypeIds: [w.binType.id] }, ACTOR);
    const big = await createSpec({ ...base, code: 'BIG-1250', nominalCapacityL: 1250 }, ACTOR);
    const dn80 = await createSpec({ ...base, code: 'V-DN80', valveSize: 'DN80' }, ACTOR);
    const thread = await createSpec({ ...base, code: 'V-S60', valveType: 'spout', valveSize: 'S60x6' }, ACTOR);
    const gland = await createSpec({ ...base, code: 'G-DN100', glandSize: 'DN100' }, ACTOR);
    const twin = await createSpec({ ...base, code: 'TWIN' }, ACTOR);

    const okBin = await checkedBin();
    const okLot = await lotOf(good.id, 'SP-OK');
    await scan(okBin.id, { action: 'fit_liner', linerLotId: okLot, siteId: w.depot.id });
    expect(await onHand(okLot, w.depot.id)).toBe(9);

    const cases: Array<[number, string, string, RegExp]> = [
      [big.id, 'SP-BIG', 'liner_capacity', /it is a 1,250 L liner; this bin takes 1,000 L/],
      [dn80.id, 'SP-80', 'liner_valve', /its valve is DN80 butterfly valve; this bin's outlet takes DN50 butterfly valve/],
      [thread.id, 'SP-S60', 'liner_valve', /its valve is S60x6 plain spout/],
      [gland.id, 'SP-GL', 'liner_gland', /its fill gland is DN100; this bin's lid takes DN150/],
      [twin.id, 'SP-TW', 'liner_not_listed', /not listed for this bin type/],
    ];
    const planner = (await User.findByPk(w.yard.id!))!;
    const me: SessionUser = {
      id: planner.id,
      email: planner.email,
      name: planner.name,
      role: planner.role,
      organisationId: planner.organisationId,
      organisationName: '',
      homeSiteId: planner.homeSiteId,
      qualifiedInspector: false,
    };
    for (const [specId, lotNumber, code, reason] of cases) {
      const lotId = await lotOf(specId, lotNumber);
      const bin = await checkedBin();
      const online = await appErrorOf(scan(bin.id, { action: 'fit_liner', linerLotId: lotId, siteId: w.depot.id }));
      expect([online.code, (online.details as { reason: string }).reason]).toEqual(['transition_refused', code]);
      expect(online.message).toMatch(reason);
      expect(online.message).toContain('Test bin 1000 L');
      // The same fit queued on a phone without signal and sent an hour later.
      const queued = await appErrorOf(
        recordScanFromClient(me, {
          clientEventId: randomUUID(),
          assetId: bin.id,
          action: 'fit_liner',
          linerLotId: lotId,
          siteId: w.depot.id,
          occurredAt: new Date(NOW.getTime() - 3_600_000).toISOString(),
        } as never),
      );
      expect((queued.details as { reason: string }).reason).toBe(code);
      expect(await onHand(lotId, w.depot.id)).toBe(10);
    }
  });

  test('editing a spec needs its current version; codes are unique; the bin types it fits are kept', async () => {
    const [spec] = (await listSpecs()).filter((s) => s.code === 'OK-1000');
    expect(spec!.binTypeIds).toEqual([w.binType.id]);
    expect(spec!.supplierName).toBe('Spec Liners');
    const { id, version, supplierName: _s, lots: _l, binTypeIds: _b, ...rest } = spec!;
    const input: SpecInput = { ...rest, binTypeIds: [], version };
    const saved = await updateSpec(id, { ...input, name: 'Renamed bag' }, ACTOR);
    expect(saved).toMatchObject({ name: 'Renamed bag', binTypeIds: [] });
    expect((await appErrorOf(updateSpec(id, { ...input, name: 'Stale' }, ACTOR))).code).toBe('changed_meanwhile');
    expect((await appErrorOf(createSpec({ ...base, code: 'OK-1000' }, ACTOR))).code).toBe('duplicate');
    expect((await appErrorOf(createSpec({ ...base, code: 'NEW-1', binTypeIds: [99_999] }, ACTOR))).code).toBe('validation_failed');
  });

  test('supplier terms are edited with their version', async () => {
    const s = await createSupplier({ name: 'Terms Ltd', orderEmail: null, leadTimeDays: 5, orderCost: 50, packSize: 25, minOrderQty: 100, pricePerLiner: 5 }, ACTOR);
    const next = await updateSupplier(
      s.id,
      { name: 'Terms Ltd', orderEmail: 'buy@terms.example', leadTimeDays: 7, orderCost: 55.5, packSize: 25, minOrderQty: 100, pricePerLiner: 5.25, version: s.version },
      ACTOR,
    );
    expect(next).toMatchObject({ orderEmail: 'buy@terms.example', leadTimeDays: 7, orderCost: '55.50', pricePerLiner: '5.25' });
    expect(
      (
        await appErrorOf(
          updateSupplier(s.id, { name: 'Terms Ltd', orderEmail: null, leadTimeDays: 7, orderCost: 1, packSize: 1, minOrderQty: 1, pricePerLiner: 1, version: s.version }, ACTOR),
        )
      ).code,
    ).toBe('changed_meanwhile');
  });
});
