import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld, makeUser } from '../support/fixtures';
import { readSettings, updateSettings } from '@/lib/settings/settings.server';
import { settingsSchema } from '@/lib/settings/settings-schema';
import { AuditEntry } from '@/models';
import { PUT } from '@/pages/api/admin/settings';
import type { SessionUser } from '@/lib/accounts/session-user.server';

let adminUser: SessionUser;
beforeAll(async () => {
  await resetDatabase();
  const world = await baseWorld();
  const admin = await makeUser('admin', world.operator.id);
  adminUser = {
    id: admin.id,
    email: admin.email,
    name: admin.name,
    role: 'admin',
    organisationId: world.operator.id,
    organisationName: 'Test Pool',
    homeSiteId: null,
    qualifiedInspector: false,
  };
});
afterAll(async () => {
  await sequelize.close();
});

function put(body: unknown, user: SessionUser | null = adminUser): Promise<Response> {
  const request = new Request('http://pool.test/api/admin/settings', { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return PUT({ request, url: new URL(request.url), params: {}, locals: { user, clientAddress: '192.0.2.44' } } as unknown as APIContext) as Promise<Response>;
}

describe('operator settings', () => {
  test('a save from the current version goes through, bumps the version and is audited with only the changes', async () => {
    const current = await readSettings();
    const res = await put({ ...current, operatorName: 'Renamed Pool', taxRate: '0.09', timeZone: 'europe/brussels' });
    expect(res.status).toBe(200);
    const { data } = (await res.json()) as { data: { settings: Awaited<ReturnType<typeof readSettings>> } };
    expect(data.settings).toMatchObject({ operatorName: 'Renamed Pool', taxRate: '0.0900', timeZone: 'Europe/Brussels', version: current.version + 1 });
    const entry = await AuditEntry.findOne({ where: { action: 'settings.update' }, order: [['id', 'DESC']] });
    expect(entry).toMatchObject({
      userId: adminUser.id,
      ip: '192.0.2.44',
      entityType: 'settings',
      entityId: '1',
      before: { operatorName: 'Test Pool', taxRate: '0.2100', timeZone: 'Europe/Amsterdam' },
      after: { operatorName: 'Renamed Pool', taxRate: '0.0900', timeZone: 'Europe/Brussels' },
    });
    expect(Object.keys(entry!.after as object).sort()).toEqual(['operatorName', 'taxRate', 'timeZone']);
  });

  test('a form loaded before someone else saved gets 409 changed_meanwhile and changes nothing', async () => {
    const loaded = await readSettings();
    const first = await put({ ...loaded, currency: 'GBP' });
    expect(first.status).toBe(200);
    const stale = await put({ ...loaded, returnInstructions: 'Leave it by the gate.' });
    expect(stale.status).toBe(409);
    expect(((await stale.json()) as { error: { code: string; message: string } }).error).toMatchObject({
      code: 'changed_meanwhile',
      message: expect.stringMatching(/changed the settings while you were editing/),
    });
    const now = await readSettings();
    expect(now).toMatchObject({ currency: 'GBP', returnInstructions: '' });
  });

  test('saving unchanged values writes no audit entry and keeps the version', async () => {
    const s = await readSettings();
    const count = await AuditEntry.count();
    const after = await updateSettings(settingsSchema.parse({ ...s, taxRate: String(Number(s.taxRate)) }), { userId: adminUser.id, ip: null });
    expect(after.version).toBe(s.version);
    expect(await AuditEntry.count()).toBe(count);
  });

  test('invalid values are refused with the fields named', async () => {
    const s = await readSettings();
    const res = await put({ ...s, timeZone: 'Mars/Olympus', gs1PrefixLength: 8, currency: 'XYZ', mailSender: 'not an address', digitalLinkBase: 'ftp://x' });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { code: string; details: Array<{ path: string }> } };
    expect(error.code).toBe('validation_failed');
    expect(error.details.map((d) => d.path).sort()).toEqual(['currency', 'digitalLinkBase', 'mailSender', 'timeZone']);
    // the prefix/length check runs once the fields themselves are valid
    const res2 = await put({ ...s, gs1PrefixLength: 8 });
    expect(((await res2.json()) as { error: { details: Array<{ path: string }> } }).error.details.map((d) => d.path)).toEqual(['gs1PrefixLength']);
  });

  test('only admins', async () => {
    const s = await readSettings();
    const res = await put(s, { ...adminUser, role: 'planner' });
    expect(res.status).toBe(403);
    expect((await put(s, null)).status).toBe(401);
  });
});
