// ADR 4.1.1.15 end to end on the real test database: an admin puts a bin type under the period of use, a bin
// registered with its inner receptacle's month shows the end of the period, and once it has passed the bin is
// refused a liner (and a fill) like a lapsed test. Hand-worked: made 2021-06, 5 years → used up to 2026-06-30.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, appErrorOf } from '../support/fixtures';
import { Asset } from '@/models';
import { updateBinType, binTypeById } from '@/lib/pool-setup/bin-types.server';
import { registerBin } from '@/lib/bins/bin-register.server';
import { recordScan } from '@/lib/scans/scan-service.server';
import { makeGrai } from '@/lib/gs1';
import { loadBinView } from '@/lib/bins/bin-view.server';

const w = usePoolWorld();
const actor = { userId: null, ip: null };

describe('period of use of the inner receptacle (ADR 4.1.1.15)', () => {
  test('set per bin type; over 5 years refused', async () => {
    const t = await binTypeById(w.binType.id);
    const bad = await appErrorOf(updateBinType(t.id, { version: t.version, serviceLifeApplies: true, serviceLifeYears: 6 }, actor));
    expect(bad.code).toBe('validation_failed');
    const after = await updateBinType(t.id, { version: t.version, serviceLifeApplies: true, serviceLifeYears: 5 }, actor);
    expect([after.serviceLifeApplies, after.serviceLifeYears]).toEqual([true, 5]);
  });

  test('a bin past its period shows the end and is refused a liner; one inside it is lined', async () => {
    // Its tests are in date (2026-05), so what refuses it is the period of use alone.
    const old = await registerBin(w.planner, {
      grai: makeGrai('9529999', '10010', 'SL0001'),
      binTypeId: w.binType.id,
      siteId: w.depot.id,
      manufactureMonth: '2021-06',
      innerMadeMonth: '2021-06',
      lastIntermediateTestMonth: '2026-05',
      lastFullInspectionMonth: '2026-05',
    });
    // Left out: the bin's own month (2024-03) → used up to 2029-03-31.
    const young = await registerBin(w.planner, {
      grai: makeGrai('9529999', '10010', 'SL0002'),
      binTypeId: w.binType.id,
      siteId: w.depot.id,
      manufactureMonth: '2024-03',
      lastIntermediateTestMonth: '2026-05',
    });
    expect([(await Asset.findByPk(old.id))!.innerMadeMonth, (await Asset.findByPk(young.id))!.innerMadeMonth]).toEqual(['2021-06-01', '2024-03-01']);
    const view = (await loadBinView(old.grai, { ...w.planner, id: w.planner.id!, siteIds: null } as never))!;
    expect(view.asset.serviceLifeEndsOn).toBe('2026-06-30');
    for (const b of [old, young]) {
      await recordScan(w.yard, { clientEventId: randomUUID(), assetId: b.id, action: 'prep_check', siteId: w.depot.id, prepResult: 'pass', checklist: {} });
    }
    const refused = await appErrorOf(recordScan(w.yard, { clientEventId: randomUUID(), assetId: old.id, action: 'fit_liner', siteId: w.depot.id, linerLotId: w.lot.id }));
    expect(refused.code).toBe('transition_refused');
    expect(refused.message).toMatch(/period of use ended on 2026-06-30/);
    expect((await Asset.findByPk(old.id))!.status).toBe('available');
    const lined = await recordScan(w.yard, { clientEventId: randomUUID(), assetId: young.id, action: 'fit_liner', siteId: w.depot.id, linerLotId: w.lot.id });
    expect(lined.statusTo).toBe('prepared');
  });
});
