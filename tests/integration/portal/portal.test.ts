// The customer portal against the real test database: orders placed as drafts and confirmed by the planner, collection
// requests with a ready day and the planned run, damage reports, deliveries confirmed — each strictly the customer's
// own: the second customer neither sees nor touches the first's, and the first cannot act on the second's sites.
import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { usePoolWorld, newBin, addSecondCustomer, appErrorOf } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { startLoad, addBinToLoad, dispatchLoad } from '@/lib/loads/load-service.server';
import { commandOrder } from '@/lib/planning/orders.server';
import { changeRequestStatus } from '@/lib/requests/requests.server';
import { portalScope, type PortalScope } from '@/lib/portal/portal-scope.server';
import { listPortalOrders, placePortalOrder } from '@/lib/portal/portal-orders.server';
import { listPortalCollections, requestCollection, listPortalDamage, reportPortalDamage, damageableBins } from '@/lib/portal/portal-requests.server';
import { confirmFromPortal, portalDeliveries } from '@/lib/portal/portal-deliveries.server';
import { loadPortalHome } from '@/lib/portal/portal-home.server';
import { collectionFields, portalOrderFields } from '@/lib/portal/portal-forms';
import { Asset, HireOrder, MailMessage, Tariff, User } from '@/models';

process.env.AUTH_SECRET ??= 'test-secret';
const w = usePoolWorld();
let other: Awaited<ReturnType<typeof addSecondCustomer>>;
let a: PortalScope;
let b: PortalScope;
const actor = { userId: null, ip: null };
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg==', 'base64');

const scopeOf = async (id: number) => portalScope((await User.findByPk(id))!);

beforeAll(async () => {
  other = await addSecondCustomer(w);
  a = await scopeOf(w.customerUser.id!);
  b = await scopeOf(other.user.id);
  await Tariff.create({
    customerId: w.customer.id,
    freeDays: 14,
    dailyRate: '1.50',
    perTripFee: '20.00',
    lostBinFee: '700.00',
    currency: 'EUR',
    validFrom: '2020-01-01',
    validTo: null,
  });
});

describe('orders from the portal', () => {
  test('a draft for one of their own sites, confirmed by the planner; the other customer sees none of it', async () => {
    const input = portalOrderFields('2026-12-03').parse({
      binTypeId: String(w.binType.id),
      quantity: '6',
      neededBy: '2026-12-20',
      deliverySiteId: String(w.customerSite.id),
      linerFoodContact: 'yes',
      linerMaxFillTempC: '60',
    });
    const placed = await placePortalOrder(a, input, actor);
    expect(placed.status).toBe('draft');
    const row = (await HireOrder.findByPk(placed.id))!;
    expect(row).toMatchObject({
      customerId: w.customer.id,
      deliverySiteId: w.customerSite.id,
      depotSiteId: w.depot.id,
      quantity: 6,
      linerFoodContact: true,
      linerMaxFillTempC: 60,
    });
    expect((await listPortalOrders(a)).map((o) => o.reference)).toContain(placed.reference);
    expect((await listPortalOrders(b)).map((o) => o.reference)).not.toContain(placed.reference);
    expect((await listPortalOrders(a)).map((o) => o.reference)).not.toContain('HO-OTHER-1');

    await commandOrder(placed.id, { command: 'confirm', version: row.version }, actor);
    expect((await listPortalOrders(a)).find((o) => o.id === placed.id)).toMatchObject({ status: 'confirmed', loaded: 0, delivered: 0 });
  });

  test("an order to the other customer's site is refused as no such site, and nothing is stored", async () => {
    const before = await HireOrder.count();
    const input = portalOrderFields('2026-12-03').parse({ binTypeId: String(w.binType.id), quantity: '2', neededBy: '2026-12-20', deliverySiteId: String(other.site.id) });
    expect((await appErrorOf(placePortalOrder(a, input, actor))).code).toBe('not_found');
    expect(await HireOrder.count()).toBe(before);
  });

  test('the form refuses a past day, a day beyond the horizon and a count of nothing, with the reason', () => {
    const form = portalOrderFields('2026-12-03');
    const base = { binTypeId: '1', quantity: '2', neededBy: '2026-12-20', deliverySiteId: '1' };
    expect(form.safeParse({ ...base, neededBy: '2026-12-02' }).error?.issues[0]?.message).toMatch(/passed/);
    expect(form.safeParse({ ...base, neededBy: '2027-06-01' }).error?.issues[0]?.message).toMatch(/within 120 days/);
    expect(form.safeParse({ ...base, quantity: '0' }).error?.issues[0]?.message).toMatch(/At least one/);
    expect(form.safeParse({ ...base, extra: 'x' }).success).toBe(false);
  });
});

