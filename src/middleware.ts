import { defineMiddleware } from 'astro:middleware';
import { accessFor, can } from '@/lib/permissions';
import { CLIENT_IP_HEADER } from '@/lib/client-ip.server';
import { errorResponse } from '@/lib/respond.server';
import { clientAddressFrom, hstsHeader, trustedHops } from '@/lib/http/forwarded';
import { checkSession } from '@/lib/session/session.server';

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
 * re-checked against the user row (src/lib/session/), and the path is guarded by the role ×
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
    // The session cookie decoded here (not through the auth handler), the user
    // row read once; a renewed or cleared cookie rides on whatever is answered.
    const session = await checkSession(ctx.request);
    ctx.locals.user = session.user;
    for (const c of session.cookies) {
      ctx.cookies.set(c.name, c.value, {
        path: '/',
        httpOnly: true,
        sameSite: 'lax',
        secure: session.secure,
        ...(c.maxAge > 0 ? { expires: new Date(Date.now() + c.maxAge * 1000) } : { maxAge: 0, expires: new Date(0) }),
      });
    }
  }

  const access = accessFor(path);
  const isApi = path.startsWith('/api/');
  const user = ctx.locals.user;
  if (access === 'denied') {
    // No rule names this path: closed to everyone until one does.
    if (isApi) return errorResponse('forbidden', 'This address is not open.');
    return ctx.rewrite('/forbidden');
  }
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
  const hsts = connection ? hstsHeader({ encrypted: connection.encrypted, tls: connection.tls, forwardedProto: ctx.request.headers.get('x-forwarded-proto'), hops }) : null;
  if (hsts) response.headers.set('Strict-Transport-Security', hsts);
  allowStyleAttributes(response);
  return response;
});
