// One customer must never see or touch another's: a customer user of organisation A asks every page and API route
// under src/pages (listed from the folder, not by hand) about organisation B's bins, trips, orders, requests, loads,
// scans, people, attachments and photos — by id, by GRAI, through filters and through exports — and gets 404 or 403.
// The few routes that answer anyone (sign-in, the public bin page, health) are listed below with the reason, and
// even they must not show a word of B. A new route fails here until it has an example value for its parameters.
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { randomUUID } from 'node:crypto';
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIRequestContext, APIResponse, BrowserContext } from 'playwright-core';
import { useApp, ROOT, newContext, signIn, operatorToday } from '../support/app';
import { one, rows, closeDb } from '../support/db';
import { DEMO_LOGINS, DEMO_PASSWORD, SECOND_CUSTOMER_LOGIN } from '@/db/seed/demo-logins.mjs';
import { accessFor, can } from '@/lib/permissions';

const t = useApp();
const PAGES = join(ROOT, 'src/pages');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
type Method = (typeof METHODS)[number];

interface Route {
  file: string;
  pattern: string;
  methods: Method[];
}

/** Every page and route file, with its URL pattern and the methods it answers. */
function routes(): Route[] {
  const out: Route[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const p = join(dir, e.name);
      if (e.isDirectory()) {
        walk(p);
        continue;
      }
      if (!/\.(astro|ts)$/.test(e.name)) continue;
      const rel = relative(PAGES, p);
      const pattern = `/${rel.replace(/\.(astro|ts)$/, '').replace(/(^|\/)index$/, '')}`;
      const src = readFileSync(p, 'utf8');
      const methods: Method[] = e.name.endsWith('.astro')
        ? ['GET', ...(/request\.method\s*===?\s*'POST'/.test(src) ? (['POST'] as const) : [])]
        : METHODS.filter((m) => new RegExp(`export\\s+(const|async\\s+function|function)\\s+${m}\\b`).test(src));
      out.push({ file: rel, pattern: pattern === '/' ? '/' : pattern.replace(/\/$/, ''), methods });
    }
  };
  walk(PAGES);
  return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

/** What belongs to organisation B (and, for contrast, a bin of A's own). */
interface Other {
  orgId: number;
  userId: number;
  siteId: number;
  binId: number;
  grai: string;
  serial: string;
  tripId: number;
  orderId: number;
  loadRef: string;
  eventId: number;
  collectionId: number;
  damageId: number;
  photoId: number;
  viewId: number;
  markers: string[];
  ownGrai: string;
  ownBinId: number;
  inspectionId: number;
  countId: number;
  countLineId: number;
  repairId: number;
  statementId: number;
  invoiceId: number;
}

let other: Other;
let asA: APIRequestContext;
let asB: APIRequestContext;
const contexts: BrowserContext[] = [];

async function signedIn(email: string): Promise<APIRequestContext> {
  const ctx = await newContext(t.browser, t.app);
  contexts.push(ctx);
  const page = await ctx.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/login'));
  await page.close();
  return ctx.request;
}

/** This month's count of a site, sent through the portal's count page (nothing ticked: every bin a difference). */
async function countOf(api: APIRequestContext, siteId: number): Promise<{ countId: number; countLineId: number }> {
  const res = await api.post(`/portal/counts/${siteId}`, { multipart: { method: 'ticked' }, headers: { Origin: t.app.url }, maxRedirects: 0 });
  // 303 when sent; 409 when the site is counted for this month already (another test counted it)
  expect([303, 409], await res.text()).toContain(res.status());
  const count = await one<{ id: number }>(`SELECT id FROM site_counts WHERE site_id = $1 ORDER BY id DESC LIMIT 1`, [siteId]);
  const line = await one<{ id: number } | undefined>(`SELECT id FROM site_count_lines WHERE count_id = $1 ORDER BY id LIMIT 1`, [count.id]);
  return { countId: count.id, countLineId: line?.id ?? 1 };
}

// The smallest valid PNG (1 × 1, grey): the photo B uploads.
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg==', 'base64');

