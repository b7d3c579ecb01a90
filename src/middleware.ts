import { defineMiddleware } from 'astro:middleware';
import { getSession } from 'auth-astro/server';
import { accessFor, can } from './lib/permissions';
import { loadSessionUser } from './lib/server/session-user';
import { CLIENT_IP_HEADER } from './lib/server/client-ip';
import { errorResponse } from './lib/server/respond';
import { clientAddressFrom, hstsHeader, trustedHops } from './lib/http/forwarded';

const STATIC_PREFIXES = ['/_astro/', '/fonts/', '/favicon', '/icons/', '/robots.txt', '/sw.js', '/manifest.webmanifest'];

const SECURITY_HEADERS: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'same-origin',
  'X-Frame-Options': 'DENY',
  'Permissions-Policy': 'camera=(self), geolocation=(), microphone=()',
};

/**
 * A response whose headers may be changed: redirects made with
 * Response.redirect() (Auth.js answers a failed sign-in so) and fetched
 * responses have immutable headers, so they are copied first.
 */
function mutable(response: Response): Response {
  try {
    response.headers.set('X-Content-Type-Options', 'nosniff');
    return response;
  } catch {
    return new Response(response.body, { status: response.status, statusText: response.statusText, headers: new Headers(response.headers) });
  }
}

/**
 * Astro sends each rendered page's Content-Security-Policy (astro.config.mjs,
 * experimental.csp): scripts and <style> elements by hash or nonce only. Its
 * directive list has no `style-src-attr`, so it is added here: style="…"
 * attributes (computed sizes, label positions) may stay inline, which cannot
 * run code; injected <style> elements and scripts stay blocked.
 */
function allowStyleAttributes(response: Response) {
  const policy = response.headers.get('content-security-policy');
  if (!policy || policy.includes('style-src-attr')) return;
  response.headers.set('content-security-policy', `${policy.trim().replace(/;?$/, ';')} style-src-attr 'unsafe-inline';`);
}

/** Under `astro dev` (no server of ours) Vite's socket address; in a build, never Astro's guess. */
function devSocketAddress(ctx: { clientAddress: string }): string | null {
  if (!import.meta.env.DEV) return null;
  try {
    return ctx.clientAddress;
  } catch {
    return null;
  }
}

/**
 * Every request passes here: the caller's address is pinned, the session is
 * re-checked against the user row, and the path is guarded by the role ×
 * capability table (src/lib/permissions.ts). Endpoints check again, finer.
 */
export const onRequest = defineMiddleware(async (ctx, next) => {
  const path = ctx.url.pathname;
  if (STATIC_PREFIXES.some((p) => path.startsWith(p))) return next();

  // The socket's address comes from our server (src/cli/serve.mjs), never from
  // Astro's clientAddress, which trusts the leftmost X-Forwarded-For entry.
  const hops = trustedHops(process.env.TRUST_PROXY);
  const connection = ctx.locals.connection;
  const address = clientAddressFrom({
    socketAddress: connection ? connection.remoteAddress : devSocketAddress(ctx),
    forwardedFor: ctx.request.headers.get('x-forwarded-for'),
    hops,
  });
  ctx.locals.clientAddress = address;
  try {
    ctx.request.headers.set(CLIENT_IP_HEADER, address);
  } catch {
    /* immutable headers: the sign-in limit falls back to 'unknown' */
  }

  ctx.locals.user = null;
  if (!path.startsWith('/api/auth/')) {
    const session = (await getSession(ctx.request)) as { uid?: unknown; role?: unknown } | null;
    if (session) ctx.locals.user = await loadSessionUser(session.uid, session.role);
  }

  const access = accessFor(path);
  const isApi = path.startsWith('/api/');
  const user = ctx.locals.user;
  if (access !== 'public') {
    if (!user) {
      if (isApi) return errorResponse('unauthenticated', 'Sign in first.');
      const nextUrl = encodeURIComponent(path + ctx.url.search);
      return ctx.redirect(`/login?next=${nextUrl}`, 303);
    }
    if (access !== 'signed-in' && !can(user.role, access)) {
      if (isApi) return errorResponse('forbidden', 'Your role may not use this.');
      return ctx.rewrite('/forbidden');
    }
  }

  const response = mutable(await next());
  for (const [k, v] of Object.entries(SECURITY_HEADERS)) {
    if (!response.headers.has(k)) response.headers.set(k, v);
  }
  const hsts = connection
    ? hstsHeader({ encrypted: connection.encrypted, tls: connection.tls, forwardedProto: ctx.request.headers.get('x-forwarded-proto'), hops })
    : null;
  if (hsts) response.headers.set('Strict-Transport-Security', hsts);
  allowStyleAttributes(response);
  return response;
});
