// The one way to write a route, without a database: path parameters, multipart forms with files, the public
// variant, the raw-bytes variant for signed webhooks, and the error envelope a batch answers per item.
import { describe, test, expect, vi, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { z } from 'zod';
import type { SessionUser } from '@/lib/accounts/session-user.server';

type Mod = typeof import('@/lib/endpoint.server');
let m: Mod;
let AppErrorClass: typeof import('@/lib/api-errors').AppError;
beforeAll(async () => {
  vi.stubEnv('DATABASE_URL', 'postgres://nobody@127.0.0.1:1/never'); // never connected to: nothing here queries
  m = await import('@/lib/endpoint.server');
  AppErrorClass = (await import('@/lib/api-errors')).AppError;
});
afterAll(() => vi.unstubAllEnvs());

const planner: SessionUser = {
  id: 7,
  email: 'p@test.example',
  name: 'P',
  role: 'planner',
  organisationId: 1,
  organisationName: 'Org',
  homeSiteId: null,
  qualifiedInspector: false,
};

function ctx(request: Request, { params = {}, user = planner as SessionUser | null } = {}) {
  return { request, url: new URL(request.url), params, locals: { user, clientAddress: '127.0.0.1' }, redirect: () => new Response(null, { status: 303 }) } as unknown as APIContext;
}

describe('endpoint() inputs', () => {
  test('path parameters are validated like the rest: a bad id is 400 with the reason, a good one arrives as a number', async () => {
    const seen: unknown[] = [];
    const route = m.endpoint({ capability: 'scan.correct', params: z.object({ id: z.coerce.number().int().positive() }) }, async ({ params }) => {
      seen.push(params);
      return { ok: true };
    });
    const bad = await route(ctx(new Request('http://x/api/t/abc', { method: 'POST' }), { params: { id: 'abc' } }));
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { code: string } }).error.code).toBe('validation_failed');
    const good = await route(ctx(new Request('http://x/api/t/12', { method: 'POST' }), { params: { id: '12' } }));
    expect(good.status).toBe(200);
    expect(seen).toEqual([{ id: 12 }]);
  });

  test('a multipart form: text fields through the schema, files as bytes or null', async () => {
    const route = m.endpoint(
      { capability: 'bins.edit', form: z.object({ name: z.string().min(2), tags: z.array(z.string()).optional() }), files: ['photo', 'other'] },
      async ({ form, files }) => ({
        form,
        photo: files.photo && { size: files.photo.bytes.byteLength, name: files.photo.filename },
        other: files.other,
      }),
    );
    const fd = new FormData();
    fd.append('name', 'Quay 4');
    fd.append('tags', 'a');
    fd.append('tags', 'b');
    fd.append('photo', new File([new Uint8Array([1, 2, 3])], 'p.jpg', { type: 'image/jpeg' }));
    const res = await route(ctx(new Request('http://x/api/f', { method: 'POST', body: fd })));
    expect(await res.json()).toEqual({ data: { form: { name: 'Quay 4', tags: ['a', 'b'] }, photo: { size: 3, name: 'p.jpg' }, other: null } });

    const short = new FormData();
    short.append('name', 'Q');
    const refused = await route(ctx(new Request('http://x/api/f', { method: 'POST', body: short })));
    expect(refused.status).toBe(400);
    const json = await route(ctx(new Request('http://x/api/f', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: '{"name":"Quay"}' })));
    expect(json.status).toBe(415);
  });

  test('publicEndpoint: no account needed, the user is null; the same envelope', async () => {
    const route = m.publicEndpoint({ body: z.object({ n: z.number() }), status: 202 }, async ({ user, body }) => ({ who: user?.id ?? null, n: body.n }));
    const res = await route(ctx(new Request('http://x/api/p', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: '{"n":3}' }), { user: null }));
    expect(res.status).toBe(202);
    expect(await res.json()).toEqual({ data: { who: null, n: 3 } });
    expect(route.schemas.capability).toBe('public');
  });

  test('a capability route refuses before it reads anything', async () => {
    let ran = false;
    const route = m.endpoint({ capability: 'users.manage', form: z.object({}) }, async () => (ran = true));
    expect((await route(ctx(new Request('http://x/api/u', { method: 'POST' }), { user: null }))).status).toBe(401);
    expect((await route(ctx(new Request('http://x/api/u', { method: 'POST' })))).status).toBe(403);
    expect(ran).toBe(false);
  });

  test('rawEndpoint hands over the exact bytes received (a signature is checked on them) and caps them', async () => {
    const body = new Uint8Array([0x7b, 0x22, 0x61, 0x22, 0x3a, 0x20, 0x31, 0x7d, 0x0a, 0xff]); // '{"a": 1}\n' and a stray byte
    const route = m.rawEndpoint({ capability: 'public', maxBytes: 16 }, async ({ raw }) => ({ bytes: [...raw] }));
    const res = await route(ctx(new Request('http://x/api/hook', { method: 'POST', body }), { user: null }));
    expect(await res.json()).toEqual({ data: { bytes: [...body] } });
    const big = await route(ctx(new Request('http://x/api/hook', { method: 'POST', body: new Uint8Array(17) }), { user: null }));
    expect(big.status).toBe(413);
    expect(route.schemas.raw).toBe(true);
  });
});

describe('errorEnvelope()', () => {
  test('is what toErrorResponse() answers, as data (a batch answers it per item)', async () => {
    const errors = [new AppErrorClass('transition_refused', 'Not from here.', { from: 'on_hire' }), new z.ZodError([]), new Error('boom')];
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    for (const err of errors) {
      const res = m.toErrorResponse(err);
      const { status, error } = m.errorEnvelope(err);
      expect(status).toBe(res.status);
      expect({ error }).toEqual(await res.json());
    }
  });
  test('an AppError carries its headers to the answer (Retry-After on a rate limit)', () => {
    const res = m.toErrorResponse(new AppErrorClass('rate_limited', 'Slow down.', undefined, { 'Retry-After': '60' }));
    expect(res.status).toBe(429);
    expect(res.headers.get('Retry-After')).toBe('60');
  });
});
