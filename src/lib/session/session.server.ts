// The per-request session check, without Auth.js's whole handler: the cookie is
// decoded with @auth/core's own JWT helpers (same key derivation: the secret,
// salted with the cookie's name), then the user row is read once — active, role,
// session epoch and whether this session was signed out, in one query.
import { decode, encode } from '@auth/core/jwt';
import { loadSessionUser, type SessionUser } from '@/lib/accounts/session-user.server';
import {
  SESSION_MAX_AGE_S,
  parseCookieHeader,
  readSessionToken,
  refreshDue,
  sessionClaims,
  sessionCookieClears,
  sessionCookieName,
  sessionCookieWrites,
  usesSecureCookies,
  type CookieWrite,
} from './session-cookie';

export interface SessionCheck {
  user: SessionUser | null;
  /** Cookies to set on the response: a renewed token, or clears for one that must go. */
  cookies: CookieWrite[];
  /** Whether those cookies need the Secure flag (https). */
  secure: boolean;
}

function secret(): string {
  const value = process.env.AUTH_SECRET;
  if (!value) throw new Error('AUTH_SECRET is not set');
  return value;
}

/**
 * Decoded tokens by cookie name and exact token text. Decoding derives the key
 * (HKDF) and decrypts on every call, the largest CPU cost of a signed-in
 * request; a browser sends the same token until it is renewed, so the payload
 * is remembered. The token text is the whole secret (a changed byte is another
 * key here and fails decryption), and the expiry is checked on every use, so a
 * remembered payload is accepted exactly when decoding it again would be.
 * Everything that can change (active, role, epoch, sign-out) is read from the
 * database on every request regardless.
 */
const decoded = new Map<string, Record<string, unknown>>();
const DECODED_MAX = 2000;
const CLOCK_TOLERANCE_S = 15; // as @auth/core/jwt decode allows

async function decodeToken(token: string, salt: string, nowMs: number): Promise<Record<string, unknown> | null> {
  const key = `${salt}\n${token}`;
  let payload = decoded.get(key) ?? null;
  if (!payload) {
    try {
      payload = (await decode({ token, secret: secret(), salt })) as Record<string, unknown> | null;
    } catch {
      return null;
    }
    if (!payload) return null;
    if (decoded.size >= DECODED_MAX) decoded.delete(decoded.keys().next().value!);
    decoded.set(key, payload);
  }
  const exp = payload.exp;
  if (typeof exp !== 'number' || exp + CLOCK_TOLERANCE_S <= nowMs / 1000) {
    decoded.delete(key);
    return null;
  }
  return payload;
}

/**
 * Who is signed in on this request, and which cookies to write back. A token
 * that does not decode (tampered, expired, another secret) or names a session
 * that has ended is cleared, as Auth.js clears a session cookie it cannot use.
 */
export async function checkSession(request: Request, nowMs = Date.now()): Promise<SessionCheck> {
  const secure = usesSecureCookies(request.url);
  const name = sessionCookieName(secure);
  const { token, names } = readSessionToken(parseCookieHeader(request.headers.get('cookie')), name);
  if (!token) return { user: null, cookies: [], secure };

  const payload = await decodeToken(token, name, nowMs);
  const claims = sessionClaims(payload);
  if (!payload || !claims) return { user: null, cookies: sessionCookieClears(names), secure };

  const user = await loadSessionUser(claims);
  if (!user) return { user: null, cookies: sessionCookieClears(names), secure };

  if (!refreshDue(claims.iat, Math.floor(nowMs / 1000))) return { user, cookies: [], secure };
  // Slide the expiry as Auth.js's session handler does: the same claims,
  // re-encrypted with a fresh issue time, expiry and token id.
  const renewed = await encode({ token: { ...payload }, secret: secret(), salt: name, maxAge: SESSION_MAX_AGE_S });
  return { user, cookies: sessionCookieWrites(name, renewed, names), secure };
}
