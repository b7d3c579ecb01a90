import { describe, test, expect } from 'vitest';
import {
  CHUNK_SIZE,
  SESSION_REFRESH_AFTER_S,
  parseCookieHeader,
  readSessionToken,
  refreshDue,
  sessionClaims,
  sessionCookieName,
  sessionCookieWrites,
  usesSecureCookies,
} from '@/lib/session/session-cookie';

// Names and sizes are Auth.js's (@auth/core 0.37, lib/utils/cookie.js:
// defaultCookies() and SessionStore); the chunk order is its numeric-suffix sort.
describe('session cookie names', () => {
  test.each([
    ['http://localhost:4321/fleet', false, 'authjs.session-token'],
    ['https://yard.example/fleet', true, '__Secure-authjs.session-token'],
  ])('%s → secure %s, %s', (url, secure, name) => {
    expect(usesSecureCookies(url)).toBe(secure);
    expect(sessionCookieName(secure)).toBe(name);
  });
  test('the chunk size leaves room for the name and attributes in 4096 bytes (RFC 6265 §6.1 minimum)', () => {
    expect(CHUNK_SIZE).toBe(3936);
  });
});

describe('reading the Cookie header (RFC 6265 §5.4)', () => {
  test('pairs, spaces, quotes, percent-encoding; the first of a duplicate name wins', () => {
    const c = parseCookieHeader('a=1; b = two ;c="q"; d=%41%42; a=later; bad; =x');
    expect([...c]).toEqual([
      ['a', '1'],
      ['b', 'two'],
      ['c', 'q'],
      ['d', 'AB'],
    ]);
  });
  test('an empty or missing header', () => {
    expect(parseCookieHeader('').size).toBe(0);
    expect(parseCookieHeader(null).size).toBe(0);
  });
});

describe('chunked tokens', () => {
  const name = 'authjs.session-token';
  test('one cookie is the token', () => {
    expect(
      readSessionToken(
        new Map([
          [name, 'abc'],
          ['other', 'x'],
        ]),
        name,
      ),
    ).toEqual({ token: 'abc', names: [name] });
  });
  test('chunks are joined by numeric suffix, not by text order (10 after 9)', () => {
    const cookies = new Map<string, string>();
    for (let i = 10; i >= 0; i -= 1) cookies.set(`${name}.${i}`, String.fromCharCode(97 + i));
    expect(readSessionToken(cookies, name).token).toBe('abcdefghijk');
  });
  test('cookies that only look alike are not part of it', () => {
    const cookies = new Map([
      [`${name}.x`, 'no'],
      [`${name}x`, 'no'],
      [`__Secure-${name}`, 'no'],
      [`${name}.0`, 'yes'],
    ]);
    expect(readSessionToken(cookies, name)).toEqual({ token: 'yes', names: [`${name}.0`] });
  });
  test('no token', () => {
    expect(readSessionToken(new Map([[name, '']]), name).token).toBeNull();
  });
  test('a long token is split at 3936 characters; stale chunks are cleared', () => {
    const token = 'x'.repeat(CHUNK_SIZE * 2 + 5);
    const writes = sessionCookieWrites(name, token, [`${name}.0`, `${name}.1`, `${name}.2`, `${name}.3`], 100);
    expect(writes.map((w) => [w.name, w.value.length, w.maxAge])).toEqual([
      [`${name}.0`, CHUNK_SIZE, 100],
      [`${name}.1`, CHUNK_SIZE, 100],
      [`${name}.2`, 5, 100],
      [`${name}.3`, 0, 0],
    ]);
    expect(
      writes
        .filter((w) => w.maxAge > 0)
        .map((w) => w.value)
        .join(''),
    ).toBe(token);
  });
  test('a short token after a chunked one: one cookie, every chunk cleared', () => {
    const writes = sessionCookieWrites(name, 'short', [`${name}.0`, `${name}.1`]);
    expect(writes.map((w) => [w.name, w.maxAge > 0])).toEqual([
      [name, true],
      [`${name}.0`, false],
      [`${name}.1`, false],
    ]);
  });
  test('exactly one chunk’s worth stays one cookie', () => {
    expect(sessionCookieWrites(name, 'y'.repeat(CHUNK_SIZE), []).map((w) => w.name)).toEqual([name]);
  });
});

describe('renewal', () => {
  test.each([
    [1000, 1000, false],
    [1000, 1000 + SESSION_REFRESH_AFTER_S - 1, false],
    [1000, 1000 + SESSION_REFRESH_AFTER_S, true],
    [undefined, 1000, true],
  ])('issued %s, now %s → due %s', (iat, now, due) => expect(refreshDue(iat, now)).toBe(due));
});

describe('claims', () => {
  const ok = { uid: '7', role: 'planner', sid: '3b241101-e2bb-4255-8caf-4136c566a962', epoch: 0, iat: 5 };
  test('a token from our sign-in', () => {
    expect(sessionClaims(ok)).toEqual({ uid: 7, role: 'planner', sid: ok.sid, epoch: 0, iat: 5 });
  });
  test.each([
    ['no sid (a token from before sessions could be ended)', { ...ok, sid: undefined }],
    ['a sid that is not a UUID', { ...ok, sid: "x'; DROP TABLE users" }],
    ['no epoch', { ...ok, epoch: undefined }],
    ['a fractional epoch', { ...ok, epoch: 1.5 }],
    ['no uid', { ...ok, uid: undefined }],
    ['uid 0', { ...ok, uid: 0 }],
    ['no role', { ...ok, role: undefined }],
  ])('refused: %s', (_why, payload) => expect(sessionClaims(payload as Record<string, unknown>)).toBeNull());
});
