// The per-request session check (src/lib/session/session.server.ts) against
// cookies made by Auth.js itself: signed in through @auth/core's own handler
// with the app's auth.config.ts, then checked without it. Auth.js's own
// readers (its session endpoint, and getToken, whose chunk joining is code
// ours does not use) read what we renew.
import { describe, test, expect, beforeAll, afterAll, afterEach, vi } from 'vitest';
import { Auth } from '@auth/core';
import { getToken } from '@auth/core/jwt';
import authConfig from '../../../auth.config';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld, makeUser } from '../support/fixtures';
import { checkSession } from '@/lib/session/session.server';
import { SESSION_MAX_AGE_S, SESSION_REFRESH_AFTER_S, CHUNK_SIZE } from '@/lib/session/session-cookie';
import { endSession, endAllSessions, deleteExpiredSessionEnds } from '@/lib/session/session-ends.server';
import { runJobNow } from '@/lib/jobs/registry.server';
import { User } from '@/models';

process.env.AUTH_SECRET ||= 'integration-test-secret-integration-test-secret';
const config = { ...authConfig, secret: process.env.AUTH_SECRET, basePath: '/api/auth' };

type Jar = Map<string, string>;
const header = (jar: Jar) => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
function take(res: Response, jar: Jar) {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const eq = pair!.indexOf('=');
    const value = pair!.slice(eq + 1);
    if (value === '' || /Max-Age=0|Expires=Thu, 01 Jan 1970/i.test(c)) jar.delete(pair!.slice(0, eq));
    else jar.set(pair!.slice(0, eq), value);
  }
}

/** Signs in through Auth.js's credentials flow; answers the cookie jar it set. */
async function authSignIn(origin: string, email: string): Promise<Jar> {
  const jar: Jar = new Map();
  const csrf = await Auth(new Request(`${origin}/api/auth/csrf`), config);
  take(csrf, jar);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await Auth(
    new Request(`${origin}/api/auth/callback/credentials`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: header(jar) },
      body: new URLSearchParams({ csrfToken, email, password: 'test-password', callbackUrl: `${origin}/fleet` }),
    }),
    config,
  );
  take(res, jar);
  return jar;
}

const sessionCookies = (jar: Jar) => [...jar.keys()].filter((k) => k.includes('authjs.session-token'));
const get = (origin: string, jar: Jar, path = '/api/fleet/views') => new Request(`${origin}${path}`, { headers: { Cookie: header(jar) } });
const HTTP = 'http://loopfold.test';
const HTTPS = 'https://loopfold.test';

let world: Awaited<ReturnType<typeof baseWorld>>;
let planner: User;
beforeAll(async () => {
  await resetDatabase();
  world = await baseWorld();
  planner = await makeUser('planner', world.operator.id, { email: 'session-planner@test.example' });
});
afterAll(async () => {
  await sequelize.close();
});
afterEach(() => {
  vi.useRealTimers();
});