beforeAll(async () => {
  const customerA = DEMO_LOGINS.find((l) => l.role === 'customer')!;
  asA = await signedIn(customerA.email);
  asB = await signedIn(SECOND_CUSTOMER_LOGIN.email);
  const b = await one<{ org_id: number; user_id: number; org_name: string; contact: string; user_name: string }>(
    `SELECT o.id AS org_id, u.id AS user_id, o.name AS org_name, o.contact_email AS contact, u.name AS user_name
       FROM users u JOIN organisations o ON o.id = u.organisation_id WHERE u.email = $1`,
    [SECOND_CUSTOMER_LOGIN.email],
  );
  const a = await one<{ org_id: number }>(`SELECT organisation_id AS org_id FROM users WHERE email = $1`, [customerA.email]);
  expect(a.org_id, 'the two customer logins belong to two organisations').not.toBe(b.org_id);
  const bin = await one<{ id: number; grai: string; serial: string }>(`SELECT id, grai, serial FROM assets WHERE customer_id = $1 AND status = 'on_hire' ORDER BY id LIMIT 1`, [
    b.org_id,
  ]);
  const own = await one<{ id: number; grai: string }>(`SELECT id, grai FROM assets WHERE customer_id = $1 AND status = 'on_hire' ORDER BY id LIMIT 1`, [a.org_id]);
  const sites = await rows<{ id: number; name: string; code: string }>(`SELECT id, name, code FROM sites WHERE organisation_id = $1 ORDER BY id`, [b.org_id]);
  const trip = await one<{ id: number }>(`SELECT id FROM trips WHERE customer_id = $1 ORDER BY id DESC LIMIT 1`, [b.org_id]);
  const order = await one<{ id: number; reference: string }>(`SELECT id, reference FROM hire_orders WHERE customer_id = $1 ORDER BY id DESC LIMIT 1`, [b.org_id]);
  const event = await one<{ id: number }>(`SELECT id FROM scan_events WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]);
  for (const [what, v] of Object.entries({ bin, own, trip, order, event })) expect(v, `the demo pool has ${what} for the test`).toBeDefined();
  expect(sites.length).toBeGreaterThan(0);

  // B's own photo, collection request and damage report, made as B makes them.
  const up = await asB.post('/api/attachments', { multipart: { purpose: 'photo', file: { name: 'bin.png', mimeType: 'image/png', buffer: PNG } }, headers: { Origin: t.app.url } });
  expect(up.status(), await up.text()).toBe(201);
  const photoId = ((await up.json()) as { data: { id: number } }).data.id;
  for (const form of ['collection-request', 'damage-report']) {
    const multipart: Record<string, string> =
      form === 'collection-request'
        ? { quantity: '3', contactName: b.user_name, contactEmail: SECOND_CUSTOMER_LOGIN.email, note: 'Three folded by dock 2' }
        : { description: 'Bent corner post after a forklift knock', contactName: b.user_name, contactEmail: SECOND_CUSTOMER_LOGIN.email };
    const res = await asB.post(`/api/public/bins/${bin.grai}/${form}`, { multipart, headers: { Origin: t.app.url } });
    expect(res.status(), `${form}: ${await res.text()}`).toBe(201);
  }
  // The request the report made, or the one at the bin's site it joined (merged requests).
  const collection = await one<{ id: number }>(
    `SELECT id FROM collection_requests WHERE (asset_id = $1 OR site_id = (SELECT site_id FROM assets WHERE id = $1)) AND status IN ('open', 'scheduled')
      ORDER BY last_reported_at DESC, id DESC LIMIT 1`,
    [bin.id],
  );
  const damage = await one<{ id: number }>(`SELECT id FROM damage_reports WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]);
  const load = await one<{ reference: string } | undefined>(
    `SELECT l.reference FROM loads l JOIN hire_orders ho ON ho.id = l.hire_order_id WHERE ho.customer_id = $1 ORDER BY l.id DESC LIMIT 1`,
    [b.org_id],
  );
  const view = await one<{ id: number } | undefined>(`SELECT id FROM grid_views ORDER BY id LIMIT 1`);
  other = {
    orgId: b.org_id,
    userId: b.user_id,
    siteId: sites[0]!.id,
    binId: bin.id,
    grai: bin.grai,
    serial: bin.serial,
    tripId: trip.id,
    orderId: order.id,
    loadRef: load?.reference ?? 'LD-NONE-1',
    eventId: event.id,
    collectionId: collection.id,
    damageId: damage.id,
    photoId,
    viewId: view?.id ?? 1,
    inspectionId: (await one<{ id: number } | undefined>(`SELECT id FROM inspections WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]))?.id ?? 1,
    ...(await countOf(asB, sites[0]!.id)),
    repairId: (await one<{ id: number } | undefined>(`SELECT id FROM repair_orders ORDER BY id LIMIT 1`))?.id ?? 1,
    statementId: (await one<{ id: number }>(`SELECT id FROM statements WHERE customer_id = $1 ORDER BY id LIMIT 1`, [b.org_id])).id,
    invoiceId: (await one<{ id: number }>(`SELECT id FROM invoices WHERE customer_id = $1 ORDER BY id LIMIT 1`, [b.org_id])).id,
    // Words only B's data contains: if any answer to A shows one of them, something leaked.
    markers: [
      b.org_name,
      b.contact,
      SECOND_CUSTOMER_LOGIN.email,
      b.user_name,
      order.reference,
      ...sites.flatMap((s) => [s.name, s.code]),
      'Three folded by dock 2',
      'forklift knock',
    ],
    ownGrai: own.grai,
    ownBinId: own.id,
  };
});

afterAll(async () => {
  for (const c of contexts) await c.close();
  await closeDb();
});

/** B's value for each route parameter; a parameter not known here fails the test. */
function exampleUrl(pattern: string, o: Other): string {
  const known: Record<string, string> = {
    '/8003/[...value]': `/8003/${o.grai}`,
    '/api/admin/bin-types/[id]': `/api/admin/bin-types/1`,
    '/api/admin/customers/[id]': `/api/admin/customers/${o.orgId}`,
    '/api/admin/sites/[id]': `/api/admin/sites/${o.siteId}`,
    '/api/admin/users/[id]': `/api/admin/users/${o.userId}`,
    // Liner specs and suppliers belong to the operator, not to a customer: any id will do.
    '/api/admin/liner-specs/[id]': '/api/admin/liner-specs/1',
    '/api/admin/liner-suppliers/[id]': '/api/admin/liner-suppliers/1',
    // Trailers are the operator's admin data: any id will do.
    '/api/admin/trailers/[id]': '/api/admin/trailers/1',
    '/liners/stock/[depot]': '/liners/stock/1',
    // A lot's trace names the customers who received its liners: planners only, whoever's lot it is.
    '/liners/lots/[id]/trace': '/liners/lots/1/trace',
    '/api/liners/lots/[id]/trace.csv': '/api/liners/lots/1/trace.csv',
    '/api/liners/lots/[id]/status': '/api/liners/lots/1/status',
    '/api/liners/lots/[id]/notices': '/api/liners/lots/1/notices',
    // Purchase orders are the operator's, between it and its liner suppliers.
    '/liners/purchase-orders/[id]': '/liners/purchase-orders/1',
    '/api/liners/purchase-orders/[id]/mail': '/api/liners/purchase-orders/1/mail',
    '/api/liners/purchase-orders/[id]/close': '/api/liners/purchase-orders/1/close',
    // A transfer between the operator's depots (the sent move's id).
    '/api/liners/transfers/[id]/arrive': '/api/liners/transfers/1/arrive',
    '/api/admin/users/[id]/invite': `/api/admin/users/${o.userId}/invite`,
    '/api/admin/users/[id]/sessions': `/api/admin/users/${o.userId}/sessions`,
    '/api/attachments/[id]': `/api/attachments/${o.photoId}`,
    '/api/bins/[grai]/edit': `/api/bins/${o.grai}/edit`,
    '/api/fleet/flags/[id]/review': `/api/fleet/flags/${o.eventId}/review`,
    '/api/fleet/views/[id]': `/api/fleet/views/${o.viewId}`,
    '/api/loads/[ref]/bins': `/api/loads/${o.loadRef}/bins`,
    '/api/loads/[ref]/dispatch': `/api/loads/${o.loadRef}/dispatch`,
    // Truck runs belong to the operator (a customer sees only the run day on its own requests): any id will do.
    '/api/planning/runs/[id]': '/api/planning/runs/1',
    '/api/planning/runs/[id]/status': '/api/planning/runs/1/status',
    '/planning/runs/[id]': '/planning/runs/1',
    '/planning/runs/[id]/sheet': '/planning/runs/1/sheet',
    '/yard/runs/[id]': '/yard/runs/1',
    '/api/yard/runs/[id]': '/api/yard/runs/1',
    '/api/planning/repositioning/plans/[id]/withdraw': '/api/planning/repositioning/plans/1/withdraw',
    '/api/planning/orders/[id]': `/api/planning/orders/${o.orderId}`,
    '/api/planning/orders/[id]/status': `/api/planning/orders/${o.orderId}/status`,
    '/api/public/bins/[grai]/[form]': `/api/public/bins/${o.grai}/collection-request`,
    '/api/requests/[kind]/[id]': `/api/requests/collection/${o.collectionId}`,
    '/api/scan-events/[id]/undo': `/api/scan-events/${o.eventId}/undo`,
    '/api/scan-events/[id]/void': `/api/scan-events/${o.eventId}/void`,
    '/bins/[grai]': `/bins/${o.grai}`,
    '/bins/[grai]/edit': `/bins/${o.grai}/edit`,
    '/loads/[ref]': `/loads/${o.loadRef}`,
    '/loads/[ref]/note': `/loads/${o.loadRef}/note`,
    // The delivery link is a capability: whoever holds the token may confirm. A guessed one finds nothing.
    '/loads/confirm/[token]': `/loads/confirm/${'A'.repeat(43)}`,
    '/planning/orders/[id]': `/planning/orders/${o.orderId}`,
    '/planning/orders/[id]/fill': `/planning/orders/${o.orderId}/fill`,
    '/trips/[id]': `/trips/${o.tripId}`,
    '/api/inspections/[id]/amend': `/api/inspections/${o.inspectionId}/amend`,
    '/bins/[grai]/inspect': `/bins/${o.grai}/inspect`,
    '/inspections/[id]': `/inspections/${o.inspectionId}`,
    '/portal/counts/[site]': `/portal/counts/${o.siteId}`,
    '/planning/counts/[id]': `/planning/counts/${o.countId}`,
    '/api/planning/counts/[id]/lines/[line]': `/api/planning/counts/${o.countId}/lines/${o.countLineId}`,
    // Repair orders are the operator's own (customers reach none of them); any order will do.
    '/repairs/[id]': `/repairs/${o.repairId}`,
    '/api/repairs/[id]': `/api/repairs/${o.repairId}`,
    '/api/repairs/[id]/work': `/api/repairs/${o.repairId}/work`,
    '/api/repairs/[id]/retire': `/api/repairs/${o.repairId}/retire`,
    '/portal/statements/[id]': `/portal/statements/${o.statementId}`,
    '/api/portal/statements/[id].csv': `/api/portal/statements/${o.statementId}.csv`,
    '/billing/statements/[id]': `/billing/statements/${o.statementId}`,
    '/api/billing/statements/[id].csv': `/api/billing/statements/${o.statementId}.csv`,
    '/portal/invoices/[id]': `/portal/invoices/${o.invoiceId}`,
    '/billing/invoices/[id]': `/billing/invoices/${o.invoiceId}`,
    '/api/billing/invoices/[id]/payments': `/api/billing/invoices/${o.invoiceId}/payments`,
    '/api/billing/invoices/[id]/credit-notes': `/api/billing/invoices/${o.invoiceId}/credit-notes`,
    '/api/portal/invoices/[id]/checkout': `/api/portal/invoices/${o.invoiceId}/checkout`,
  };
  if (!pattern.includes('[')) return pattern;
  const url = known[pattern];
  if (!url) throw new Error(`no example value of organisation B for ${pattern}: add one to this test`);
  return url;
}

/** Filters naming B's things, tried on every GET (routes that read none of them simply ignore them). */
function filterQueries(o: Other): string[] {
  return [
    `customer=${o.orgId}&customerId=${o.orgId}&organisationId=${o.orgId}&org=${o.orgId}`,
    `site=${o.siteId}&siteId=${o.siteId}&depot=${o.siteId}`,
    `q=${o.grai}&grai=${o.grai}&serial=${o.serial}&ids=${o.binId}&asset=${o.binId}&assetId=${o.binId}`,
    `trip=${o.tripId}&order=${o.orderId}&orderId=${o.orderId}&hireOrderId=${o.orderId}&request=${o.collectionId}`,
    `q=${o.serial}&format=csv`,
  ];
}

/** A body naming B's things, sent to every route that takes one. */
function genericBody(o: Other) {
  return {
    clientEventId: randomUUID(),
    grai: o.grai,
    assetId: o.binId,
    siteId: o.siteId,
    customerId: o.orgId,
    hireOrderId: o.orderId,
    orderId: o.orderId,
    tripId: o.tripId,
    ids: [o.binId],
    photoIds: [o.photoId],
    action: 'fold',
    status: 'cancelled',
    version: 0,
    quantity: 1,
    reason: 'isolation check',
    email: SECOND_CUSTOMER_LOGIN.email,
  };
}

/**
 * Requests a customer may send at all, with bodies that are valid in every other respect: each names one of B's
 * things (or a place of B's) and must be refused with 404 or 403, recording nothing.
 */
function targetedWrites(o: Other): Array<{ label: string; method: Method; path: string; data?: unknown; multipart?: Record<string, string>; portal?: boolean }> {
  const scan = (extra: Record<string, unknown>) => ({ clientEventId: randomUUID(), ...extra });
  return [
    { label: "scan B's bin by GRAI", method: 'POST', path: '/api/scan-events', data: scan({ grai: o.grai, action: 'fold' }) },
    { label: "scan B's bin by its id", method: 'POST', path: '/api/scan-events', data: scan({ assetId: o.binId, action: 'fold' }) },
    { label: "scan B's bin by its serial", method: 'POST', path: '/api/scan-events', data: scan({ grai: o.serial, action: 'fold' }) },
    { label: "scan one's own bin at B's site", method: 'POST', path: '/api/scan-events', data: scan({ grai: o.ownGrai, action: 'fold', siteId: o.siteId }) },
    { label: 'confirm a delivery with a guessed token', method: 'POST', path: '/api/public/loads/confirm', multipart: { token: 'A'.repeat(43), receivedByName: 'Someone else' } },
    {
      label: "order bins to B's site",
      method: 'POST',
      path: '/portal/orders/new',
      multipart: { binTypeId: '1', quantity: '2', neededBy: 'TODAY', deliverySiteId: String(o.siteId) },
      portal: true,
    },
    {
      label: "ask for a collection at B's site",
      method: 'POST',
      path: '/portal/collections',
      multipart: { siteId: String(o.siteId), quantity: '2', readyOn: 'TODAY' },
      portal: true,
    },
    {
      label: "count B's site",
      method: 'POST',
      path: `/portal/counts/${o.siteId}`,
      multipart: { method: 'scanned', counted: o.grai },
      portal: true,
    },
    {
      label: "pay B's invoice online",
      method: 'POST',
      path: `/api/portal/invoices/${o.invoiceId}/checkout`,
      data: { amount: '1.00' },
      portal: true,
    },
    {
      label: "record a fill in B's bin",
      method: 'POST',
      path: '/portal/fill',
      multipart: { clientEventId: randomUUID(), grai: o.grai, product: 'Sunflower oil', volumeL: '900', seals: 'TE900001' },
      portal: true,
    },
    { label: "report damage on B's bin", method: 'POST', path: '/portal/damage', multipart: { grai: o.grai, description: 'Bent corner post' }, portal: true },
    { label: "confirm B's load", method: 'POST', path: '/portal/deliveries', multipart: { reference: o.loadRef, receivedByName: 'Someone else' }, portal: true },
    { label: "limit B's user to a site", method: 'POST', path: '/portal/people?form=sites', multipart: { userId: String(o.userId), siteIds: String(o.siteId) }, portal: true },
    {
      label: "invite a colleague limited to B's site",
      method: 'POST',
      path: '/portal/people?form=invite',
      multipart: { name: 'New Person', email: `new-${Date.now()}@e2e.example`, siteIds: String(o.siteId) },
      portal: true,
    },
    {
      label: "B's bin inside a batch",
      method: 'POST',
      path: '/api/scan-events',
      data: { events: [scan({ grai: o.grai, action: 'fold' }), scan({ assetId: o.binId, action: 'discharge' })] },
    },
  ];
}

/** Routes that answer anyone by design, or answer A with A's own things; never with one that shows B. */
const OPEN_TO_ALL: Record<string, string> = {
  '/portal/orders': "A's own orders",
  '/portal/orders/new': "A's order form (A's sites only); a site of B's: below",
  '/portal/collections': "A's own collection requests; a site of B's: below",
  '/portal/damage': "A's own damage reports; a bin of B's: below",
  '/portal/deliveries': "A's own deliveries; a load of B's: below",
  '/portal/people': "A's own people (for its portal admin); B's people and sites: below",
  '/portal/counts': "A's own sites' monthly counts; a site of B's: by its id",
  '/portal/statements': "A's own statements (none for a user limited to some sites); B's statement: by its id",
  '/portal/invoices': "A's own invoices (none for a user limited to some sites); B's invoice: by its id",
  '/portal/fill': "A's own bins to fill and their fill planner (B's GRAI in the filters finds none); a fill in B's bin: below",
  '/': 'sends each role to its home',
  '/forbidden': 'the 403 page',
  '/login': 'the sign-in page',
  '/account': "one's own account",
  '/account/invite': 'an invitation token page (a guessed token finds nothing)',
  '/account/reset': 'a reset token page (a guessed token finds nothing)',
  '/api/account/password': "one's own password, by token",
  '/api/account/reset': 'asks for a reset mail; answers the same whoever the address is',
  '/api/account/sessions': "one's own sessions",
  '/api/account/mail': "one's own choice about reminder mail",
  '/api/health': 'health, no data',
  '/8003/[...value]': 'the public bin page: what any passer-by sees (the return instructions and two forms), nothing of its customer',
  '/api/public/bins/[grai]/[form]': "the public page's forms: anyone who finds a bin may report it",
  '/api/public/loads/confirm': 'the delivery link: confirms only the load whose token it carries (a guessed one: below)',
  '/api/attachments': "an upload is stored as the uploader's organisation's own",
  '/bins/search': 'the find-a-bin box; it echoes only what was typed',
  '/bins/find': "sends a found bin to its page, anything else back to the box with the reason (checked: never to B's bin)",
  '/portal': "the customer's own start page",
};

/** Requests that end the caller's own sessions (sent after the rest). */
const ENDS_OWN_SESSION = ['POST /api/account/sessions'];

function expectNoMarker(body: string, where: string, o: Other = other) {
  for (const m of o.markers) expect(body.includes(m), `${where} shows "${m}" of what it may not see`).toBe(false);
}

async function send(api: APIRequestContext, method: Method, path: string, data: unknown, o: Other): Promise<APIResponse> {
  return api.fetch(path, { method, data: method === 'GET' ? undefined : (data ?? genericBody(o)), headers: { Origin: t.app.url }, maxRedirects: 0 });
}

/** Every route, every method, B's example values and the filters: the problems found (none expected). */
async function walk(ask: () => APIRequestContext, o: Other): Promise<{ problems: string[]; asked: number }> {
  const problems: string[] = [];
  let asked = 0;
  // A request that ends the asker's own sessions goes last, so the walk runs signed in throughout.
  const calls = routes().flatMap((r) => r.methods.map((method) => ({ r, method })));
  const last = (c: { r: Route; method: Method }) => (ENDS_OWN_SESSION.includes(`${c.method} ${c.r.pattern}`) ? 1 : 0);
  calls.sort((x, y) => last(x) - last(y));
  for (const { r, method } of calls) {
    const base = exampleUrl(r.pattern, o);
    const open = r.pattern in OPEN_TO_ALL;
    const urls = method === 'GET' ? [base, ...filterQueries(o).map((q) => `${base}${base.includes('?') ? '&' : '?'}${q}`)] : [base];
    for (const url of urls) {
      const res = await send(ask(), method, url, undefined, o);
      asked += 1;
      const status = res.status();
      const body = await res.text();
      const where = `${method} ${url} → ${status}`;
      if (status >= 500) problems.push(`${where}: server error`);
      for (const m of o.markers) if (body.includes(m)) problems.push(`${where}: shows "${m}"`);
      const location = res.headers().location ?? '';
      if (location.includes(`/bins/${o.grai}`)) problems.push(`${where}: sends the asker to the bin it may not see`);
      // A body the route's schema refuses (400) names nothing; the targeted writes send valid ones.
      const refusedUnread = method !== 'GET' && status === 400 && customerMay(url);
      if (!open && !refusedUnread && status !== 403 && status !== 404) problems.push(`${where}: expected 404 or 403 (access ${accessFor(url.split('?')[0]!)})`);
      if (!customerMay(url) && status !== 403) problems.push(`${where}: a path the customer role may not open answers other than 403`);
    }
  }
  return { problems, asked };
}

const TRACE = `SELECT (SELECT count(*)::int FROM scan_events WHERE asset_id = $1) AS events, (SELECT version FROM assets WHERE id = $1) AS version,
    (SELECT count(*)::int FROM hire_orders WHERE delivery_site_id = $2) AS orders, (SELECT count(*)::int FROM collection_requests WHERE site_id = $2) AS collections,
    (SELECT count(*)::int FROM damage_reports WHERE asset_id = $1) AS damage, (SELECT count(*)::int FROM loads WHERE status = 'delivered') AS delivered,
    (SELECT count(*)::int FROM user_sites) AS limits, (SELECT count(*)::int FROM users) AS people,
    (SELECT count(*)::int FROM site_counts WHERE site_id = $2) AS counts, (SELECT count(*)::int FROM site_count_lines WHERE resolution IS NOT NULL) AS settled`;

/** The targeted writes: each refused with 404 or 403, and nothing of the other's (nor the asker's own bin) changed. */
async function writes(api: APIRequestContext, o: Other): Promise<void> {
  const before = await one<Record<string, number>>(TRACE, [o.binId, o.siteId]);
  const ownBefore = await one<{ events: number }>(`SELECT count(*)::int AS events FROM scan_events WHERE asset_id = $1`, [o.ownBinId]);
  const problems: string[] = [];
  for (const w of targetedWrites(o)) {
    const multipart = w.multipart && Object.fromEntries(Object.entries(w.multipart).map(([k, v]) => [k, v === 'TODAY' ? operatorToday() : v]));
    const res = multipart
      ? await api.fetch(w.path, { method: w.method, multipart, headers: { Origin: t.app.url }, maxRedirects: 0 })
      : await send(api, w.method, w.path, w.data, o);
    const text = await res.text();
    expectNoMarker(text, w.label, o);
    if (w.data && typeof w.data === 'object' && 'events' in w.data) {
      const results = (JSON.parse(text) as { data: { results: Array<{ ok: boolean; status?: number }> } }).data.results;
      for (const x of results) if (x.ok || (x.status !== 403 && x.status !== 404)) problems.push(`${w.label}: ${JSON.stringify(x)}`);
    } else if (res.status() !== 403 && res.status() !== 404) problems.push(`${w.label}: ${res.status()} ${text.slice(0, 300)}`);
  }
  expect(problems, problems.join('\n')).toEqual([]);
  expect(await one<Record<string, number>>(TRACE, [o.binId, o.siteId])).toEqual(before);
  expect(await one<{ events: number }>(`SELECT count(*)::int AS events FROM scan_events WHERE asset_id = $1`, [o.ownBinId])).toEqual(ownBefore);
}

function customerMay(path: string): boolean {
  const access = accessFor(path.split('?')[0]!);
  return access === 'public' || access === 'signed-in' || (access !== 'denied' && can('customer', access));
}

describe("a customer of A asks every route about B's things", () => {
  test('the walk finds the routes (a floor, not a list)', () => {
    const all = routes();
    expect(all.length).toBeGreaterThan(60);
    expect(all.map((r) => r.pattern)).toContain('/api/attachments/[id]');
    expect(
      all.filter((r) => r.methods.length === 0),
      'every route file answers some method',
    ).toEqual([]);
  });

  test('every route: 404 or 403, by id, by GRAI, through filters and exports; open routes show nothing of B', async () => {
    const { problems, asked } = await walk(() => asA, other);
    asA = await signedIn(DEMO_LOGINS.find((l) => l.role === 'customer')!.email);
    expect(asked).toBeGreaterThan(200);
    expect(problems, problems.join('\n')).toEqual([]);
  }, 300_000);

  test("writes naming B's bin, B's site, B's load, B's people or B's photo are refused and record nothing", async () => {
    await writes(asA, other);
  });

  test("B's photo answers B and staff, and 404 to A", async () => {
    expect((await asB.get(`/api/attachments/${other.photoId}`)).status()).toBe(200);
    const res = await asA.get(`/api/attachments/${other.photoId}`);
    expect(res.status()).toBe(404);
  });

  test("B's bin page answers B, and 404 to A", async () => {
    const own = await asB.get(`/bins/${other.grai}`);
    expect(own.status()).toBe(200);
    // The markers are words B's own answers do contain: the walk above would have seen them.
    expect(await own.text()).toContain(other.markers[0]);
    const res = await asA.get(`/bins/${other.grai}`);
    expect(res.status()).toBe(404);
    expectNoMarker(await res.text(), `A's view of /bins/${other.grai}`);
  });
});

