import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, newBin, makeUser } from '../support/fixtures';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { flagCountsByKind, listFlaggedScans, markReviewed, reviewFlaggedScans } from '@/lib/scans/scan-review.server';
import { Asset, Site } from '@/models';
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

describe('the queue in bulk: filters, then many confirmed or voided at once, each on its own record', () => {
  /** A bin on hire that is received at `siteId` with its fold and collect missed: one flagged receive. */
  async function flaggedReceive(siteId: number, daysAgo = 0) {
    const bin = await newBin(w);
    await toOnHire(bin.id);
    const out = await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'receive', siteId });
    // An old flag: only the queue's age filter reads the moment, so it is moved back in place.
    if (daysAgo) await sequelize.query(`UPDATE scan_events SET occurred_at = now() - make_interval(days => $2) WHERE id = $1`, { bind: [out.eventId, daysAgo] });
    return { bin, eventId: out.eventId };
  }
  const ids = async (filter: Parameters<typeof listFlaggedScans>[0]) => (await listFlaggedScans(filter)).rows.map((r) => r.id);

  test('by depot, kind and age; the count per kind is the length of the list it opens', async () => {
    const other = await Site.create({ organisationId: w.operator.id, code: 'DEP-T9', name: 'Other depot', kind: 'depot', address: null });
    const here = await flaggedReceive(w.depot.id);
    const there = await flaggedReceive(other.id);
    const old = await flaggedReceive(w.depot.id, 40);
    expect(await ids({ depotId: other.id })).toEqual([there.eventId]);
    const atDepot = await ids({ depotId: w.depot.id });
    expect(atDepot).toEqual(expect.arrayContaining([here.eventId, old.eventId]));
    expect(atDepot).not.toContain(there.eventId);
    expect(await ids({ depotId: w.depot.id, age: 'older' })).toEqual([old.eventId]);
    expect(await ids({ depotId: w.depot.id, age: 'today' })).toContain(here.eventId);
    expect(await ids({ depotId: w.depot.id, age: 'today' })).not.toContain(old.eventId);
    expect(await ids({ kind: 'seal_mismatch', depotId: other.id })).toEqual([]);
    const counts = await flagCountsByKind({ depotId: w.depot.id });
    expect(counts.inferred_steps).toBe((await listFlaggedScans({ depotId: w.depot.id, kind: 'inferred_steps' })).total);
    expect(counts.inferred_steps).toBe((await listFlaggedScans({ depotId: w.depot.id })).total);
  });

  test('confirm two and void two with one reason; a scan decided meanwhile is reported and the rest go through', async () => {
    const a = await flaggedReceive(w.depot.id);
    const b = await flaggedReceive(w.depot.id);
    const c = await flaggedReceive(w.depot.id);
    const d = await flaggedReceive(w.depot.id);
    const confirmed = await reviewFlaggedScans(planner, { ids: [a.eventId, b.eventId], decision: 'confirm' }, '127.0.0.1');
    expect(confirmed).toEqual({
      outcomes: [
        { id: a.eventId, ok: true },
        { id: b.eventId, ok: true },
      ],
      summary: '2 scans confirmed.',
    });
    const voided = await reviewFlaggedScans(planner, { ids: [c.eventId, a.eventId, d.eventId], decision: 'void', reason: 'Labels swapped at the gate' }, '127.0.0.1');
    expect(voided.outcomes).toEqual([
      { id: c.eventId, ok: true },
      { id: a.eventId, ok: false, message: 'This scan is not waiting for review (already reviewed or voided).' },
      { id: d.eventId, ok: true },
    ]);
    expect(voided.summary).toBe('2 scans voided; 1 scan could not be: see each row.');
    // Each void rebuilt its bin: back on hire at the customer, the receive and its inferred steps kept and voided.
    for (const x of [c, d]) {
      expect((await Asset.findByPk(x.bin.id))!.status).toBe('on_hire');
      const [v] = await sequelize.query<{ n: number; reason: string }>(
        `SELECT count(*)::int AS n, max(void_reason) AS reason FROM scan_events WHERE asset_id = $1 AND voided_at IS NOT NULL`,
        { bind: [x.bin.id], type: 'SELECT' as never },
      );
      expect(v).toEqual({ n: 3, reason: 'Labels swapped at the gate' });
    }
    expect((await Asset.findByPk(a.bin.id))!.status).toBe('available');
    const audit = await sequelize.query<{ action: string; n: number }>(
      `SELECT action, count(*)::int AS n FROM audit_entries WHERE entity_type = 'scan_event' AND entity_id = ANY($1::text[]) GROUP BY action ORDER BY action`,
      { bind: [[a, b, c, d].map((x) => String(x.eventId))], type: 'SELECT' as never },
    );
    expect(audit).toEqual([
      { action: 'scan.review', n: 2 },
      { action: 'scan.void', n: 2 },
    ]);
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
