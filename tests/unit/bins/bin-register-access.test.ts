import { describe, test, expect, vi, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { accessFor, can, ROLES, type Role } from '@/lib/permissions';
import type { SessionUser } from '@/lib/accounts/session-user.server';

describe('path rules of the bin register', () => {
  test.each([
    ['/bins/new', 'bins.edit'],
    ['/bins/import', 'bins.import'],
    ['/bins/import/template.csv', 'bins.import'],
    ['/bins/export.csv', 'bins.import'],
    ['/api/bins/register', 'bins.edit'],
    ['/api/bins/import/preview', 'bins.import'],
    ['/api/bins/import/commit', 'bins.import'],
    // The bin page itself stays open to every role that may view bins.
    ['/bins/00614141123452400', 'bins.view'],
    ['/api/bins/00614141123452400', 'bins.view'],
  ])('%s → %s', (path, access) => {
    expect(accessFor(path)).toBe(access);
  });

  test('only planners and admins may register, import, export or edit', () => {
    for (const role of ROLES) {
      const desk = role === 'planner' || role === 'admin';
      expect(can(role, 'bins.edit')).toBe(desk);
      expect(can(role, 'bins.import')).toBe(desk);
    }
  });
});

// /bins/<grai>/edit sits under the /bins prefix (bins.view), so the edit
// endpoint must refuse by itself. endpoint() checks the capability before it
// reads the body or the database; the URL below is never connected to.
describe('PATCH /api/bins/<grai>/edit checks bins.edit itself', () => {
  let PATCH: (ctx: APIContext) => Promise<Response>;
  beforeAll(async () => {
    vi.stubEnv('DATABASE_URL', 'postgres://nobody@127.0.0.1:1/never');
    ({ PATCH } = (await import('@/pages/api/bins/[grai]/edit')) as unknown as { PATCH: typeof PATCH });
  });
  afterAll(() => {
    vi.unstubAllEnvs();
  });

  function call(role: Role | null) {
    const user: SessionUser | null = role && {
      id: 7,
      email: `${role}@test.example`,
      name: role,
      role,
      organisationId: 2,
      organisationName: 'Org',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    const request = new Request('http://localhost/api/bins/00614141123452400/edit', {
      method: 'PATCH',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ version: 0, binTypeId: 1 }),
    });
    const ctx = { request, url: new URL(request.url), params: { grai: '00614141123452400' }, locals: { user, clientAddress: '127.0.0.1' } };
    return PATCH(ctx as unknown as APIContext);
  }

  test.each(['customer', 'yard'] as const)('a %s gets 403 forbidden', async (role) => {
    const res = await call(role);
    expect(res.status).toBe(403);
    expect(await res.json()).toEqual({ error: { code: 'forbidden', message: 'Your role may not use this.' } });
  });
  test('nobody signed in gets 401', async () => {
    expect((await call(null)).status).toBe(401);
  });
});
