// Repair orders on the real test database: a failed inspection or prep check opens one (one open per bin), work
// is recorded on it, a release is refused once work is done, only a passed test after repair closes it and puts
// the bin back in service; a damage report's customer comes with it to billing (repairChargesFor), and a repair
// above the threshold is proposed for retirement and retires the bin through the rule table.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf, makeUser } from '../support/fixtures';
import { sequelize } from '../support/db';
import { Asset, User } from '@/models';
import { recordInspection } from '@/lib/inspections/inspection-records.server';
import { CHECKLIST, type InspectionDraft } from '@/lib/inspections/inspection-form';
import { recordScan } from '@/lib/scans/scan-service.server';
import { openRepair, recordRepairWork, repairChargesFor, repairOrderById, retireFromRepair, updateRepairOrder } from '@/lib/inspections/repairs.server';
import { createDamageReport } from '@/lib/requests/requests.server';
import { localDate } from '@/lib/calendar';

const w = usePoolWorld();
// The world's staff as signed-in people (an id, never null).
const P = () => ({ ...w.planner, id: w.planner.id! });
const Y = () => ({ ...w.yard, id: w.yard.id! });
const today = () => localDate(new Date(), 'Europe/Amsterdam');
const ok = (kind: InspectionDraft['kind']) => Object.fromEntries(CHECKLIST[kind].map((i) => [i.key, true]));

async function inspector() {
  const u = await makeUser('yard', w.operator.id, { homeSiteId: w.depot.id });
  await User.update({ qualifiedInspector: true, name: 'Ruth Okafor' }, { where: { id: u.id } });
  return { id: u.id, role: u.role, organisationId: u.organisationId, homeSiteId: u.homeSiteId };
}
const test_ = (assetId: number, inspectorId: number, over: Partial<InspectionDraft>) => ({
  clientEventId: randomUUID(),
  assetId,
  siteId: w.depot.id,
  kind: 'intermediate' as const,
  performedOn: today(),
  checklist: ok('intermediate'),
  leakTest: { pressureKpa: 22, minutes: 10, passed: true },
  outcome: 'pass' as const,
  inspectorId,
  inspectionBody: null,
  remarks: null,
  ...over,
});
const work = (over: Partial<{ cost: string; labourHours: number }> = {}) => ({
  performedOn: today(),
  description: 'Straightened the frame, new valve gasket',
  parts: 'Valve gasket DN50',
  labourHours: 1.5,
  cost: '85.50',
  ...over,
});
const orders = (assetId: number) =>
  sequelize.query<{ id: number; status: string; opened_from: string; fault: string; closing_inspection_id: number | null }>(
    'SELECT id, status, opened_from, fault, closing_inspection_id FROM repair_orders WHERE asset_id = $1 ORDER BY id',
    { bind: [assetId], type: QueryTypes.SELECT },
  );

