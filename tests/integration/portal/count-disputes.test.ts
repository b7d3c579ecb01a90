// The monthly count against the real database: a customer confirms a site's bins with one missing and one not on the
// list; the difference becomes a dispute the planner settles bin by bin — "lost" through the scan service (so a
// refusal there settles nothing), "found" for a missing bin seen again marks it found there — each recorded with who
// and when; the loss-control figures count the result. The other customer neither sees nor counts the first's site.
import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, addSecondCustomer, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan } from '@/lib/scans/scan-service.server';
import { portalScope, type PortalScope } from '@/lib/portal/portal-scope.server';
import { countOverview, countSheet, submitCount } from '@/lib/portal/site-counts.server';
import { countDispute, countLossFigures, listCounts, resolveLine } from '@/lib/portal/count-disputes.server';
import { Asset, User } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

process.env.AUTH_SECRET ??= 'test-secret';
const w = usePoolWorld();
let a: PortalScope;
let b: PortalScope;
let planner: SessionUser;
let other: Awaited<ReturnType<typeof addSecondCustomer>>;
const bins: Array<{ id: number; grai: string; serial: string }> = [];
let stray: { id: number; grai: string };
const DEC = new Date('2026-12-03T10:00:00Z');
const actor = { userId: null, ip: '127.0.0.1' };

async function onHire() {
  const bin = await newBin(w, { registeredAt: '2026-11-01T08:00:00Z' });
  const steps = [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId: w.customerSite.id },
  ] as const;
  let i = 0;
  for (const s of steps) {
    await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, occurredAt: new Date(Date.parse('2026-11-20T08:00:00Z') + i++ * 60_000), ...s }, { now: DEC });
  }
  return bin;
}

const scopeOf = async (id: number) => portalScope((await User.findByPk(id))!);
const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

beforeAll(async () => {
  other = await addSecondCustomer(w);
  a = await scopeOf(w.customerUser.id!);
  b = await scopeOf(other.user.id);
  const p = (await User.findByPk(w.planner.id!))!;
  planner = {
    id: p.id,
    email: p.email,
    name: p.name,
    role: 'planner',
    organisationId: p.organisationId,
    organisationName: 'Test Pool',
    homeSiteId: null,
    qualifiedInspector: false,
  };
  for (let i = 0; i < 3; i++) bins.push(await onHire());
  stray = await newBin(w); // standing at the depot: not on the customer's list
});

