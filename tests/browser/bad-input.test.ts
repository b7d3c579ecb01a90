// Bad input never answers 5xx and never writes half a change: every JSON route
// under src/pages/api is driven over HTTP against the built server with inputs
// generated from its own zod schema (the schemas endpoint() keeps on the route),
// hostile at the leaves (tests/browser/support/zod-arbitrary.ts). fast-check,
// fixed seed, 200 cases per route. Every row inserted or deleted in any table
// is tallied by a trigger the test installs (in a schema of its own, dropped
// after): a refused request must leave every tally as it was. A trigger's tally
// is part of the writing transaction, so a write rolled back leaves it too; a
// tally read costs a fraction of counting every table's rows after each request.
// Requests go out from a loopback address of their own, so the per-address
// limits they use up never touch the other browser tests (127.0.0.1).
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import fc from 'fast-check';
import { readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { request as httpRequest } from 'node:http';
import type { ZodTypeAny } from 'zod';
import { newContext, signIn, useApp, ROOT } from './support/app';
import { db, rows, closeDb } from './support/db';
import { createStaff, freshEmail, closeDb as closeAccountsDb } from './support/accounts';
import { arbitraryFor, queryArbitraryFor } from './support/zod-arbitrary';
import { can, type Capability, type Role } from '@/lib/permissions';
import { scanEventSchema } from '@/lib/scans/scan-schema';
import { tripListQuerySchema } from '@/lib/trips/trip-list-query';
import { collectionRequestFields } from '@/lib/requests/report-forms';
import type { EndpointSchemas } from '@/lib/endpoint.server';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const SEED = 20_261_209;
const RUNS = 200;
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
/** Tables whose rows change without a request's own write: counters of refusals, mail queued after an answer. */
const NOT_COUNTED = new Set(['rate_limits', 'SequelizeMeta', 'SequelizeData', 'dev_mailbox', 'mail_outbox']);

interface Route {
  file: string;
  path: string;
  method: (typeof METHODS)[number];
  schemas: EndpointSchemas;
}

const t = useApp();
const cookies: Partial<Record<Role, string>> = {};
let tables: string[] = [];
const throwawayUsers: number[] = [];
let realGrai = '';
const from = `127.0.${1 + Math.floor(Math.random() * 250)}.${2 + Math.floor(Math.random() * 250)}`;

function apiFiles(dir = join(ROOT, 'src', 'pages', 'api')): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? apiFiles(p) : n.endsWith('.ts') ? [p] : [];
  });
}

async function routes(): Promise<{ driven: Route[]; without: string[] }> {
  const driven: Route[] = [];
  const without: string[] = [];
  for (const file of apiFiles().sort()) {
    const rel = relative(join(ROOT, 'src', 'pages'), file);
    const path = `/${rel.replace(/\.ts$/, '').replace(/\/index$/, '')}`;
    const mod = (await import(/* @vite-ignore */ file)) as Record<string, { schemas?: EndpointSchemas } | undefined>;
    for (const method of METHODS) {
      const handler = mod[method];
      if (!handler) continue;
      if (handler.schemas) driven.push({ file: rel, path, method, schemas: handler.schemas });
      else without.push(`${method} ${path}`);
    }
  }
  return { driven, without };
}

/** Routes whose input is read by a parser of its own, not the endpoint's schema: the shape to generate from. */
const SHAPE_OVERRIDE: Record<string, { query?: ZodTypeAny; body?: ZodTypeAny; form?: ZodTypeAny }> = {
  'GET /api/trips': { query: tripListQuerySchema },
  'POST /api/scan-events': { body: scanEventSchema },
  // The public page's forms hand the request to the intake unread (its rate limits come first): its fields.
  'POST /api/public/bins/[grai]/[form]': { form: collectionRequestFields },
};

/** A generated value as multipart form fields: strings as they are, anything else as its JSON text. */
async function multipart(value: unknown): Promise<{ bytes: Buffer; contentType: string }> {
  const fd = new FormData();
  if (value && typeof value === 'object' && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value)) {
      for (const item of Array.isArray(v) ? v : [v]) fd.append(k, typeof item === 'string' ? item : JSON.stringify(item ?? null));
    }
  }
  const r = new Request('http://form.invalid/', { method: 'POST', body: fd });
  return { bytes: Buffer.from(await r.arrayBuffer()), contentType: r.headers.get('content-type')! };
}