describe('repair orders', () => {
  test('failed inspection → repair order → work → after-repair test → back in service; a release is refused once work is done', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const failed = await recordInspection(
      me,
      test_(bin.id, me.id, { outcome: 'repair', checklist: { ...ok('intermediate'), serviceEquipment: false }, remarks: 'Valve leaks at the flange' }),
    );
    expect(failed.scan.statusTo).toBe('quarantine');
    const [order] = await orders(bin.id);
    expect(order).toMatchObject({ status: 'open', opened_from: 'inspection', fault: 'Valve leaks at the flange' });
    expect(failed.repairOrderId).toBe(order!.id);
    // A second failure keeps the one open order.
    const again = await recordInspection(
      me,
      test_(bin.id, me.id, {
        outcome: 'fail',
        kind: 'after_repair',
        checklist: ok('after_repair'),
        leakTest: { pressureKpa: 22, minutes: 10, passed: false },
        remarks: 'Still leaks',
      }),
    );
    expect(again.repairOrderId).toBe(order!.id);
    expect(await orders(bin.id)).toHaveLength(1);

    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'send_to_repair', siteId: w.depot.id });
    const entry = await recordRepairWork(Y(), order!.id, work());
    expect(entry.costMinor).toBe(8550);
    await recordRepairWork(Y(), order!.id, work({ cost: '12', labourHours: 0.25 }));
    const v = (await repairOrderById(order!.id))!;
    expect([v.costMinor, v.labourHours, v.work.length]).toEqual([9750, 1.75, 2]);

    const release = await appErrorOf(recordScan(w.planner, { clientEventId: randomUUID(), assetId: bin.id, action: 'release', siteId: null }));
    expect(release.code).toBe('transition_refused');
    expect(release.message).toMatch(/test after repair/);
    expect((await Asset.findByPk(bin.id))!.status).toBe('in_repair');

    const passed = await recordInspection(me, test_(bin.id, me.id, { kind: 'after_repair', checklist: ok('after_repair') }));
    expect(passed.scan.statusTo).toBe('available');
    expect(passed.repairClosed).toBe(true);
    const [closed] = await orders(bin.id);
    expect(closed).toMatchObject({ status: 'closed', closing_inspection_id: passed.inspectionId });
    // Ended orders take no more work.
    expect((await appErrorOf(recordRepairWork(Y(), order!.id, work()))).code).toBe('transition_refused');
  });

  test('a failed prep check opens one; released with nothing done it ends as withdrawn', async () => {
    const bin = await newBin(w);
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', siteId: w.depot.id, prepResult: 'fail', faults: 'Cracked corner post' });
    const [order] = await orders(bin.id);
    expect(order).toMatchObject({ status: 'open', opened_from: 'prep_check', fault: 'Cracked corner post' });
    await recordScan(w.planner, { clientEventId: randomUUID(), assetId: bin.id, action: 'release', siteId: null, note: 'Checked again: only dirt.' });
    const [ended] = await orders(bin.id);
    expect(ended!.status).toBe('withdrawn');
  });

  test('bad work entries are refused and change nothing', async () => {
    const bin = await newBin(w);
    const { id } = await openRepair(P(), { assetId: bin.id, fault: 'Dented panel' });
    for (const bad of [work({ cost: '12.345' }), work({ labourHours: -2 }), { ...work(), description: ' ' }, { ...work(), performedOn: '2099-01-01' }]) {
      expect((await appErrorOf(recordRepairWork(Y(), id, bad))).code).toBe('validation_failed');
    }
    expect((await repairOrderById(id))!.work).toHaveLength(0);
    // One open order per bin.
    const dup = await appErrorOf(openRepair(P(), { assetId: bin.id, fault: 'Another dent' }));
    expect(dup.code).toBe('conflict');
    expect(dup.details).toEqual({ repairOrderId: id });
  });

  test("a damage report's customer and the repair cost reach billing; other customers and other periods see none", async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const report = await createDamageReport({
      source: 'yard',
      assetId: bin.id,
      customerId: w.customer.id,
      description: 'Forklift tine through the side panel',
      photo: null,
      contactName: null,
      contactEmail: null,
      reportedBy: w.planner.id,
      requesterIp: null,
    });
    await report.delivery;
    const { id } = await openRepair(P(), { damageReportId: report.id, estimatedCost: '150' });
    const v = (await repairOrderById(id))!;
    expect([v.openedFrom, v.customerId, v.fault, v.estimatedMinor, v.proposal.proposed]).toEqual([
      'damage_report',
      w.customer.id,
      'Forklift tine through the side panel',
      15000,
      false,
    ]);
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'quarantine', siteId: w.depot.id });
    await recordRepairWork(Y(), id, work({ cost: '120.50' }));
    await recordRepairWork(Y(), id, work({ cost: '30' }));
    // Not billed before it ends.
    expect(await repairChargesFor(w.customer.id, { from: today(), to: today() })).toEqual([]);
    await recordInspection(me, test_(bin.id, me.id, { kind: 'after_repair', checklist: ok('after_repair') }));
    const charges = await repairChargesFor(w.customer.id, { from: today(), to: today() });
    expect(charges).toEqual([
      expect.objectContaining({ repairOrderId: id, damageReportId: report.id, assetId: bin.id, status: 'closed', amountMinor: 15050, currency: 'EUR', endedOn: today() }),
    ]);
    expect(await repairChargesFor(w.customer.id, { from: '2020-01-01', to: '2020-12-31' })).toEqual([]);
    expect(await repairChargesFor(w.operator.id, { from: today(), to: today() })).toEqual([]);
    // A report already turned into an order is not opened twice.
    expect((await appErrorOf(openRepair(P(), { damageReportId: report.id }))).details).toEqual({ repairOrderId: id });
  });

  test('above the threshold it is proposed for retirement, and retiring ends the order through the retire scan', async () => {
    const bin = await newBin(w);
    const { id } = await openRepair(P(), { assetId: bin.id, fault: 'Frame bent out of square' });
    const stale = (await repairOrderById(id))!;
    const after = await updateRepairOrder({ userId: w.planner.id, ip: null }, id, { version: stale.version, estimatedCost: '450.00' });
    expect([after.estimatedMinor, after.thresholdMinor, after.proposal.proposed]).toEqual([45000, 40000, true]);
    expect((await appErrorOf(updateRepairOrder({ userId: w.planner.id, ip: null }, id, { version: stale.version, estimatedCost: '10' }))).code).toBe('changed_meanwhile');
    expect((await appErrorOf(updateRepairOrder({ userId: w.planner.id, ip: null }, id, { version: after.version, place: 'shop', repairSiteId: w.depot.id }))).code).toBe(
      'validation_failed',
    );
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'quarantine', siteId: w.depot.id });
    const retired = await retireFromRepair(P(), id, { version: after.version, note: 'Beyond economic repair' });
    expect(retired.status).toBe('retired');
    expect((await Asset.findByPk(bin.id))!.status).toBe('retired');
  });
});