describe('a customer confirms the monthly count', () => {
  test('the site is due; the list is the bins standing there', async () => {
    const overview = await countOverview(a, '2026-12-03');
    expect(overview.sites).toEqual([expect.objectContaining({ standing: 'due', binsNow: 3, thisMonth: null })]);
    const sheet = await countSheet(a, w.customerSite.id, '2026-12-03');
    expect(sheet.bins.map((x) => x.grai)).toEqual(bins.map((x) => x.grai).sort());
    // past the grace days of the month, without a count: overdue
    expect((await countOverview(a, '2026-12-09')).sites[0]!.standing).toBe('overdue');
  });

  test("the other customer gets 'no such site' for it, and can count nothing there", async () => {
    expect((await appErrorOf(countSheet(b, w.customerSite.id))).code).toBe('not_found');
    expect((await appErrorOf(submitCount(b, w.customerSite.id, { counted: [bins[0]!.grai], method: 'ticked' }, DEC))).code).toBe('not_found');
    expect(await q('SELECT id FROM site_counts')).toEqual([]);
  });

  test('a text that is neither a listed serial nor a GRAI is refused, and nothing is stored', async () => {
    const err = await appErrorOf(submitCount(a, w.customerSite.id, { counted: [bins[0]!.serial, 'not-a-bin!'], method: 'scanned' }, DEC));
    expect(err.code).toBe('validation_failed');
    expect(await q('SELECT id FROM site_counts')).toEqual([]);
  });

  test('one bin not seen and one not on the list: a dispute with two lines; a second count of the month is refused', async () => {
    // ticked by serial and by GRAI, one of the list left out, and the depot's bin scanned at the site
    const made = await submitCount(a, w.customerSite.id, { counted: [bins[0]!.serial, bins[1]!.grai, stray.grai], method: 'scanned' }, DEC);
    expect(made).toMatchObject({ status: 'disputed', missing: 1, unexpected: 1 });
    const [row] = await q<{ month: string; expected: number; confirmed: number; method: string }>(
      'SELECT month, cardinality(expected_grais) AS expected, cardinality(confirmed_grais) AS confirmed, method FROM site_counts WHERE id = $1',
      [made.id],
    );
    expect(row).toEqual({ month: '2026-12', expected: 3, confirmed: 3, method: 'scanned' });
    const lines = await q<{ grai: string; kind: string; asset_id: number }>('SELECT grai, kind, asset_id FROM site_count_lines WHERE count_id = $1 ORDER BY kind', [made.id]);
    expect(lines).toEqual([
      { grai: bins[2]!.grai, kind: 'missing', asset_id: bins[2]!.id },
      { grai: stray.grai, kind: 'unexpected', asset_id: stray.id },
    ]);
    expect((await appErrorOf(submitCount(a, w.customerSite.id, { counted: [], method: 'ticked' }, DEC))).code).toBe('conflict');
    const sheet = await countSheet(a, w.customerSite.id, '2026-12-03');
    expect(sheet.standing).toBe('counted');
    expect(sheet.counted?.lines.map((l) => [l.kind, l.resolution])).toEqual([
      ['missing', null],
      ['unexpected', null],
    ]);
    expect((await listCounts('open')).map((c) => c.id)).toEqual([made.id]);
  });
});

