// Calls an API route's handler the way Astro would, with a signed-in user already
// resolved (the middleware's job), so integration tests cover the route's own
// validation, permissions and envelope against the real database.
import type { APIContext, APIRoute } from 'astro';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import type { Role } from '@/lib/permissions';

export function sessionUser(u: { id: number | null; role: Role; organisationId: number; homeSiteId?: number | null }, name = `Test ${u.role}`): SessionUser {
  return {
    id: u.id ?? 0,
    email: `${u.role}-${u.id}@test.example`,
    name,
    role: u.role,
    organisationId: u.organisationId,
    organisationName: 'Test',
    homeSiteId: u.homeSiteId ?? null,
    qualifiedInspector: false,
  };
}

export async function callRoute(
  route: APIRoute,
  opts: {
    user: SessionUser | null;
    path: string;
    query?: Record<string, string>;
    method?: string;
    body?: unknown;
    /** Sent as it is (a signed webhook's exact bytes), instead of `body` as JSON. */
    rawBody?: string;
    headers?: Record<string, string>;
    params?: Record<string, string>;
  },
): Promise<Response> {
  const url = new URL(opts.path, 'http://loopfold.test');
  for (const [k, v] of Object.entries(opts.query ?? {})) url.searchParams.set(k, v);
  const json = opts.body !== undefined || opts.rawBody !== undefined;
  const request = new Request(url, {
    method: opts.method ?? 'GET',
    headers: { ...(json ? { 'Content-Type': 'application/json' } : {}), ...opts.headers },
    body: opts.rawBody ?? (opts.body === undefined ? undefined : JSON.stringify(opts.body)),
  });
  const ctx = { url, request, params: opts.params ?? {}, locals: { user: opts.user, clientAddress: '127.0.0.1' } } as unknown as APIContext;
  return route(ctx) as Promise<Response>;
}

export async function json<T = { data?: unknown; error?: { code: string; message: string; details?: unknown } }>(res: Response): Promise<T> {
  return (await res.json()) as T;
}
