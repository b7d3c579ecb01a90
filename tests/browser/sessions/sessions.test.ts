// Sessions, the post-sign-in destination and deny-by-default over real HTTP
// against the built server (no browser needed: plain fetch with a cookie jar).
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { startApp, type RunningApp } from '../support/app';
import { createStaff, freshEmail, closeDb } from '../support/accounts';
import { one, closeDb as closeDb2 } from '../support/db';
import { HttpClient } from './http-client';

const PASSWORD = 'sessions-test-password';
let app: RunningApp;

beforeAll(async () => {
  app = await startApp();
});
afterAll(async () => {
  await closeDb();
  await closeDb2();
  await app?.dispose();
});

async function person(role: 'planner' | 'admin' = 'planner') {
  const email = freshEmail(`sessions-${role}`);
  const id = await createStaff(email, `Session ${role}`, PASSWORD, role);
  return { id, email };
}
async function device(email: string) {
  const c = new HttpClient(app.url);
  await c.signIn(email, PASSWORD);
  return c;
}
const status = async (c: HttpClient, path = '/api/fleet/views') => (await c.fetch(path)).status;

describe('sign-out ends that session on the server', () => {
  test('a saved copy of a signed-out cookie gets 401; the same person’s other session still works', async () => {
    const p = await person();
    const desk = await device(p.email);
    const phone = await device(p.email);
    const saved = desk.copy();
    expect(await status(desk)).toBe(200);
    await desk.signOut();
    expect(desk.sessionCookies()).toEqual([]);
    expect(await status(saved)).toBe(401);
    expect(await status(phone)).toBe(200);
    // pages too: the copy is sent to sign in
    const page = await saved.fetch('/fleet');
    expect(page.status).toBe(303);
    expect(page.headers.get('location')).toMatch(/^\/login\?next=/);
  });

  test('the person ends all their sessions from their account page: every device 401', async () => {
    const p = await person();
    const a = await device(p.email);
    const b = await device(p.email);
    const account = await a.fetch('/account');
    expect(account.status).toBe(200);
    expect(await account.text()).toContain('Sign out everywhere');
    const res = await a.post('/api/account/sessions');
    expect(res.status).toBe(200);
    expect(await status(a)).toBe(401);
    expect(await status(b)).toBe(401);
    const again = await device(p.email);
    expect(await status(again)).toBe(200);
  });

  test('an admin ends all of a person’s sessions; the admin’s own session and others’ go on', async () => {
    const admin = await device((await person('admin')).email);
    const p = await person();
    const a = await device(p.email);
    const b = await device(p.email);
    const bystander = await device((await person()).email);
    const res = await admin.post(`/api/admin/users/${p.id}/sessions`);
    expect(res.status).toBe(200);
    expect(await status(a)).toBe(401);
    expect(await status(b)).toBe(401);
    expect(await status(bystander)).toBe(200);
    expect(await status(admin)).toBe(200);
    // not for a planner
    expect((await bystander.post(`/api/admin/users/${p.id}/sessions`)).status).toBe(403);
  });

  test('deactivation and a role change bite at the next request', async () => {
    const p = await person();
    const c = await device(p.email);
    expect(await status(c)).toBe(200);
    const saved = c.copy();
    await one('UPDATE users SET role = $2 WHERE id = $1 RETURNING id', [p.id, 'admin']);
    expect(await status(c)).toBe(401);
    expect(c.sessionCookies()).toEqual([]); // the refused cookie is cleared
    await one('UPDATE users SET role = $2 WHERE id = $1 RETURNING id', [p.id, 'planner']);
    expect(await status(saved)).toBe(200);
    await one('UPDATE users SET active = false WHERE id = $1 RETURNING id', [p.id]);
    expect(await status(saved)).toBe(401);
  });

  test('a fresh session writes no cookie; a chunked copy (.0/.1) of it works', async () => {
    const c = await device((await person()).email);
    const res = await fetch(`${app.url}/api/fleet/views`, { headers: { Cookie: c.cookieHeader() } });
    expect(res.status).toBe(200);
    expect(res.headers.getSetCookie().filter((h) => h.includes('session-token'))).toEqual([]);
    const token = c.jar.get('authjs.session-token')!;
    const cut = 100;
    const chunked = await fetch(`${app.url}/api/fleet/views`, {
      headers: { Cookie: `authjs.session-token.0=${token.slice(0, cut)}; authjs.session-token.1=${token.slice(cut)}` },
    });
    expect(chunked.status).toBe(200);
  });
});

describe('post-sign-in destination (open redirect)', () => {
  test('signed in: a next that leaves the site goes home instead; a newline is not a 500', async () => {
    const c = await device((await person()).email);
    for (const next of ['/%09/evil.example/phish', '/%0A/evil.example', '//evil.example', '/%5Cevil.example', '/%2F%2Fevil.example']) {
      const res = await c.fetch(`/login?next=${next}`);
      expect(res.status, next).toBe(303);
      expect(res.headers.get('location'), next).toBe('/fleet');
    }
    const ok = await c.fetch('/login?next=%2Ffleet%2Fbins%3Fview%3D1');
    expect(ok.headers.get('location')).toBe('/fleet/bins?view=1');
  });

  test('signed out: the page carries only a safe next', async () => {
    const anon = new HttpClient(app.url);
    for (const next of ['/%09/evil.example/phish', '/%0A/evil.example']) {
      const res = await anon.fetch(`/login?next=${next}`);
      expect(res.status).toBe(200);
      expect(await res.text()).toContain('data-next="/"');
    }
    const kept = await anon.fetch('/login?next=%2Ftrips');
    expect(await kept.text()).toContain('data-next="/trips"');
  });
});

describe('deny by default', () => {
  test('a path no rule names answers 403, page or API, signed in or not', async () => {
    const c = await device((await person('admin')).email);
    const page = await c.fetch('/purchasing');
    expect(page.status).toBe(403);
    expect(await page.text()).toContain('not open to your role');
    const api = await c.fetch('/api/invoicing/runs');
    expect(api.status).toBe(403);
    expect(((await api.json()) as { error: { code: string } }).error.code).toBe('forbidden');
    expect((await fetch(`${app.url}/api/invoicing`)).status).toBe(403);
    // the root and the account page have their rules
    expect((await c.fetch('/')).status).toBe(303);
    expect((await c.fetch('/account')).status).toBe(200);
  });
});
