import bcrypt from 'bcryptjs';
import { Organisation, Site, User, Setting } from '@/models';
import type { Role } from '@/lib/permissions';

/** A minimal world: settings, the operator with one depot, one customer with one site. */
export async function baseWorld() {
  const setting = await Setting.create({
    operatorName: 'Test Pool',
    gs1CompanyPrefix: '9529999',
    gs1PrefixLength: 7,
    digitalLinkBase: 'http://localhost:4321',
    timeZone: 'Europe/Amsterdam',
    currency: 'EUR',
    taxRate: '0.2100',
    mailSender: 'pool@test.example',
  });
  const operator = await Organisation.create({ name: 'Test Pool', kind: 'operator', contactEmail: null });
  const customer = await Organisation.create({ name: 'Test Customer', kind: 'customer', contactEmail: 'c@test.example', freeDays: 14 });
  const depot = await Site.create({ organisationId: operator.id, code: 'DEP-T1', name: 'Test depot', kind: 'depot', address: null, latitude: '51.9', longitude: '4.4' });
  const depot2 = await Site.create({ organisationId: operator.id, code: 'DEP-T2', name: 'Second depot', kind: 'depot', address: null, latitude: '51.4', longitude: '6.7' });
  const customerSite = await Site.create({
    organisationId: customer.id,
    code: 'CUS-T1',
    name: 'Customer site',
    kind: 'customer',
    address: null,
    latitude: '51.8',
    longitude: '4.6',
  });
  return { setting, operator, customer, depot, depot2, customerSite };
}

const HASH = bcrypt.hashSync('test-password', 4);
export async function makeUser(role: Role, organisationId: number, extra: Partial<{ email: string; homeSiteId: number; active: boolean }> = {}) {
  return User.create({
    email: extra.email ?? `${role}-${Math.random().toString(36).slice(2, 8)}@test.example`,
    name: `Test ${role}`,
    passwordHash: HASH,
    role,
    organisationId,
    homeSiteId: extra.homeSiteId ?? null,
    active: extra.active ?? true,
    lastSignInAt: null,
  });
}

import { BinType, LinerLot, HireOrder } from '@/models';
import { registerBin } from '@/lib/bins/bin-register.server';
import { receiveLot } from '@/lib/liners/liner-ledger.server';
import { makeGrai } from '@/lib/gs1';
import { forgetSettings } from '@/lib/settings/settings.server';
import type { Actor } from '@/lib/scans/scan-service.server';

/** baseWorld plus a bin type, a liner lot, a confirmed hire order and one user per role. */
export async function poolWorld() {
  forgetSettings();
  const w = await baseWorld();
  const binType = await BinType.create({
    code: 'T1000',
    name: 'Test bin 1000 L',
    graiAssetType: '10010',
    nominalCapacityL: 1000,
    tareKg: '86',
    maxGrossKg: '1285',
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1160,
    heightFoldedMm: 380,
    unCode: '31HA2',
  });
  const received = await receiveLot(
    { id: null },
    { supplier: 'Test Liners', lotNumber: 'TL-001', spec: 'PE bag', quantity: 100, receivedOn: '2026-01-01', expiryDate: '2028-01-01', siteId: w.depot.id },
    { now: new Date('2026-01-01T09:00:00Z') },
  );
  const lot = (await LinerLot.findByPk(received.lotId))!;
  const order = await HireOrder.create({
    reference: 'HO-TEST-1',
    customerId: w.customer.id,
    deliverySiteId: w.customerSite.id,
    depotSiteId: w.depot.id,
    binTypeId: binType.id,
    quantity: 24,
    neededBy: '2026-12-10',
    status: 'confirmed',
    product: 'Test oil',
    notes: null,
  });
  const planner = await makeUser('planner', w.operator.id);
  const yard = await makeUser('yard', w.operator.id, { homeSiteId: w.depot.id });
  const customerUser = await makeUser('customer', w.customer.id);
  const actor = (u: typeof planner): Actor => ({ id: u.id, role: u.role, organisationId: u.organisationId, homeSiteId: u.homeSiteId });
  return { ...w, binType, lot, order, planner: actor(planner), yard: actor(yard), customerUser: actor(customerUser) };
}

let serialCounter = 0;
export async function newBin(w: Awaited<ReturnType<typeof poolWorld>>, extra: { manufactureMonth?: string; lastIntermediateTestMonth?: string; registeredAt?: string } = {}) {
  serialCounter += 1;
  const grai = makeGrai('9529999', '10010', `T${String(serialCounter).padStart(5, '0')}`);
  return registerBin(
    w.planner,
    {
      grai,
      binTypeId: w.binType.id,
      siteId: w.depot.id,
      manufactureMonth: extra.manufactureMonth ?? '2026-01',
      lastIntermediateTestMonth: extra.lastIntermediateTestMonth ?? null,
    },
    { now: new Date(extra.registeredAt ?? '2026-11-01T08:00:00Z') },
  );
}

import { beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from './db';
import { AppError } from '@/lib/api-errors';

export type PoolWorld = Awaited<ReturnType<typeof poolWorld>>;

/**
 * For a test file: empty tables and a fresh poolWorld() before its tests, the
 * connection closed after them. The returned object reads through to the world
 * once it exists, so tests write `w.depot`, `w.yard`, …
 */
export function usePoolWorld(): PoolWorld {
  let world: PoolWorld | undefined;
  beforeAll(async () => {
    await resetDatabase();
    world = await poolWorld();
  });
  afterAll(async () => {
    await sequelize.close();
  });
  return new Proxy({} as PoolWorld, { get: (_, key) => (world as Record<PropertyKey, unknown> | undefined)?.[key] });
}

/** The AppError a call is refused with (fails the test when it is not refused). */
export async function appErrorOf(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error('expected a refusal');
}

/**
 * A second customer organisation with a site, a confirmed order and a user, beside poolWorld's customer: for the
 * tests that one customer never sees nor touches another's things.
 */
export async function addSecondCustomer(w: PoolWorld) {
  const customer = await Organisation.create({ name: 'Other Customer', kind: 'customer', contactEmail: 'other@test.example', freeDays: 10 });
  const site = await Site.create({ organisationId: customer.id, code: 'OTH-T1', name: 'Other site', kind: 'customer', address: null, latitude: '50.9', longitude: '5.7' });
  const order = await HireOrder.create({
    reference: 'HO-OTHER-1',
    customerId: customer.id,
    deliverySiteId: site.id,
    depotSiteId: w.depot.id,
    binTypeId: w.binType.id,
    quantity: 4,
    neededBy: '2026-12-12',
    status: 'confirmed',
    product: 'Other syrup',
    notes: null,
  });
  const user = await makeUser('customer', customer.id);
  return { customer, site, order, user };
}
