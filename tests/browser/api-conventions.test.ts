// The API conventions over real HTTP against the built server: one envelope,
// one catalogue of codes, statuses as HTTP means them, never a 500 for bad input.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import type { APIRequestContext, BrowserContext } from 'playwright-core';
import { newContext, signIn, useApp } from './support/app';
import { one, closeDb } from './support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();

const contexts: Record<string, BrowserContext> = {};
const as = (role: string): APIRequestContext => contexts[role]!.request;

beforeAll(async () => {
  for (const [role, email] of [
    ['yard', 'yard@northmere.example'],
    ['customer', 'buyer@haldenoils.example'],
    ['planner', 'planner@northmere.example'],
  ]) {
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, email!, DEMO_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/login'));
    contexts[role!] = ctx;
  }
});
afterAll(async () => {
  await closeDb();
});

async function expectError(res: Awaited<ReturnType<APIRequestContext['post']>>, status: number, code: string) {
  expect(res.status()).toBe(status);
  const body = (await res.json()) as { error: { code: string; message: string; details?: any } };
  expect(Object.keys(body)).toEqual(['error']);
  expect(body.error.code).toBe(code);
  expect(typeof body.error.message).toBe('string');
  expect(body.error.message.length).toBeGreaterThan(5);
  return body.error;
}

describe('API conventions', () => {
  test('health answers in the envelope', async () => {
    const res = await as('yard').get('/api/health');
    expect(res.status()).toBe(200);
    expect((await res.json()).data).toMatchObject({ app: 'ok', database: 'ok' });
  });

  test('401 without a session, 403 for a role that may not, 404 for what is not there', async () => {
    const anon = await t.browser.newContext({ baseURL: t.app.url });
    await expectError(await anon.request.post('/api/scan-events', { data: {} }), 401, 'unauthenticated');
    await anon.close();
    await expectError(await as('customer').get('/api/admin/users'), 403, 'forbidden');
    await expectError(
      await as('yard').post('/api/scan-events', { data: { clientEventId: randomUUID(), grai: '(8003)09521234100102999999', action: 'receive' } }),
      404,
      'not_found',
    );
  });

  test('400 for malformed JSON, wrong shapes and bad identities — with what is wrong', async () => {
    const bad = await as('yard').fetch('/api/scan-events', { method: 'POST', headers: { 'Content-Type': 'application/json' }, data: Buffer.from('{"clientEventId": ') });
    await expectError(bad, 400, 'bad_json');
    const shape = await expectError(await as('yard').post('/api/scan-events', { data: { clientEventId: 'not-a-uuid', action: 'teleport' } }), 400, 'validation_failed');
    expect(JSON.stringify(shape.details)).toMatch(/clientEventId|action/);
    // a GRAI with a wrong check digit: the message says which digit was expected
    const err = await expectError(
      await as('yard').post('/api/scan-events', { data: { clientEventId: randomUUID(), grai: '(8003)09521234100109100028', action: 'receive' } }),
      404,
      'not_found',
    );
    expect(err.message).toMatch(/check digit/i);
    const types = await as('yard').fetch('/api/scan-events', { method: 'POST', headers: { 'Content-Type': 'text/plain', Origin: t.app.url }, data: Buffer.from('hello') });
    await expectError(types, 415, 'unsupported_media_type');
  });

  test('422 for a transition the rules refuse (nothing recorded), 409 for a replayed id from someone else', async () => {
    const bin = await one<{ grai: string; id: number }>(
      `SELECT a.grai, a.id FROM assets a JOIN users u ON u.home_site_id = a.site_id WHERE u.email = 'yard@northmere.example' AND a.status = 'available' AND NOT a.prep_checked ORDER BY a.id DESC LIMIT 1`,
    );
    const before = await one<{ n: number }>('SELECT count(*)::int AS n FROM scan_events WHERE asset_id = $1', [bin.id]);
    const refused = await expectError(
      await as('yard').post('/api/scan-events', { data: { clientEventId: randomUUID(), grai: bin.grai, action: 'dispatch', purpose: 'hire' } }),
      422,
      'transition_refused',
    );
    expect(refused.details.reason).toBe('not_allowed_from_status');
    const after = await one<{ n: number }>('SELECT count(*)::int AS n FROM scan_events WHERE asset_id = $1', [bin.id]);
    expect(after.n).toBe(before.n);

    const id = randomUUID();
    const ok = await as('yard').post('/api/scan-events', { data: { clientEventId: id, grai: bin.grai, action: 'prep_check', prepResult: 'pass' } });
    expect(ok.status()).toBe(201);
    const replay = await as('yard').post('/api/scan-events', { data: { clientEventId: id, grai: bin.grai, action: 'prep_check', prepResult: 'pass' } });
    expect(replay.status()).toBe(200);
    expect((await replay.json()).data.replayed).toBe(true);
    await expectError(await as('planner').post('/api/scan-events', { data: { clientEventId: id, grai: bin.grai, action: 'prep_check', prepResult: 'pass' } }), 409, 'duplicate');
  });

  test('a batch answers per event', async () => {
    const res = await as('yard').post('/api/scan-events', {
      data: { events: [{ clientEventId: randomUUID(), grai: '(8003)09521234100102999999', action: 'receive' }] },
    });
    expect(res.status()).toBe(200);
    const { data } = await res.json();
    expect(data.results[0]).toMatchObject({ ok: false, status: 404 });
  });
});
