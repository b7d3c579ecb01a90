// The scanner takes back their own scan: a void with the set reason, only
// theirs, only within the undo window, only while nothing later is on the bin.
import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { undoOwnScan } from '@/lib/scans/scan-corrections.server';
import { UNDO_REASON } from '@/lib/scans/undo-window';
import { AuditEntry, ScanEvent, User, Asset } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

const w = usePoolWorld();

async function sessionOf(id: number): Promise<SessionUser> {
  const u = (await User.findByPk(id))!;
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    organisationId: u.organisationId,
    organisationName: 'Test Pool',
    homeSiteId: u.homeSiteId,
    qualifiedInspector: false,
  };
}
const prep = (assetId: number) => recordScan(w.yard, { clientEventId: randomUUID(), assetId, action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });

describe('undo by the person who scanned', () => {
  test('within the window: a void with the set reason; the bin is back where it was; audited', async () => {
    const bin = await newBin(w);
    const out = await prep(bin.id);
    expect(out.statusTo).toBe('available'); // checked, still folded: ready for a liner
    expect((await Asset.findByPk(bin.id))!.prepChecked).toBe(true);
    const state = await undoOwnScan(await sessionOf(w.yard.id!), out.eventId, '192.0.2.9');
    expect(state.status).toBe('available');
    const ev = (await ScanEvent.findByPk(out.eventId))!;
    expect(ev.voidReason).toBe(UNDO_REASON);
    expect(ev.voidedBy).toBe(w.yard.id);
    expect((await Asset.findByPk(bin.id))!.prepChecked).toBe(false);
    expect(await AuditEntry.findOne({ where: { action: 'scan.void', entityId: String(out.eventId) } })).toMatchObject({ userId: w.yard.id, after: { voidReason: UNDO_REASON } });
  });

  test('someone else’s scan is not theirs to undo', async () => {
    const bin = await newBin(w);
    const out = await prep(bin.id);
    await expect(undoOwnScan(await sessionOf(w.planner.id!), out.eventId, null)).rejects.toMatchObject({ code: 'not_found' });
    expect((await ScanEvent.findByPk(out.eventId))!.voidedAt).toBeNull();
  });

  test('after the window (30 s by default) it is refused and nothing changes', async () => {
    const bin = await newBin(w);
    const out = await prep(bin.id);
    await expect(undoOwnScan(await sessionOf(w.yard.id!), out.eventId, null, new Date(Date.now() + 31_000))).rejects.toMatchObject({ code: 'unprocessable' });
    expect((await Asset.findByPk(bin.id))!.prepChecked).toBe(true);
  });

  test('once something later is recorded on the bin it is refused', async () => {
    const bin = await newBin(w);
    const first = await prep(bin.id);
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
    await expect(undoOwnScan(await sessionOf(w.yard.id!), first.eventId, null)).rejects.toMatchObject({ code: 'conflict' });
    expect((await ScanEvent.findByPk(first.eventId))!.voidedAt).toBeNull();
  });
});