/**
 * Keeps a generated request from changing the demo data other tests rely on
 * when it happens to be valid: stale versions (a refusal, 409), label marks on
 * bins that do not exist.
 */
function tame(key: string, body: unknown): unknown {
  if (!body || typeof body !== 'object' || Array.isArray(body)) return body;
  const b = { ...(body as Record<string, unknown>) };
  if (typeof b.version === 'number') b.version = b.version + 1_000_000_000;
  if (key === 'POST /api/labels/printed' && Array.isArray(b.ids)) b.ids = b.ids.map((i) => (typeof i === 'number' ? i + 2_000_000_000 : i));
  return b;
}

function paramArbitrary(name: string, key: string): fc.Arbitrary<string> {
  const junk = ['0', '-1', '99999999999', 'abc', '%00', '1%00', '%E2%80%AE', '..%2F..%2Fetc', 'null'];
  if (name === 'id' && key.includes('/api/admin/users/')) return fc.constantFrom(...throwawayUsers.map(String), ...junk);
  if (name === 'grai') return fc.constantFrom(realGrai, `${realGrai}%00`, '(8003)09521234100109100028', ...junk);
  if (name === 'form') return fc.constantFrom('collection-request', 'damage-report', ...junk);
  if (name === 'kind') return fc.constantFrom('collection', 'damage', ...junk);
  return fc.constantFrom(...junk);
}

/** Rows inserted or deleted per table since the tallies were installed (see installTallies). */
async function countRows(): Promise<Record<string, number>> {
  const r = await db().query<{ table_name: string; n: string }>('SELECT table_name, n FROM bad_input.writes');
  return Object.fromEntries(r.rows.map((w) => [w.table_name, Number(w.n)]));
}

/** One row-level trigger per counted table that adds each inserted or deleted row to that table's tally. */
async function installTallies() {
  await db().query(`DROP SCHEMA IF EXISTS bad_input CASCADE; CREATE SCHEMA bad_input;
    CREATE TABLE bad_input.writes (table_name text PRIMARY KEY, n bigint NOT NULL DEFAULT 0);
    CREATE FUNCTION bad_input.tally() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN UPDATE bad_input.writes SET n = n + 1 WHERE table_name = TG_TABLE_NAME; RETURN NULL; END $$;`);
  for (const tn of tables) {
    await db().query(`INSERT INTO bad_input.writes (table_name) VALUES ($1)`, [tn]);
    await db().query(`CREATE TRIGGER bad_input_tally AFTER INSERT OR DELETE ON "${tn}" FOR EACH ROW EXECUTE FUNCTION bad_input.tally()`);
  }
}

function send(
  method: string,
  path: string,
  cookie: string | undefined,
  body: string | Buffer | undefined,
  contentType = 'application/json',
): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { Origin: `http://127.0.0.1:${t.app.port}` };
    if (cookie) headers.Cookie = cookie;
    if (body !== undefined) headers['Content-Type'] = contentType;
    const req = httpRequest({ host: '127.0.0.1', port: t.app.port, method, path, headers, localAddress: from }, (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (c) => (text += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, text }));
    });
    req.on('error', reject);
    req.end(body);
  });
}