describe("a user of A limited to one site asks every route about A's other site", () => {
  let asL: APIRequestContext;
  let sameOrg: Other;
  beforeAll(async () => {
    const a = await one<{ org_id: number; admin_id: number; admin_name: string }>(
      `SELECT organisation_id AS org_id, id AS admin_id, name AS admin_name FROM users WHERE email = $1`,
      [DEMO_LOGINS.find((l) => l.role === 'customer')!.email],
    );
    // The other site: the one of A's with a bin on hire (the demo pool has bins at both).
    const sites = await rows<{ id: number; name: string; code: string; n: number }>(
      `SELECT s.id, s.name, s.code, (SELECT count(*)::int FROM assets x WHERE x.site_id = s.id AND x.status = 'on_hire') AS n
         FROM sites s WHERE s.organisation_id = $1 ORDER BY s.id`,
      [a.org_id],
    );
    expect(sites.length, 'the demo customer has two sites').toBeGreaterThanOrEqual(2);
    const x = sites.find((s) => s.n > 0)!;
    const mine = sites.find((s) => s.id !== x.id)!;
    const email = `limited-${Date.now().toString(36)}@haldenoils.example`;
    const user = await one<{ id: number }>(
      `INSERT INTO users (email, name, password_hash, role, organisation_id) SELECT $1, 'Site-limited colleague', password_hash, 'customer', organisation_id FROM users WHERE id = $2 RETURNING id`,
      [email, a.admin_id],
    );
    await one(`INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)`, [user.id, mine.id]);
    asL = await signedIn(email);
    const bin = await one<{ id: number; grai: string; serial: string }>(`SELECT id, grai, serial FROM assets WHERE site_id = $1 AND status = 'on_hire' ORDER BY id LIMIT 1`, [
      x.id,
    ]);
    const own = await one<{ id: number; grai: string } | undefined>(
      `SELECT a.id, a.grai FROM assets a JOIN trips t ON t.id = a.current_trip_id WHERE a.customer_id = $1 AND a.status = 'on_hire' AND a.site_id = $2 ORDER BY a.id LIMIT 1`,
      [a.org_id, mine.id],
    );
    const trip = await one<{ id: number }>(`SELECT id FROM trips WHERE customer_site_id = $1 ORDER BY id DESC LIMIT 1`, [x.id]);
    const order = await one<{ id: number; reference: string }>(`SELECT id, reference FROM hire_orders WHERE delivery_site_id = $1 ORDER BY id DESC LIMIT 1`, [x.id]);
    const event = await one<{ id: number }>(`SELECT id FROM scan_events WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]);
    // A photo of the other site's bin, uploaded by the organisation's admin (then belonging to that bin).
    const up = await asA.post('/api/attachments', {
      multipart: { purpose: 'photo', file: { name: 'bin.png', mimeType: 'image/png', buffer: PNG } },
      headers: { Origin: t.app.url },
    });
    const photoId = ((await up.json()) as { data: { id: number } }).data.id;
    await one(`UPDATE attachments SET asset_id = $1 WHERE id = $2`, [bin.id, photoId]);
    const request = await asA.post('/portal/collections', {
      multipart: { siteId: String(x.id), quantity: '4', readyOn: operatorToday(), note: 'Four behind the other gate' },
      headers: { Origin: t.app.url },
      maxRedirects: 0,
    });
    expect(request.status()).toBe(303);
    const collection = await one<{ id: number }>(`SELECT id FROM collection_requests WHERE site_id = $1 ORDER BY id DESC LIMIT 1`, [x.id]);
    const view = await one<{ id: number } | undefined>(`SELECT id FROM grid_views ORDER BY id LIMIT 1`);
    sameOrg = {
      orgId: a.org_id,
      userId: a.admin_id,
      siteId: x.id,
      binId: bin.id,
      grai: bin.grai,
      serial: bin.serial,
      tripId: trip.id,
      orderId: order.id,
      loadRef: 'LD-NONE-1',
      eventId: event.id,
      collectionId: collection.id,
      damageId: 0,
      photoId,
      viewId: view?.id ?? 1,
      inspectionId: (await one<{ id: number } | undefined>(`SELECT id FROM inspections WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]))?.id ?? 1,
      ...(await countOf(asA, x.id)),
      repairId: (await one<{ id: number } | undefined>(`SELECT id FROM repair_orders ORDER BY id LIMIT 1`))?.id ?? 1,
      // A statement is the whole organisation's: a user limited to one site reads none, not even their own's.
      statementId: (await one<{ id: number }>(`SELECT id FROM statements WHERE customer_id = $1 ORDER BY id LIMIT 1`, [a.org_id])).id,
      invoiceId: (await one<{ id: number }>(`SELECT id FROM invoices WHERE customer_id = $1 ORDER BY id LIMIT 1`, [a.org_id])).id,
      // Words only the other site's things contain (the organisation's own name is the limited user's too).
      markers: [x.name, x.code, order.reference, 'Four behind the other gate'],
      ownGrai: own?.grai ?? bin.grai,
      ownBinId: own?.id ?? bin.id,
    };
  });

  test('every route: 404 or 403 for the other site, and no word of it', async () => {
    const { problems } = await walk(() => asL, sameOrg);
    expect(problems, problems.join('\n')).toEqual([]);
  }, 300_000);

  test("writes naming the other site's bin, the site itself or its photo are refused and record nothing", async () => {
    const fresh = await signedIn((await one<{ email: string }>(`SELECT email FROM users WHERE name = 'Site-limited colleague' ORDER BY id DESC LIMIT 1`)).email);
    await writes(fresh, sameOrg);
  });

  test("the organisation's admin still sees the other site's bin; the limited user gets 404 for it and its photo", async () => {
    expect((await asA.get(`/bins/${sameOrg.grai}`)).status()).toBe(200);
    const fresh = await signedIn((await one<{ email: string }>(`SELECT email FROM users WHERE name = 'Site-limited colleague' ORDER BY id DESC LIMIT 1`)).email);
    expect((await fresh.get(`/bins/${sameOrg.grai}`)).status()).toBe(404);
    expect((await fresh.get(`/api/attachments/${sameOrg.photoId}`)).status()).toBe(404);
    const home = await (await fresh.get('/portal')).text();
    for (const m of sameOrg.markers) expect(home).not.toContain(m);
  });
});