describe('collections from the portal', () => {
  test('a request per site with its ready day; the planner plans the run and the customer sees its day; a confirmation mail', async () => {
    const input = collectionFields('2026-12-03').parse({ siteId: String(w.customerSite.id), quantity: '5', readyOn: '2026-12-05', note: 'By gate 2' });
    const created = await requestCollection(a, input, '127.0.0.1');
    await created.delivery;
    const mine = await listPortalCollections(a);
    expect(mine.find((r) => r.id === created.id)).toMatchObject({ source: 'portal', quantity: 5, readyOn: '2026-12-05', plannedFor: null, status: 'open', site: 'Customer site' });
    expect((await listPortalCollections(b)).map((r) => r.id)).not.toContain(created.id);
    const mail = await MailMessage.findOne({ where: { kind: 'collection_confirmation', toAddress: a.email } });
    expect(mail?.subject).toMatch(/5 folded bins at Customer site/);
    expect(mail?.textBody).toMatch(/ready from 5 Dec 2026/);

    const early = await appErrorOf(changeRequestStatus('collection', created.id, { status: 'scheduled', version: 0, plannedFor: '2026-12-04' }, actor));
    expect(early.code).toBe('validation_failed');
    await changeRequestStatus('collection', created.id, { status: 'scheduled', version: 0, plannedFor: '2026-12-07' }, actor);
    expect((await listPortalCollections(a)).find((r) => r.id === created.id)).toMatchObject({ status: 'scheduled', plannedFor: '2026-12-07' });
  });

  test("a request at the other customer's site is refused as no such site", async () => {
    const input = collectionFields('2026-12-03').parse({ siteId: String(other.site.id), quantity: '2', readyOn: '2026-12-05' });
    expect((await appErrorOf(requestCollection(a, input, null))).code).toBe('not_found');
    expect(await listPortalCollections(b)).toEqual([]);
  });
});

