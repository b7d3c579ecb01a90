// The session cookie as Auth.js (@auth/core 0.37) writes it, read and renewed
// without running its whole handler on every request. Pure: no crypto here (the
// token is decoded and encoded with @auth/core/jwt in session.server.ts), no I/O.
//
// What Auth.js does, and so what this module must match (its
// lib/utils/cookie.js and lib/actions/session.js):
// - the cookie is `authjs.session-token`, or `__Secure-authjs.session-token`
//   when the request URL is https (secure cookies), and its name is also the
//   salt of the token's encryption key;
// - a token longer than 4096 − 160 characters is split into `<name>.0`,
//   `<name>.1`, … and joined again in the order of the numeric suffix;
// - the session slides: each use re-issues the token with a new expiry
//   (maxAge from now). We re-issue only once the token is older than
//   SESSION_REFRESH_AFTER_S, as Auth.js does for its database sessions
//   (`updateAge`), so most requests write no cookie.

/** How long a session lasts after its last renewal (auth.config.ts uses the same). */
export const SESSION_MAX_AGE_S = 12 * 60 * 60;
/** A token older than this is re-issued with a fresh expiry on its next use. */
export const SESSION_REFRESH_AFTER_S = 15 * 60;

const BASE_NAME = 'authjs.session-token';
/** Auth.js: ALLOWED_COOKIE_SIZE − ESTIMATED_EMPTY_COOKIE_SIZE. */
export const CHUNK_SIZE = 4096 - 160;

export function sessionCookieName(secure: boolean): string {
  return `${secure ? '__Secure-' : ''}${BASE_NAME}`;
}

/** Auth.js uses secure cookies exactly when the request URL is https. */
export function usesSecureCookies(requestUrl: string | URL): boolean {
  return new URL(requestUrl).protocol === 'https:';
}

/** Parses a Cookie request header (RFC 6265 §5.4 form: `a=1; b=2`). Later duplicates lose. */
export function parseCookieHeader(header: string | null | undefined): Map<string, string> {
  const out = new Map<string, string>();
  if (!header) return out;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq <= 0) continue;
    const name = part.slice(0, eq).trim();
    let value = part.slice(eq + 1).trim();
    if (value.startsWith('"') && value.endsWith('"') && value.length >= 2) value = value.slice(1, -1);
    try {
      value = decodeURIComponent(value);
    } catch {
      /* keep it as sent */
    }
    if (name && !out.has(name)) out.set(name, value);
  }
  return out;
}

const chunkSuffix = (cookieName: string, name: string): number | null => {
  if (name === cookieName) return 0;
  if (!name.startsWith(`${cookieName}.`)) return null;
  const rest = name.slice(cookieName.length + 1);
  return /^\d{1,3}$/.test(rest) ? Number(rest) : null;
};

/**
 * The session token carried by the request's cookies: the plain cookie, or the
 * chunks joined in suffix order. `names` lists every cookie that carried part of
 * it (so a re-issue can clear the ones it no longer needs).
 */
export function readSessionToken(cookies: Map<string, string>, cookieName: string): { token: string | null; names: string[] } {
  const parts: Array<[number, string, string]> = [];
  for (const [name, value] of cookies) {
    const n = chunkSuffix(cookieName, name);
    if (n !== null && value) parts.push([n, name, value]);
  }
  if (!parts.length) return { token: null, names: [] };
  parts.sort((a, b) => a[0] - b[0]);
  return { token: parts.map((p) => p[2]).join(''), names: parts.map((p) => p[1]) };
}

export interface CookieWrite {
  name: string;
  value: string;
  /** Seconds; 0 clears the cookie. */
  maxAge: number;
}

/**
 * The cookies that carry `token` from now on: one cookie when it fits, else
 * `.0`, `.1`, … chunks; every cookie that carried the old token and is not
 * rewritten is cleared.
 */
export function sessionCookieWrites(cookieName: string, token: string, previousNames: string[], maxAge = SESSION_MAX_AGE_S): CookieWrite[] {
  const count = Math.ceil(token.length / CHUNK_SIZE);
  const writes: CookieWrite[] =
    count <= 1
      ? [{ name: cookieName, value: token, maxAge }]
      : Array.from({ length: count }, (_, i) => ({ name: `${cookieName}.${i}`, value: token.slice(i * CHUNK_SIZE, (i + 1) * CHUNK_SIZE), maxAge }));
  const written = new Set(writes.map((w) => w.name));
  for (const name of previousNames) if (!written.has(name)) writes.push({ name, value: '', maxAge: 0 });
  return writes;
}

/** Clears every cookie that carried a token that must not be used again. */
export function sessionCookieClears(previousNames: string[]): CookieWrite[] {
  return previousNames.map((name) => ({ name, value: '', maxAge: 0 }));
}

/** True when a token issued at `issuedAtS` (seconds) is due for a fresh expiry at `nowS`. */
export function refreshDue(issuedAtS: number | undefined, nowS: number): boolean {
  if (typeof issuedAtS !== 'number' || !Number.isFinite(issuedAtS)) return true;
  return nowS - issuedAtS >= SESSION_REFRESH_AFTER_S;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** What our sessions carry beyond Auth.js's own claims (set in auth.config.ts at sign-in). */
export interface SessionClaims {
  uid: number;
  role: string;
  /** This session's id: signing out ends this one alone. */
  sid: string;
  /** users.session_epoch at sign-in: "end all sessions" counts it up. */
  epoch: number;
  iat?: number;
}

/** Our claims from a decoded token, or null when any is missing or malformed. */
export function sessionClaims(payload: Record<string, unknown> | null | undefined): SessionClaims | null {
  if (!payload) return null;
  const uid = Number(payload.uid);
  const { role, sid, epoch, iat } = payload;
  if (!Number.isInteger(uid) || uid <= 0) return null;
  if (typeof role !== 'string' || typeof sid !== 'string' || !UUID.test(sid)) return null;
  if (typeof epoch !== 'number' || !Number.isInteger(epoch) || epoch < 0) return null;
  return { uid, role, sid, epoch, iat: typeof iat === 'number' ? iat : undefined };
}