describe('a cookie Auth.js issued, checked without its handler', () => {
  test('plain HTTP: authjs.session-token, the user is read, no cookie written while fresh', async () => {
    const jar = await authSignIn(HTTP, planner.email);
    expect(sessionCookies(jar)).toEqual(['authjs.session-token']);
    const s = await checkSession(get(HTTP, jar));
    expect(s.user).toMatchObject({ id: planner.id, role: 'planner', email: planner.email });
    expect(s.cookies).toEqual([]);
    expect(s.secure).toBe(false);
  });

  test('HTTPS: the __Secure- cookie (its name is the key’s salt) works; the same token under the plain name does not', async () => {
    const jar = await authSignIn(HTTPS, planner.email);
    expect(sessionCookies(jar)).toEqual(['__Secure-authjs.session-token']);
    const s = await checkSession(get(HTTPS, jar));
    expect(s.user?.id).toBe(planner.id);
    expect(s.secure).toBe(true);
    const token = jar.get('__Secure-authjs.session-token')!;
    const renamed = await checkSession(new Request(`${HTTP}/api/fleet/views`, { headers: { Cookie: `authjs.session-token=${token}` } }));
    expect(renamed.user).toBeNull(); // another salt: another key
    expect(renamed.cookies.map((c) => [c.name, c.maxAge])).toEqual([['authjs.session-token', 0]]);
  });

  test('chunked: the token split into .0/.1 cookies works, in either order', async () => {
    const jar = await authSignIn(HTTP, planner.email);
    const token = jar.get('authjs.session-token')!;
    const cut = Math.floor(token.length / 2);
    const cookie = `authjs.session-token.1=${token.slice(cut)}; authjs.session-token.0=${token.slice(0, cut)}`;
    const s = await checkSession(new Request(`${HTTP}/`, { headers: { Cookie: cookie } }));
    expect(s.user?.id).toBe(planner.id);
  });

  test('a tampered, foreign or expired token is no session, and its cookie is cleared', async () => {
    const jar = await authSignIn(HTTP, planner.email);
    const token = jar.get('authjs.session-token')!;
    const tampered = token.slice(0, -4) + (token.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    for (const value of [tampered, 'not-a-token', token.split('.').reverse().join('.')]) {
      const s = await checkSession(new Request(`${HTTP}/`, { headers: { Cookie: `authjs.session-token=${value}` } }));
      expect(s.user).toBeNull();
      expect(s.cookies).toEqual([{ name: 'authjs.session-token', value: '', maxAge: 0 }]);
    }
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(Date.now() + (SESSION_MAX_AGE_S + 60) * 1000);
    expect((await checkSession(get(HTTP, jar))).user).toBeNull();
  });
});

describe('the session slides as it is used (as Auth.js’s session handler does)', () => {
  test('past the refresh interval the token is re-issued with a fresh expiry that Auth.js itself accepts', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    const t0 = new Date('2026-12-01T08:00:00Z').getTime();
    vi.setSystemTime(t0);
    const jar = await authSignIn(HTTP, planner.email);
    const before = await getToken({ req: get(HTTP, jar), secret: process.env.AUTH_SECRET!, secureCookie: false });
    expect(before!.exp).toBe(t0 / 1000 + SESSION_MAX_AGE_S);

    vi.setSystemTime(t0 + (SESSION_REFRESH_AFTER_S - 60) * 1000);
    expect((await checkSession(get(HTTP, jar))).cookies).toEqual([]);

    const later = t0 + 11 * 3600 * 1000; // 11 of the 12 hours gone
    vi.setSystemTime(later);
    const s = await checkSession(get(HTTP, jar));
    expect(s.user?.id).toBe(planner.id);
    expect(s.cookies.map((c) => [c.name, c.maxAge])).toEqual([['authjs.session-token', SESSION_MAX_AGE_S]]);
    const renewed: Jar = new Map([['authjs.session-token', s.cookies[0]!.value]]);
    const after = await getToken({ req: get(HTTP, renewed), secret: process.env.AUTH_SECRET!, secureCookie: false });
    expect(after!.exp).toBe(later / 1000 + SESSION_MAX_AGE_S);
    expect(after).toMatchObject({ uid: before!.uid, sid: before!.sid, epoch: before!.epoch, role: 'planner' });

    // 13 hours after sign-in: the first cookie has expired, the renewed one works.
    vi.setSystemTime(t0 + 13 * 3600 * 1000);
    expect((await checkSession(get(HTTP, jar))).user).toBeNull();
    expect((await checkSession(get(HTTP, renewed))).user?.id).toBe(planner.id);
    // and Auth.js's own session endpoint reads our renewal
    const res = await Auth(new Request(`${HTTP}/api/auth/session`, { headers: { Cookie: header(renewed) } }), config);
    expect(await res.json()).toMatchObject({ uid: String(planner.id), role: 'planner' });
  });

  test('a large token renewed is written in chunks Auth.js’s reader joins (getToken → SessionStore)', async () => {
    const { encode } = await import('@auth/core/jwt');
    vi.useFakeTimers({ toFake: ['Date'] });
    const t0 = new Date('2026-12-02T08:00:00Z').getTime();
    vi.setSystemTime(t0);
    const jar = await authSignIn(HTTP, planner.email);
    const claims = await getToken({ req: get(HTTP, jar), secret: process.env.AUTH_SECRET!, secureCookie: false });
    const big = await encode({
      token: { ...claims, padding: 'p'.repeat(CHUNK_SIZE * 1.5) },
      secret: process.env.AUTH_SECRET!,
      salt: 'authjs.session-token',
      maxAge: SESSION_MAX_AGE_S,
    });
    vi.setSystemTime(t0 + SESSION_REFRESH_AFTER_S * 1000);
    const s = await checkSession(new Request(`${HTTP}/`, { headers: { Cookie: `authjs.session-token=${big}` } }));
    expect(s.user?.id).toBe(planner.id);
    const written = s.cookies.filter((c) => c.maxAge > 0);
    expect(written.map((c) => c.name)).toEqual(['authjs.session-token.0', 'authjs.session-token.1', 'authjs.session-token.2']);
    expect(s.cookies.find((c) => c.name === 'authjs.session-token')).toEqual({ name: 'authjs.session-token', value: '', maxAge: 0 });
    const cookie = written.map((c) => `${c.name}=${c.value}`).join('; ');
    const read = await getToken({ req: new Request(`${HTTP}/`, { headers: { Cookie: cookie } }), secret: process.env.AUTH_SECRET!, secureCookie: false });
    expect(read).toMatchObject({ uid: String(planner.id), sid: claims!.sid });
    expect((await checkSession(new Request(`${HTTP}/`, { headers: { Cookie: cookie } }))).user?.id).toBe(planner.id);
  });
});

