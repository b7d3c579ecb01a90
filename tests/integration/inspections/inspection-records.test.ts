// Recording inspections through the scan service on the real test database: a pass moves only the clocks its
// test covers (ADR 6.5.4.4.1–2) and the log re-derives it; a fail quarantines; the leakproofness minimum
// (6.5.6.7.3) and the inspector's qualification are enforced; records are amended, never edited.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf, makeUser } from '../support/fixtures';
import { sequelize } from '../support/db';
import { Asset, User } from '@/models';
import { recordInspection, amendInspection, inspectionById, inspectionsOfBin } from '@/lib/inspections/inspection-records.server';
import { CHECKLIST, type InspectionDraft } from '@/lib/inspections/inspection-form';
import { replayState } from '@/lib/scans/event-replay';

const w = usePoolWorld();
const NOW = new Date('2026-12-03T10:00:00Z');
const ok = (kind: InspectionDraft['kind']) => Object.fromEntries(CHECKLIST[kind].map((i) => [i.key, true]));

async function inspector() {
  const u = await makeUser('yard', w.operator.id, { homeSiteId: w.depot.id });
  await User.update({ qualifiedInspector: true, name: 'Jana de Vries' }, { where: { id: u.id } });
  return { id: u.id, role: u.role, organisationId: u.organisationId, homeSiteId: u.homeSiteId };
}

function draft(assetId: number, inspectorId: number, over: Partial<InspectionDraft & { siteId: number | null }> = {}) {
  return {
    clientEventId: randomUUID(),
    assetId,
    siteId: w.depot.id,
    kind: 'intermediate' as const,
    performedOn: '2026-12-03',
    checklist: ok('intermediate'),
    leakTest: { pressureKpa: 22, minutes: 10, passed: true },
    outcome: 'pass' as const,
    inspectorId,
    inspectionBody: null,
    remarks: null,
    ...over,
  };
}

async function replayed(assetId: number) {
  const events = await sequelize.query<{ occurred_at: Date; inferred: boolean; voided_at: Date | null; payload: never }>(
    'SELECT occurred_at, inferred, voided_at, payload FROM scan_events WHERE asset_id = $1 ORDER BY occurred_at, id',
    { bind: [assetId], type: QueryTypes.SELECT },
  );
  return replayState(events.map((e) => ({ occurredAt: e.occurred_at, inferred: e.inferred, voided: e.voided_at !== null, payload: e.payload })));
}