describe('deliveries and damage from the portal', () => {
  test("a load on its way is confirmed by its own customer only; its bins are then on hire at their site, in their home page's numbers", async () => {
    const bins = [];
    for (let i = 0; i < 2; i++) {
      const bin = await newBin(w);
      await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
      await recordScan(w.yard, { clientEventId: randomUUID(), assetId: bin.id, action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
      bins.push(bin);
    }
    const load = await startLoad({ ...w.yard, id: w.yard.id! }, { purpose: 'hire', hireOrderId: w.order.id, targetCount: 2 });
    for (const bin of bins) await addBinToLoad(w.yard, load.id, { clientEventId: randomUUID(), assetId: bin.id });
    await dispatchLoad(load.id, { carrier: 'Test Haulage', vehicleRegistration: 'AB-123-C', trailerSeals: [] });

    const onTheWay = (await loadPortalHome(a)).onTheRoad;
    expect(
      onTheWay
        .filter((r) => r.leg === 'outbound')
        .map((r) => r.serial)
        .sort(),
    ).toEqual(bins.map((x) => x.serial).sort());
    expect((await portalDeliveries(a)).map((l) => l.reference)).toContain(load.reference);
    expect(await portalDeliveries(b)).toEqual([]);
    expect((await appErrorOf(confirmFromPortal(b, { reference: load.reference, receivedByName: 'Not theirs' }, null))).code).toBe('not_found');

    const done = await confirmFromPortal(a, { reference: load.reference, receivedByName: 'R. Receiver' }, { bytes: PNG, filename: 'load.png' });
    expect(done).toMatchObject({ delivered: 2, already: false });
    for (const bin of bins) expect(await Asset.findByPk(bin.id)).toMatchObject({ status: 'on_hire', siteId: w.customerSite.id, customerId: w.customer.id });
    const home = await loadPortalHome(a);
    const site = home.sites.find((s) => s.id === w.customerSite.id)!;
    expect(site.bins.map((x) => x.serial).sort()).toEqual(bins.map((x) => x.serial).sort());
    expect(site.bins.every((x) => x.daysOnHire === 0 && x.freeDaysLeft === 14 && !x.overdue)).toBe(true);
    expect((await loadPortalHome(b)).sites.flatMap((s) => s.bins)).toEqual([]);

    // damage on one of them, with a photo; the other customer can neither report on it nor see the report
    expect((await damageableBins(a)).map((x) => x.grai)).toContain(bins[0]!.grai);
    expect(await damageableBins(b)).toEqual([]);
    expect((await appErrorOf(reportPortalDamage(b, { grai: bins[0]!.grai, description: 'Not my bin' }, null, null))).code).toBe('not_found');
    const report = await reportPortalDamage(a, { grai: bins[0]!.grai, description: 'Valve drips when closed' }, { bytes: PNG, filename: 'valve.png' }, null);
    await report.delivery;
    const listed = (await listPortalDamage(a)).find((r) => r.id === report.id);
    expect(listed).toMatchObject({ binSerial: bins[0]!.serial, status: 'open', description: 'Valve drips when closed' });
    expect(listed!.photoId).not.toBeNull();
    expect(await listPortalDamage(b)).toEqual([]);
  });
});

describe('people of the customer', () => {
  test('a portal admin invites a colleague limited to one site; the limited colleague sees only that site, the admin all', async () => {
    const { inviteColleague, listColleagues, setColleagueSites } = await import('@/lib/portal/portal-people.server');
    const { inviteColleagueFields } = await import('@/lib/portal/portal-forms');
    const { Site } = await import('@/models');
    const second = await Site.create({
      organisationId: w.customer.id,
      code: 'CUS-T2',
      name: 'Customer second site',
      kind: 'customer',
      address: null,
      latitude: '51.7',
      longitude: '4.5',
    });
    const adminRow = (await User.findByPk(w.customerUser.id!))!;
    const plain = { ...(await scopeOf(adminRow.id)), role: 'customer' as const, organisationId: w.customer.id, id: adminRow.id };
    const inviter = { userId: adminRow.id, ip: null, name: adminRow.name };

    // Only a portal admin may.
    const input = inviteColleagueFields.parse({ name: 'Site Person', email: 'site.person@test.example', siteIds: String(second.id) });
    expect((await appErrorOf(inviteColleague({ ...plain, portalAdmin: false }, input, inviter))).code).toBe('forbidden');
    const admin = { ...plain, portalAdmin: true };
    // Not with another organisation's site.
    const foreign = inviteColleagueFields.parse({ name: 'Wrong Site', email: 'wrong.site@test.example', siteIds: String(other.site.id) });
    expect((await appErrorOf(inviteColleague(admin, foreign, inviter))).code).toBe('not_found');
    expect(await User.count({ where: { email: 'wrong.site@test.example' } })).toBe(0);

    const { id } = await inviteColleague(admin, input, inviter);
    const invited = (await User.findByPk(id))!;
    expect(invited).toMatchObject({ role: 'customer', organisationId: w.customer.id, passwordHash: null, portalAdmin: false });
    expect(await MailMessage.count({ where: { kind: 'invite', toAddress: 'site.person@test.example' } })).toBe(1);
    const listed = (await listColleagues(admin)).find((c) => c.id === id)!;
    expect(listed).toMatchObject({ invited: true, siteIds: [second.id] });

    // The limited colleague's scope: the second site only; the first site's bins, orders and requests are not theirs.
    const limited = await portalScope({ id, name: invited.name, email: invited.email, organisationId: w.customer.id, role: 'customer', siteIds: [second.id] });
    expect((await loadPortalHome(limited)).sites.map((s) => s.id)).toEqual([second.id]);
    expect((await listPortalOrders(limited)).length).toBe(0);
    expect((await listPortalCollections(limited)).length).toBe(0);
    expect(await damageableBins(limited)).toEqual([]);
    const atFirst = collectionFields('2026-12-03').parse({ siteId: String(w.customerSite.id), quantity: '2', readyOn: '2026-12-05' });
    expect((await appErrorOf(requestCollection(limited, atFirst, null))).code).toBe('not_found');
    expect((await listPortalOrders(a)).length).toBeGreaterThan(0);

    // Widening: no site ticked = every site; the admin cannot limit themselves; nobody outside the organisation.
    await setColleagueSites(admin, { userId: id, siteIds: [] }, actor);
    expect((await listColleagues(admin)).find((c) => c.id === id)!.siteIds).toEqual([]);
    expect((await appErrorOf(setColleagueSites(admin, { userId: admin.id, siteIds: [second.id] }, actor))).code).toBe('unprocessable');
    expect((await appErrorOf(setColleagueSites(admin, { userId: other.user.id, siteIds: [] }, actor))).code).toBe('not_found');
  });

  test("the database refuses a site limit naming another organisation's site", async () => {
    const { sqlErrorCode } = await import('../support/db');
    expect(await sqlErrorCode('INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)', [w.customerUser.id, other.site.id])).toBe('23514');
  });
});
