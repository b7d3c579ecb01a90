import bcrypt from 'bcryptjs';
import { Organisation, Site, User, Setting } from '../../../src/models';
import type { Role } from '../../../src/lib/permissions';

/** A minimal world: settings, the operator with one depot, one customer with one site. */
export async function baseWorld() {
  const setting = await Setting.create({
    operatorName: 'Test Pool', gs1CompanyPrefix: '9529999', gs1PrefixLength: 7, digitalLinkBase: 'http://localhost:4321',
    timeZone: 'Europe/Amsterdam', currency: 'EUR', taxRate: '0.2100', mailSender: 'pool@test.example',
  });
  const operator = await Organisation.create({ name: 'Test Pool', kind: 'operator', contactEmail: null });
  const customer = await Organisation.create({ name: 'Test Customer', kind: 'customer', contactEmail: 'c@test.example', freeDays: 14 });
  const depot = await Site.create({ organisationId: operator.id, code: 'DEP-T1', name: 'Test depot', kind: 'depot', address: null, latitude: '51.9', longitude: '4.4' });
  const depot2 = await Site.create({ organisationId: operator.id, code: 'DEP-T2', name: 'Second depot', kind: 'depot', address: null, latitude: '51.4', longitude: '6.7' });
  const customerSite = await Site.create({ organisationId: customer.id, code: 'CUS-T1', name: 'Customer site', kind: 'customer', address: null, latitude: '51.8', longitude: '4.6' });
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