describe('the planner settles the dispute bin by bin', () => {
  const lineOf = async (grai: string) => (await countDispute((await listCounts('all'))[0]!.id)).lines.find((l) => l.grai === grai)!;

  test('a resolution that does not fit the line is refused by the rule, and nothing is recorded', async () => {
    const missing = await lineOf(bins[2]!.grai);
    const unexpected = await lineOf(stray.grai);
    const c = (await listCounts('all'))[0]!.id;
    const moved = await appErrorOf(resolveLine(planner, c, missing.id, { resolution: 'moved', movedToSiteId: null, note: null, version: missing.version }, actor, DEC));
    expect(moved).toMatchObject({ code: 'unprocessable', message: 'Say where the bin was moved to.' });
    const lost = await appErrorOf(resolveLine(planner, c, unexpected.id, { resolution: 'lost', movedToSiteId: null, note: null, version: unexpected.version }, actor, DEC));
    expect(lost.code).toBe('unprocessable');
    const stale = await appErrorOf(resolveLine(planner, c, missing.id, { resolution: 'found', movedToSiteId: null, note: null, version: missing.version + 1 }, actor, DEC));
    expect(stale.code).toBe('changed_meanwhile');
    expect((await lineOf(bins[2]!.grai)).resolution).toBeNull();
    expect((await Asset.findByPk(bins[2]!.id))!.status).toBe('on_hire');
  });

  test('"lost" marks the bin missing through the scan service; "moved" records where; then the count is settled', async () => {
    const c = (await listCounts('all'))[0]!.id;
    const missing = await lineOf(bins[2]!.grai);
    const out = await resolveLine(
      planner,
      c,
      missing.id,
      { resolution: 'lost', movedToSiteId: null, note: 'Not at the site, not at the depot', version: missing.version },
      actor,
      DEC,
    );
    expect(out.countStatus).toBe('disputed');
    expect(out.line).toMatchObject({ resolution: 'lost', resolvedBy: planner.name, note: 'Not at the site, not at the depot' });
    expect((await Asset.findByPk(bins[2]!.id))!.status).toBe('missing');
    const [event] = await q<{ id: number; action: string; user_id: number; note: string }>(
      `SELECT id::int, action, user_id, payload->>'note' AS note FROM scan_events WHERE asset_id = $1 AND action = 'mark_missing'`,
      [bins[2]!.id],
    );
    expect(event).toMatchObject({ action: 'mark_missing', user_id: planner.id });
    expect(out.line.scanEventId).toBe(event!.id);
    // settled stands: a second resolution of the same bin is refused
    expect((await appErrorOf(resolveLine(planner, c, missing.id, { resolution: 'found', movedToSiteId: null, note: null, version: out.line.version }, actor, DEC))).code).toBe(
      'conflict',
    );

    const unexpected = await lineOf(stray.grai);
    const moved = await resolveLine(planner, c, unexpected.id, { resolution: 'moved', movedToSiteId: w.depot2.id, note: null, version: unexpected.version }, actor, DEC);
    expect(moved.line).toMatchObject({ resolution: 'moved', movedTo: 'Second depot', scanEventId: null });
    expect(moved.countStatus).toBe('resolved');
    expect((await listCounts('open')).map((x) => x.id)).toEqual([]);
    const audit = await q<{ action: string }>(`SELECT action FROM audit_entries WHERE entity_type = 'site_count_line' ORDER BY id`);
    expect(audit.map((x) => x.action)).toEqual(['count.resolve', 'count.resolve']);
    // the customer sees how each difference was settled
    const sheet = await countSheet(a, w.customerSite.id, '2026-12-03');
    expect(sheet.counted?.status).toBe('resolved');
    expect(sheet.counted?.lines.map((l) => [l.resolution, l.movedTo])).toEqual([
      ['lost', null],
      ['moved', 'Second depot'],
    ]);
  });

  test('next month the lost bin is seen at the site: "found" records it found there through the scan service', async () => {
    const JAN = new Date('2027-01-04T10:00:00Z');
    const made = await submitCount(a, w.customerSite.id, { counted: [bins[0]!.grai, bins[1]!.grai, bins[2]!.grai], method: 'ticked' }, JAN);
    expect(made).toMatchObject({ status: 'disputed', missing: 0, unexpected: 1 });
    const line = (await countDispute(made.id)).lines[0]!;
    expect(line).toMatchObject({ grai: bins[2]!.grai, kind: 'unexpected' });
    const out = await resolveLine(planner, made.id, line.id, { resolution: 'found', movedToSiteId: null, note: null, version: line.version }, actor, JAN);
    expect(out.countStatus).toBe('resolved');
    const bin = (await Asset.findByPk(bins[2]!.id))!;
    expect(bin.status).not.toBe('missing');
    expect(bin.siteId).toBe(w.customerSite.id);
    expect(out.line.scanEventId).not.toBeNull();
  });

  test('a "lost" the scan service refuses settles nothing', async () => {
    // a bin of the list that a planner marked missing meanwhile: marking it missing again is refused
    const bin = await onHire();
    const FEB = new Date('2027-02-02T10:00:00Z');
    const made = await submitCount(a, w.customerSite.id, { counted: bins.map((x) => x.grai), method: 'ticked' }, FEB);
    await recordScan(w.planner, { clientEventId: randomUUID(), assetId: bin.id, action: 'mark_missing', siteId: null }, { now: FEB });
    const line = (await countDispute(made.id)).lines.find((l) => l.grai === bin.grai)!;
    const err = await appErrorOf(resolveLine(planner, made.id, line.id, { resolution: 'lost', movedToSiteId: null, note: null, version: line.version }, actor, FEB));
    expect(err.code).toBe('transition_refused');
    expect((await countDispute(made.id)).lines.find((l) => l.id === line.id)!.resolution).toBeNull();
  });

  test('the loss-control figures count what the counts settled', async () => {
    const figures = await countLossFigures({ from: '2026-01-01', to: '2027-12-31' }, 'Europe/Amsterdam');
    expect(figures).toEqual({ lost: 1, found: 1, moved: 1, open: 1 });
    // a window that ends before the first settlement counts none of them
    expect(await countLossFigures({ from: '2026-01-01', to: '2026-12-02' }, 'Europe/Amsterdam')).toEqual({ lost: 0, found: 0, moved: 0, open: 1 });
  });
});
