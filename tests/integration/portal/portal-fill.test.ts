// A fill record from the portal against the real database: recorded through the scan service's fill action for a
// bin of the customer's own, refused for another's (nothing recorded), and the receiving site's seal check compares
// with the seal numbers it recorded, as for yard scans (a mismatch flags the discharge and mails the planners).
import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, addSecondCustomer, appErrorOf } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { portalScope, type PortalScope } from '@/lib/portal/portal-scope.server';
import { fillableBins, portalFillPlanner, recentFills, recordPortalFill } from '@/lib/portal/portal-fills.server';
import { fillRecordFields } from '@/lib/portal/portal-forms';
import { Asset, MailMessage, ScanEvent, User } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

process.env.AUTH_SECRET ??= 'test-secret';
process.env.SMTP_HOST = '127.0.0.1';
process.env.SMTP_PORT = '1'; // nobody listens: the outbox still records each attempt
const w = usePoolWorld();
let a: PortalScope;
let b: PortalScope;
let userA: SessionUser;
let userB: SessionUser;
let bin: { id: number; grai: string };

const session = async (id: number): Promise<SessionUser> => {
  const u = (await User.findByPk(id))!;
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    organisationId: u.organisationId,
    organisationName: '',
    homeSiteId: null,
    qualifiedInspector: false,
    siteIds: null,
  };
};

beforeAll(async () => {
  const other = await addSecondCustomer(w);
  userA = await session(w.customerUser.id!);
  userB = await session(other.user.id);
  a = await portalScope(userA);
  b = await portalScope(userB);
  bin = await newBin(w);
  for (const s of [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId: w.customerSite.id },
  ] as const) {
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, ...s });
  }
});

const form = (extra: Record<string, string>) => fillRecordFields.safeParse({ clientEventId: randomUUID(), grai: bin.grai, product: 'Rapeseed oil', ...extra });

describe('a fill record from the portal', () => {
  test('the form wants volume or mass and checks the record as the scan schema does', () => {
    expect(form({}).success).toBe(false);
    const twice = form({ volumeL: '950', seals: 'TE1, TE1' });
    expect(twice.success).toBe(false);
    expect(twice.error?.issues.find((i) => i.path[0] === 'seals')?.message).toMatch(/listed twice/);
    expect(form({ massKg: '9000' }).error?.issues[0]?.message).toBe('The mass is between 0 and 5000 kg.');
    expect(form({ volumeL: '950,5', temperatureC: '21', seals: 'TE1 TE2' }).data).toMatchObject({ volumeL: 950.5, temperatureC: 21, seals: ['TE1', 'TE2'] });
  });

  test('the other customer cannot fill the bin: no such bin of theirs, nothing recorded', async () => {
    const before = await ScanEvent.count({ where: { assetId: bin.id } });
    expect((await fillableBins(b)).map((x) => x.grai)).not.toContain(bin.grai);
    const err = await appErrorOf(recordPortalFill(userB, b, form({ volumeL: '900' }).data!));
    expect(err.code).toBe('not_found');
    expect(await portalFillPlanner(b, bin.grai)).toBeNull();
    expect(await ScanEvent.count({ where: { assetId: bin.id } })).toBe(before);
  });

  test('recorded through the fill action; the fill planner is the order’s; the seal check at discharge compares with it', async () => {
    expect((await portalFillPlanner(a, bin.grai))?.reference).toBe('HO-TEST-1');
    const input = form({ volumeL: '950', massKg: '870', temperatureC: '20', seals: 'TE500, TE501' }).data!;
    const out = await recordPortalFill(userA, a, input);
    expect(out).toMatchObject({ action: 'fill_seal', statusTo: 'on_hire', replayed: false });
    // the same form sent twice (a double tap) records once
    expect(await recordPortalFill(userA, a, input)).toMatchObject({ replayed: true, eventId: out.eventId });
    // a new form for the filled bin: the rule table refuses, nothing recorded
    expect((await appErrorOf(recordPortalFill(userA, a, { ...input, clientEventId: randomUUID() }))).code).toBe('transition_refused');
    expect(await ScanEvent.count({ where: { assetId: bin.id, action: 'fill_seal' } })).toBe(1);
    expect((await Asset.findByPk(bin.id))!.filled).toBe(true);
    expect(await recentFills(a)).toEqual([expect.objectContaining({ grai: bin.grai, product: 'Rapeseed oil', seals: ['TE500', 'TE501'] })]);
    expect(await recentFills(b)).toEqual([]);
    // filled bins are not offered again
    expect((await fillableBins(a)).map((x) => x.grai)).not.toContain(bin.grai);

    const before = await MailMessage.count({ where: { kind: 'seal_mismatch' } });
    const discharge = await recordScanFromClient(userA, {
      clientEventId: randomUUID(),
      assetId: bin.id,
      action: 'discharge',
      siteId: w.customerSite.id,
      sealsVerified: ['TE500', 'TE777'],
    });
    expect(discharge.flags).toContain('seal_mismatch');
    expect(await MailMessage.count({ where: { kind: 'seal_mismatch' } })).toBeGreaterThan(before);
  });
});
