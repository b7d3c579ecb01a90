import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld, makeUser } from '../support/fixtures';
import { listPeople, updatePerson, personById } from '@/lib/accounts/people.server';
import { loadSessionUser } from '@/lib/accounts/session-user.server';
import { AuditEntry, type User } from '@/models';

const SID = '00000000-0000-4000-8000-000000000001';

let world: Awaited<ReturnType<typeof baseWorld>>;
let admin: User;
const actor = () => ({ userId: admin.id, ip: '203.0.113.5' });

beforeAll(async () => {
  await resetDatabase();
  world = await baseWorld();
  admin = await makeUser('admin', world.operator.id, { email: 'chief@test.example' });
});
afterAll(async () => {
  await sequelize.close();
});

async function lastAudit(entityId: number) {
  return AuditEntry.findOne({ where: { entityType: 'user', entityId: String(entityId) }, order: [['id', 'DESC']] });
}

describe('the people list', () => {
  test('staff first, then customers; organisation, depot and status fields filled', async () => {
    await makeUser('customer', world.customer.id, { email: 'aaa-customer@test.example' });
    await makeUser('yard', world.operator.id, { email: 'zz-yard@test.example', homeSiteId: world.depot.id });
    const people = await listPeople();
    const kinds = people.map((p) => p.organisationKind);
    expect(kinds.indexOf('customer')).toBeGreaterThan(kinds.lastIndexOf('operator'));
    const yard = people.find((p) => p.email === 'zz-yard@test.example')!;
    expect(yard).toMatchObject({ role: 'yard', homeSiteName: 'Test depot', organisationName: 'Test Pool', hasPassword: true, inviteExpiresAt: null });
  });
});

describe('changing a person', () => {
  test('role change writes an audit entry with only what changed, who and from where', async () => {
    const p = await makeUser('planner', world.operator.id);
    const updated = await updatePerson(p.id, { version: p.version, role: 'admin' }, actor());
    expect(updated).toMatchObject({ role: 'admin', version: p.version + 1 });
    const entry = await lastAudit(p.id);
    expect(entry).toMatchObject({ action: 'user.update', userId: admin.id, ip: '203.0.113.5', before: { role: 'planner' }, after: { role: 'admin' } });
  });

  test('home depot and inspector flag', async () => {
    const p = await makeUser('yard', world.operator.id, { homeSiteId: world.depot.id });
    const a = await updatePerson(p.id, { version: 0, homeSiteId: world.depot2.id, qualifiedInspector: true }, actor());
    expect(a).toMatchObject({ homeSiteId: world.depot2.id, homeSiteName: 'Second depot', qualifiedInspector: true });
    expect(await lastAudit(p.id)).toMatchObject({
      before: { homeSiteId: world.depot.id, qualifiedInspector: false },
      after: { homeSiteId: world.depot2.id, qualifiedInspector: true },
    });
    await expect(updatePerson(p.id, { version: a.version, homeSiteId: world.customerSite.id }, actor())).rejects.toMatchObject({ code: 'validation_failed' });
    await expect(updatePerson(p.id, { version: a.version, homeSiteId: null }, actor())).rejects.toMatchObject({
      code: 'validation_failed',
      details: [expect.objectContaining({ path: 'homeSiteId' })],
    });
  });

  test('a stale copy is refused (409 changed_meanwhile) and changes nothing', async () => {
    const p = await makeUser('planner', world.operator.id);
    await updatePerson(p.id, { version: 0, qualifiedInspector: true }, actor());
    await expect(updatePerson(p.id, { version: 0, role: 'yard', homeSiteId: world.depot.id }, actor())).rejects.toMatchObject({ code: 'changed_meanwhile' });
    expect((await personById(p.id)).role).toBe('planner');
  });

  test('an admin cannot deactivate or demote themselves', async () => {
    await expect(updatePerson(admin.id, { version: admin.version, active: false }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
    await expect(updatePerson(admin.id, { version: admin.version, role: 'planner' }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
    const me = await personById(admin.id);
    expect(me).toMatchObject({ role: 'admin', active: true });
    // …but may change their own other details
    await expect(updatePerson(admin.id, { version: me.version, qualifiedInspector: true }, actor())).resolves.toMatchObject({ qualifiedInspector: true });
  });

  test('a role does not cross between staff and customer; customers get no depot or inspector flag', async () => {
    const c = await makeUser('customer', world.customer.id);
    await expect(updatePerson(c.id, { version: 0, role: 'planner' }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
    await expect(updatePerson(c.id, { version: 0, qualifiedInspector: true }, actor())).rejects.toMatchObject({ code: 'validation_failed' });
    await expect(updatePerson(c.id, { version: 0, homeSiteId: world.depot.id }, actor())).rejects.toMatchObject({ code: 'validation_failed' });
    const s = await makeUser('planner', world.operator.id);
    await expect(updatePerson(s.id, { version: 0, role: 'customer' }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
  });

  test('deactivation ends the session at the next request; reactivation restores it; both audited', async () => {
    const p = await makeUser('planner', world.operator.id);
    expect(await loadSessionUser({ uid: p.id, role: 'planner', sid: SID, epoch: 0 })).not.toBeNull();
    const off = await updatePerson(p.id, { version: 0, active: false }, actor());
    expect(off.active).toBe(false);
    expect(await loadSessionUser({ uid: p.id, role: 'planner', sid: SID, epoch: 0 })).toBeNull();
    expect(await lastAudit(p.id)).toMatchObject({ action: 'user.deactivate', before: { active: true }, after: { active: false } });
    await updatePerson(p.id, { version: off.version, active: true }, actor());
    expect(await loadSessionUser({ uid: p.id, role: 'planner', sid: SID, epoch: 0 })).not.toBeNull();
    expect(await lastAudit(p.id)).toMatchObject({ action: 'user.reactivate' });
  });

  test('a role change also ends the old session (the token carries the old role)', async () => {
    const p = await makeUser('planner', world.operator.id);
    await updatePerson(p.id, { version: 0, role: 'admin' }, actor());
    expect(await loadSessionUser({ uid: p.id, role: 'planner', sid: SID, epoch: 0 })).toBeNull();
  });

  test('an unknown person is not found', async () => {
    await expect(updatePerson(999_999, { version: 0, active: false }, actor())).rejects.toMatchObject({ code: 'not_found' });
  });
});