async function signInAs(role: Role): Promise<string> {
  const login = (DEMO_LOGINS as Array<{ role: Role; email: string }>).find((l) => l.role === role)!;
  const ctx = await newContext(t.browser, t.app);
  const page = await ctx.newPage();
  await signIn(page, login.email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/login'));
  cookies[role] = (await ctx.cookies()).map((c) => `${c.name}=${c.value}`).join('; ');
  await ctx.close();
  return cookies[role]!;
}

/**
 * The role's cookie, signed in again when a generated request ended its sessions ("sign out everywhere" is a valid
 * request too): otherwise every route after it would only ever see 401 and its validation would go untested.
 */
async function cookieFor(role: Role): Promise<string> {
  const probe = await send('GET', '/account', cookies[role], undefined);
  return probe.status === 200 ? cookies[role]! : signInAs(role);
}

function roleFor(capability: Capability | 'public'): Role | null {
  if (capability === 'public') return null;
  const order: Role[] = ['admin', 'planner', 'yard', 'customer'];
  return order.find((r) => can(r, capability)) ?? 'admin';
}

// Read at collection time from the files, so a new route joins the sweep by itself.
const found = await routes();

beforeAll(async () => {
  tables = (await rows<{ table_name: string }>(`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`))
    .map((r) => r.table_name)
    .filter((n) => !NOT_COUNTED.has(n));
  realGrai = (await rows<{ grai: string }>(`SELECT grai FROM assets ORDER BY id DESC LIMIT 1`))[0]!.grai;
  await installTallies();
  for (let i = 0; i < 2; i++) throwawayUsers.push(await createStaff(freshEmail('badinput'), `Probe Person ${i}`, 'probe-password-1', 'planner'));
  // The tallies see writes: the two people just made are two rows of users.
  expect((await countRows()).users, 'the write tallies counted the probe people').toBeGreaterThanOrEqual(2);
  for (const login of DEMO_LOGINS as Array<{ role: Role; email: string }>) await signInAs(login.role);
}, 120_000);
afterAll(async () => {
  await db().query('DROP SCHEMA IF EXISTS bad_input CASCADE');
  await closeDb();
  await closeAccountsDb();
});

describe('bad input over HTTP', () => {
  test('every API route is written with endpoint() and so driven from its schemas', () => {
    expect(found.without.sort()).toEqual([]);
    expect(found.driven.length).toBeGreaterThan(20);
  });

  for (const route of found.driven) {
    test(`${route.method} ${route.path}: ${RUNS} generated requests, never 5xx, a refusal writes nothing`, async () => {
      const key = `${route.method} ${route.path}`;
      const shape = { ...route.schemas, ...SHAPE_OVERRIDE[key] };
      const role = roleFor(route.schemas.capability);
      const cookie = role ? await cookieFor(role) : undefined;
      const params = [...route.path.matchAll(/\[(\w+)\]/g)].map((m) => m[1]!);
      const arb = fc.record({
        params: fc.tuple(...params.map((p) => paramArbitrary(p, key)), fc.constant('')),
        query: shape.query ? queryArbitraryFor(shape.query) : fc.constant({} as Record<string, string>),
        body: shape.body ? arbitraryFor(shape.body) : shape.form ? arbitraryFor(shape.form) : fc.constant(undefined),
      });
      const statuses = new Map<number, number>();
      // The count after a refusal is the count before the next request; only a success (which may write) recounts.
      let last: Record<string, number> | null = null;
      await fc.assert(
        fc.asyncProperty(arb, async ({ params: values, query, body }) => {
          let path = route.path;
          params.forEach((p, i) => (path = path.replace(`[${p}]`, values[i]!)));
          const qs = new URLSearchParams(query).toString();
          const target = qs ? `${path}?${qs}` : path;
          const form = shape.form && !shape.body ? await multipart(tame(key, body)) : null;
          const payload = shape.body ? JSON.stringify(tame(key, body) ?? null) : form?.bytes.toString('latin1');
          const before = last ?? (await countRows());
          last = null;
          const res = form ? await send(route.method, target, cookie, form.bytes, form.contentType) : await send(route.method, target, cookie, payload);
          statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
          expect(res.status, `${route.method} ${target} ${payload?.slice(0, 300) ?? ''} → ${res.text.slice(0, 300)}`).toBeLessThan(500);
          if (res.status >= 300) {
            const after = await countRows();
            last = after;
            expect(after, `${route.method} ${target} was refused (${res.status}) but wrote rows`).toEqual(before);
            if (res.status >= 400 && res.text.startsWith('{')) expect(Object.keys(JSON.parse(res.text))).toEqual(['error']);
          }
        }),
        { seed: SEED, numRuns: RUNS, endOnFailure: true },
      );
      // A signed-in route must be reached: all 401 would mean the sweep never got past the session check.
      if (role) expect(statuses.get(401) ?? 0, `${key} answered 401 to every request`).toBeLessThan(RUNS);
      console.info(
        `[bad-input] ${key}: ${[...statuses]
          .sort((a, b) => a[0] - b[0])
          .map(([st, n]) => `${st}×${n}`)
          .join(' ')}`,
      );
    }, 300_000);
  }
});