describe('recording an inspection', () => {
  test('a 2.5-year pass with its leakproofness test restarts only the 2.5-year clock; the log re-derives it', async () => {
    const me = await inspector();
    // Made 2024-01: 2.5-year due 2026-07-31 (lapsed), 5-year due 2029-01-31.
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    expect(bin.nextDue).toBe('2026-07-31');
    const out = await recordInspection(me, draft(bin.id, me.id), { now: NOW });
    // 2026-12 + 30 months = 2029-06 → 2029-06-30; the 5-year date stays 2029-01-31 and is now next.
    expect([out.nextIntermediateDue, out.nextFullDue, out.nextDue]).toEqual(['2029-06-30', '2029-01-31', '2029-01-31']);
    expect(out.testMark).toBe('12 26 · JDV');
    expect(out.scan.statusTo).toBe('available');
    const a = (await Asset.findByPk(bin.id))!;
    expect([a.lastLeakTestOn, a.lastFullInspectionOn, a.lastInspectionOn, a.nextIntermediateDue, a.nextFullDue, a.nextDue]).toEqual([
      '2026-12-03',
      null,
      '2026-12-03',
      '2029-06-30',
      '2029-01-31',
      '2029-01-31',
    ]);
    const s = await replayed(bin.id);
    expect(s.schedule).toEqual({
      lastInspectionOn: '2026-12-03',
      lastLeakTestOn: '2026-12-03',
      lastFullInspectionOn: null,
      nextIntermediateDue: '2029-06-30',
      nextFullDue: '2029-01-31',
      nextDue: '2029-01-31',
    });
    expect(s.status).toBe(a.status);
    const rec = (await inspectionById(out.inspectionId))!;
    expect(rec).toMatchObject({
      kind: 'intermediate',
      outcome: 'pass',
      inspectorName: 'Jana de Vries',
      leakTest: { pressureKpa: 22, minutes: 10, passed: true },
      testMark: '12 26 · JDV',
    });
  });

  test('a 5-year inspection without a leakproofness test restarts only the 5-year clock', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2021-12', lastIntermediateTestMonth: '2024-06' }); // 2.5-year due 2026-12-31
    const out = await recordInspection(me, draft(bin.id, me.id, { kind: 'full', checklist: ok('full'), leakTest: null }), { now: NOW });
    // 5-year: 2026-12 + 60 = 2031-12 → 2031-12-31; 2.5-year still 2024-06 + 30 = 2026-12 → 2026-12-31.
    expect([out.nextIntermediateDue, out.nextFullDue, out.nextDue]).toEqual(['2026-12-31', '2031-12-31', '2026-12-31']);
    expect(out.restarted).toEqual({ intermediate: false, full: true });
  });

  test('a fail quarantines the bin and moves no date', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const out = await recordInspection(
      me,
      draft(bin.id, me.id, { outcome: 'fail', leakTest: { pressureKpa: 20, minutes: 10, passed: false }, remarks: 'Leaks at the valve seat' }),
      { now: NOW },
    );
    expect(out.scan.statusTo).toBe('quarantine');
    const a = (await Asset.findByPk(bin.id))!;
    expect([a.status, a.nextDue]).toEqual(['quarantine', '2026-07-31']);
    expect((await replayed(bin.id)).status).toBe('quarantine');
  });

  test('less than the leakproofness minimum is refused and changes nothing', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const err = await appErrorOf(recordInspection(me, draft(bin.id, me.id, { leakTest: { pressureKpa: 15, minutes: 10, passed: true } }), { now: NOW }));
    expect(err.code).toBe('validation_failed');
    expect(err.message).toMatch(/at least 20 kPa/);
    const err2 = await appErrorOf(recordInspection(me, draft(bin.id, me.id, { leakTest: { pressureKpa: 25, minutes: 8, passed: true } }), { now: NOW }));
    expect(err2.message).toMatch(/at least 10 minutes/);
    expect((await Asset.findByPk(bin.id))!.nextDue).toBe('2026-07-31');
    expect(await inspectionsOfBin(bin.id)).toEqual([]);
  });

  test('the inspector must be flagged qualified, or an outside body named', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const plain = await makeUser('yard', w.operator.id);
    const err = await appErrorOf(recordInspection(me, draft(bin.id, plain.id), { now: NOW }));
    expect(err.message).toMatch(/qualified inspector/);
    const out = await recordInspection(w.planner as typeof me, draft(bin.id, null as unknown as number, { inspectorId: null, inspectionBody: 'North Test House', siteId: null }), {
      now: NOW,
    });
    expect(out.testMark).toBe('12 26 · North Test House');
  });

  test('the database refuses an edit or a deletion; a correction is an amendment with a reason', async () => {
    const me = await inspector();
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const out = await recordInspection(me, draft(bin.id, me.id, { remarks: 'ok' }), { now: NOW });
    await expect(sequelize.query('UPDATE inspections SET notes = $2 WHERE id = $1', { bind: [out.inspectionId, 'changed'] })).rejects.toThrow(/never edited/);
    await expect(sequelize.query('DELETE FROM inspections WHERE id = $1', { bind: [out.inspectionId] })).rejects.toThrow(/never deleted/);
    expect((await appErrorOf(amendInspection(me, out.inspectionId, { reason: 'x', remarks: 'y' }))).code).toBe('validation_failed');
    const amended = await amendInspection(
      me,
      out.inspectionId,
      { reason: 'Pressure was misread', leakTest: { pressureKpa: 24, minutes: 12, passed: true }, remarks: 'Gauge re-read' },
      { now: NOW },
    );
    expect(amended).toMatchObject({ id: out.inspectionId, leakTest: { pressureKpa: 24, minutes: 12, passed: true }, remarks: 'Gauge re-read' });
    expect(amended.amendments.map((a) => a.reason)).toEqual(['Pressure was misread']);
    // What decided the due dates cannot be amended away.
    const e = await appErrorOf(amendInspection(me, out.inspectionId, { reason: 'No test done really', leakTest: null }));
    expect(JSON.stringify(e.details)).toMatch(/void the inspection/);
    const e2 = await appErrorOf(amendInspection(me, out.inspectionId, { reason: 'Typo in pressure', leakTest: { pressureKpa: 12, minutes: 12, passed: true } }));
    expect(e2.message).toMatch(/at least 20 kPa/);
  });
});