describe('the user row bites at the next request', () => {
  test('deactivation, then reactivation', async () => {
    const p = await makeUser('planner', world.operator.id);
    const jar = await authSignIn(HTTP, p.email);
    expect((await checkSession(get(HTTP, jar))).user?.id).toBe(p.id);
    await User.update({ active: false }, { where: { id: p.id } });
    expect((await checkSession(get(HTTP, jar))).user).toBeNull();
    await User.update({ active: true }, { where: { id: p.id } });
    expect((await checkSession(get(HTTP, jar))).user?.id).toBe(p.id);
  });
  test('a role change ends the session (the token carries the old role)', async () => {
    const p = await makeUser('planner', world.operator.id);
    const jar = await authSignIn(HTTP, p.email);
    await User.update({ role: 'admin' }, { where: { id: p.id } });
    expect((await checkSession(get(HTTP, jar))).user).toBeNull();
  });
});

describe('ending sessions', () => {
  const decoded = async (jar: Jar) => (await getToken({ req: get(HTTP, jar), secret: process.env.AUTH_SECRET!, secureCookie: false })) as Record<string, unknown>;

  test('sign-out through Auth.js ends that session only: a saved copy stops working, the other device goes on', async () => {
    const p = await makeUser('yard', world.operator.id, { homeSiteId: world.depot.id });
    const desk = await authSignIn(HTTP, p.email);
    const phone = await authSignIn(HTTP, p.email);
    const copy = new Map(desk);
    const csrf = await Auth(new Request(`${HTTP}/api/auth/csrf`, { headers: { Cookie: header(desk) } }), config);
    take(csrf, desk);
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const out = await Auth(
      new Request(`${HTTP}/api/auth/signout`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: header(desk) },
        body: new URLSearchParams({ csrfToken, callbackUrl: '/login' }),
      }),
      config,
    );
    take(out, desk);
    expect(sessionCookies(desk)).toEqual([]);
    expect((await checkSession(get(HTTP, copy))).user).toBeNull();
    expect((await checkSession(get(HTTP, phone))).user?.id).toBe(p.id);
  });

  test('end all: every session of the person stops, someone else’s does not, and it is audited', async () => {
    const p = await makeUser('planner', world.operator.id);
    const other = await makeUser('planner', world.operator.id);
    const a = await authSignIn(HTTP, p.email);
    const b = await authSignIn(HTTP, p.email);
    const c = await authSignIn(HTTP, other.email);
    await endAllSessions(p.id, { userId: null, ip: '192.0.2.1' });
    expect((await checkSession(get(HTTP, a))).user).toBeNull();
    expect((await checkSession(get(HTTP, b))).user).toBeNull();
    expect((await checkSession(get(HTTP, c))).user?.id).toBe(other.id);
    const again = await authSignIn(HTTP, p.email);
    expect((await decoded(again)).epoch).toBe(1);
    expect((await checkSession(get(HTTP, again))).user?.id).toBe(p.id);
    const [audit] = await sequelize.query<{ action: string }>(`SELECT action FROM audit_entries WHERE entity_id = '${p.id}' ORDER BY id DESC LIMIT 1`, { type: 'SELECT' as never });
    expect(audit).toMatchObject({ action: 'user.sessions_ended' });
  });

  test('the notes of ended sessions are kept until the cookie would have expired, then the job deletes them', async () => {
    const p = await makeUser('planner', world.operator.id);
    const jar = await authSignIn(HTTP, p.email);
    const token = await decoded(jar);
    const now = new Date(Date.now() + 48 * 3600 * 1000); // after every other test's notes have lapsed
    expect(await endSession(token, now)).toBe(true);
    const count = async () =>
      (await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ended_sessions WHERE session_id = '${token.sid}'`, { type: 'SELECT' as never }))[0]!.n;
    await deleteExpiredSessionEnds({ now: new Date(now.getTime() + (SESSION_MAX_AGE_S - 60) * 1000) });
    expect(await count()).toBe(1);
    expect(await runJobNow('ended-sessions-cleanup', { now: new Date(now.getTime() + (SESSION_MAX_AGE_S + 60) * 1000) })).toEqual({ deleted: 1 });
    expect(await count()).toBe(0);
  });
});

describe('a remembered decoding changes nothing that decoding again would not', () => {
  test('the same token checked twice: the second time still reads the row (a sign-out between bites) and still checks expiry', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    const t0 = new Date('2026-12-04T08:00:00Z').getTime();
    vi.setSystemTime(t0);
    const p = await makeUser('planner', world.operator.id);
    const jar = await authSignIn(HTTP, p.email);
    expect((await checkSession(get(HTTP, jar))).user?.id).toBe(p.id);
    expect((await checkSession(get(HTTP, jar))).user?.id).toBe(p.id);
    const token = (await getToken({ req: get(HTTP, jar), secret: process.env.AUTH_SECRET!, secureCookie: false })) as Record<string, unknown>;
    await endSession(token);
    expect((await checkSession(get(HTTP, jar))).user).toBeNull();
    const fresh = await authSignIn(HTTP, p.email);
    expect((await checkSession(get(HTTP, fresh))).user?.id).toBe(p.id);
    vi.setSystemTime(t0 + (SESSION_MAX_AGE_S + 16) * 1000);
    expect((await checkSession(get(HTTP, fresh))).user).toBeNull();
  });
});
