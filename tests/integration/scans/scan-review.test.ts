import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, newBin, makeUser } from '../support/fixtures';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { listFlaggedScans, markReviewed } from '@/lib/scans/scan-review.server';
import { MailMessage, User } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

let w: Awaited<ReturnType<typeof poolWorld>>;
let planner: SessionUser;
beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld();
  const u = await User.findByPk(w.planner.id!);
  planner = {
    id: u!.id,
    email: u!.email,
    name: u!.name,
    role: 'planner',
    organisationId: u!.organisationId,
    organisationName: 'Test Pool',
    homeSiteId: null,
    qualifiedInspector: false,
  };
  process.env.SMTP_HOST = '127.0.0.1';
  process.env.SMTP_PORT = '1'; // nobody listens: the outbox records each attempt
});
afterAll(async () => {
  await sequelize.close();
});

async function toOnHire(assetId: number) {
  const steps: Array<[typeof w.yard, Omit<ScanInput, 'clientEventId' | 'assetId'>]> = [
    [w.yard, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id }],
    [w.yard, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }],
    [w.yard, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id }],
    [w.yard, { action: 'deliver', siteId: w.customerSite.id }],
  ];
  for (const [a, s] of steps) await recordScan(a, { clientEventId: randomUUID(), assetId, ...s });
}

describe('scans to review (story 10: a missed scan)', () => {
  test('a receive that implied missed steps waits for a planner, who confirms it', async () => {
    const bin = await newBin(w);
    await toOnHire(bin.id);
    const out = await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'receive', siteId: w.depot.id });
    const { rows } = await listFlaggedScans();
    const row = rows.find((r) => r.id === out.eventId);
    expect(row).toMatchObject({ action: 'receive', inferred: ['fold', 'collect'], flags: ['inferred_steps'] });
    await markReviewed(planner, out.eventId, '127.0.0.1');
    expect((await listFlaggedScans()).rows.find((r) => r.id === out.eventId)).toBeUndefined();
    await expect(markReviewed(planner, out.eventId, '127.0.0.1')).rejects.toThrow(/not waiting for review/);
  });
});

describe('seal mismatch (story 3): planners are alerted at once', () => {
  test('a discharge with a different seal number mails every planner', async () => {
    await makeUser('planner', w.operator.id, { email: 'another.planner@test.example' });
    const bin = await newBin(w);
    await toOnHire(bin.id);
    const cust = await User.findByPk(w.customerUser.id!);
    const customer: SessionUser = {
      id: cust!.id,
      email: cust!.email,
      name: cust!.name,
      role: 'customer',
      organisationId: cust!.organisationId,
      organisationName: 'Test Customer',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    await recordScanFromClient(customer, {
      clientEventId: randomUUID(),
      assetId: bin.id,
      action: 'fill_seal',
      siteId: w.customerSite.id,
      fill: { product: 'Oil', seals: ['TE500', 'TE501'] },
    });
    const before = await MailMessage.count({ where: { kind: 'seal_mismatch' } });
    const out = await recordScanFromClient(customer, {
      clientEventId: randomUUID(),
      assetId: bin.id,
      action: 'discharge',
      siteId: w.customerSite.id,
      sealsVerified: ['TE500', 'TE777'],
    });
    expect(out.flags).toContain('seal_mismatch');
    const mails = await MailMessage.findAll({ where: { kind: 'seal_mismatch' }, order: [['id', 'ASC']] });
    expect(mails.length - before).toBe(2);
    expect(mails.at(-1)!.textBody).toMatch(/Not found: TE501/);
    expect(mails.at(-1)!.textBody).toMatch(/Unexpected: TE777/);
  });
});
