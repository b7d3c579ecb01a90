// WCAG 2 A and AA on every page, for every role that may open it, at phone and desktop width. The rules are
// axe-core's (the well-known engine, not rules of our own); the list of pages comes from src/pages, and each
// dynamic route gets a real example value from the e2e database. A page no role may open fails the test too, so a
// new page is covered the day it lands.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { createRequire } from 'node:module';
import { describe, test, expect, afterAll } from 'vitest';
import type { BrowserContext, Page, Request } from 'playwright-core';
import { useApp, ROOT, PHONE, DESKTOP, signIn } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD, DEMO_LOGINS } from '@/db/seed/demo-logins.mjs';
import { accessFor, can, type Role } from '@/lib/permissions';

const t = useApp();
afterAll(closeDb);

const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/** Every page route under src/pages (API routes and non-page endpoints left out), as its file pattern. */
function pageRoutes(): string[] {
  const base = join(ROOT, 'src/pages');
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir)) {
      const p = join(dir, e);
      if (statSync(p).isDirectory()) walk(p);
      else if (e.endsWith('.astro'))
        out.push(
          '/' +
            relative(base, p)
              .replace(/\.astro$/, '')
              .replace(/(^|\/)index$/, ''),
        );
    }
  };
  walk(base);
  return out.map((r) => (r === '/' ? '/' : r.replace(/\/$/, ''))).sort();
}

type Viewer = Role | 'anonymous';
const VIEWERS: Viewer[] = ['anonymous', 'yard', 'planner', 'admin', 'customer'];

function mayOpen(viewer: Viewer, path: string): boolean {
  const access = accessFor(path.split('?')[0]!);
  if (access === 'public') return true;
  if (viewer === 'anonymous') return false;
  if (access === 'signed-in') return true;
  if (access === 'denied') return false;
  return can(viewer, access);
}

interface Examples {
  anyGrai: string;
  customerGrai: string;
  tripId: number;
  loadRef: string;
  binId: number;
  orderId: number;
  inspectionId: number;
  depotId: number;
  customerSiteId: number;
  countId: number;
  repairId: number;
  runId: number;
  lotId: number;
  purchaseOrderId: number;
  statementId: number;
  invoiceId: number;
}
async function examples(): Promise<Examples> {
  const customer = DEMO_LOGINS.find((l) => l.role === 'customer')!;
  const mine = await one<{ grai: string }>(
    `SELECT a.grai FROM assets a JOIN users u ON u.organisation_id = a.customer_id WHERE u.email = $1 AND a.status = 'on_hire' ORDER BY a.id LIMIT 1`,
    [customer.email],
  );
  const bin = await one<{ grai: string; id: number }>(`SELECT grai, id FROM assets WHERE status = 'available' ORDER BY id LIMIT 1`);
  const trip = await one<{ id: number }>(`SELECT id FROM trips ORDER BY id DESC LIMIT 1`);
  const order = await one<{ id: number }>(`SELECT id FROM hire_orders ORDER BY id DESC LIMIT 1`);
  const inspection = await one<{ id: number }>(`SELECT id FROM inspections WHERE kind <> 'prep_check' ORDER BY id DESC LIMIT 1`);
  for (const [what, v] of Object.entries({ mine, bin, trip, order, inspection })) expect(v, `the demo pool has a ${what} to open`).toBeDefined();
  const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE kind = 'depot' ORDER BY id LIMIT 1`);
  const site = await one<{ id: number }>(`SELECT s.id FROM sites s JOIN users u ON u.organisation_id = s.organisation_id WHERE u.email = $1 ORDER BY s.id LIMIT 1`, [
    customer.email,
  ]);
  // A monthly count with a difference for the planner's page: the one there is, else none (that page's own 404).
  const count = await one<{ id: number } | undefined>(`SELECT id FROM site_counts ORDER BY (status = 'disputed') DESC, id DESC LIMIT 1`);
  // An open order with work on it when the demo has one (the page shows the most then).
  const repair = await one<{ id: number }>(
    `SELECT r.id FROM repair_orders r ORDER BY (r.status = 'open') DESC, EXISTS (SELECT 1 FROM repair_work w WHERE w.repair_order_id = r.id) DESC, r.id LIMIT 1`,
  );
  expect(repair, 'the demo pool has a repair order to open').toBeDefined();
  const lot = await one<{ id: number }>(`SELECT liner_lot_id AS id FROM trips WHERE liner_lot_id IS NOT NULL ORDER BY id DESC LIMIT 1`);
  // The demo has no purchase order: make one of the first spec with a supplier (as the stock page would).
  const po =
    (await one<{ id: number } | undefined>('SELECT id FROM liner_purchase_orders ORDER BY id LIMIT 1')) ??
    (await one<{ id: number }>(
      `INSERT INTO liner_purchase_orders (supplier_id, liner_spec_id, depot_site_id, quantity, price_per_liner, ordered_on, wanted_by)
       SELECT sp.supplier_id, sp.id, $1, 500, 4.5, current_date, current_date + 14 FROM liner_specs sp WHERE sp.supplier_id IS NOT NULL ORDER BY sp.id LIMIT 1 RETURNING id`,
      [depot.id],
    ));
  // The demo customer's issued statement (the seed issues the month before last for every customer).
  const statement = await one<{ id: number }>(`SELECT s.id FROM statements s JOIN users u ON u.organisation_id = s.customer_id WHERE u.email = $1 ORDER BY s.id LIMIT 1`, [
    customer.email,
  ]);
  expect(statement, 'the demo customer has an issued statement').toBeDefined();
  const invoice = await one<{ id: number }>(`SELECT id FROM invoices WHERE statement_id = $1`, [statement.id]);
  expect(invoice, 'the demo statement is invoiced').toBeDefined();
  return {
    statementId: statement.id,
    invoiceId: invoice.id,
    anyGrai: bin.grai,
    customerGrai: mine.grai,
    tripId: trip.id,
    loadRef: '',
    binId: bin.id,
    orderId: order.id,
    inspectionId: inspection.id,
    depotId: depot.id,
    customerSiteId: site.id,
    countId: count?.id ?? 1,
    repairId: repair.id,
    runId: 0,
    lotId: lot.id,
    purchaseOrderId: po.id,
  };
}

/** The URL a viewer opens for a route pattern; a route whose example is not known here fails the test. */
function urlFor(route: string, viewer: Viewer, ex: Examples, confirmPath: string): string {
  const grai = viewer === 'customer' ? ex.customerGrai : ex.anyGrai;
  const known: Record<string, string> = {
    '/8003/[...value]': `/8003/${ex.anyGrai}`,
    '/bins/[grai]': `/bins/${grai}`,
    '/bins/[grai]/edit': `/bins/${ex.anyGrai}/edit`,
    '/bins/[grai]/inspect': `/bins/${ex.anyGrai}/inspect`,
    '/inspections/[id]': `/inspections/${ex.inspectionId}`,
    '/repairs/[id]': `/repairs/${ex.repairId}`,
    '/trips/[id]': `/trips/${ex.tripId}`,
    '/loads/[ref]': `/loads/${ex.loadRef}`,
    '/loads/[ref]/note': `/loads/${ex.loadRef}/note`,
    '/loads/confirm/[token]': confirmPath,
    '/labels/sheet': `/labels/sheet?ids=${ex.binId}`,
    '/planning/orders/[id]': `/planning/orders/${ex.orderId}`,
    '/planning/orders/[id]/fill': `/planning/orders/${ex.orderId}/fill`,
    '/liners/stock/[depot]': `/liners/stock/${ex.depotId}`,
    '/portal/counts/[site]': `/portal/counts/${ex.customerSiteId}`,
    '/planning/counts/[id]': `/planning/counts/${ex.countId}`,
    '/liners/lots/[id]/trace': `/liners/lots/${ex.lotId}/trace`,
    '/liners/purchase-orders/[id]': `/liners/purchase-orders/${ex.purchaseOrderId}`,
    '/billing/statements/[id]': `/billing/statements/${ex.statementId}`,
    '/portal/statements/[id]': `/portal/statements/${ex.statementId}`,
    '/billing/invoices/[id]': `/billing/invoices/${ex.invoiceId}`,
    '/portal/invoices/[id]': `/portal/invoices/${ex.invoiceId}`,
    '/planning/runs/[id]': `/planning/runs/${ex.runId}`,
    '/planning/runs/[id]/sheet': `/planning/runs/${ex.runId}/sheet`,
    '/yard/runs/[id]': `/yard/runs/${ex.runId}`,
  };
  if (route.includes('[')) {
    const url = known[route];
    if (!url) throw new Error(`no example value for the dynamic route ${route}: add one to this test`);
    return url;
  }
  return route;
}

interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: string[];
}
async function axe(page: Page): Promise<Violation[]> {
  await page.evaluate(AXE_SOURCE);
  return page.evaluate(async (tags) => {
    const w = window as unknown as {
      axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: Array<{ id: string; impact: string | null; help: string; nodes: Array<{ target: unknown[] }> }> }> };
    };
    const r = await w.axe.run(document, { runOnly: { type: 'tag', values: tags }, resultTypes: ['violations'] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.slice(0, 5).map((n) => n.target.join(' ')) }));
  }, WCAG_TAGS);
}

async function contextFor(viewer: Viewer, width: 'phone' | 'desktop'): Promise<BrowserContext> {
  // axe is injected through the DevTools protocol; the app's own CSP stays as it is for the page itself.
  const ctx = await t.browser.newContext({ ...(width === 'phone' ? PHONE : DESKTOP), baseURL: t.app.url, bypassCSP: true });
  if (viewer !== 'anonymous') {
    const login = DEMO_LOGINS.find((l) => l.role === viewer)!;
    const page = await ctx.newPage();
    await signIn(page, login.email, DEMO_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/login'));
    await page.close();
  }
  return ctx;
}

/**
 * Until the page has had no request in flight for a short while (the islands' first data fetched), at most 5 s.
 * Playwright's "networkidle" waits a fixed 500 ms of quiet on every page, most of the walk's time. The requests in
 * flight are those of the current visit: call `visit()` before each navigation. A request whose end is never
 * reported (one answered by the service worker, now and then) then holds up only its own visit, not every later
 * page of the context.
 */
function quietAfterLoad(page: Page): { visit(): void; quiet(): Promise<void> } {
  let open = new Set<Request>();
  let lastChange = Date.now();
  const started = (r: Request) => {
    open.add(r);
    lastChange = Date.now();
  };
  const ended = (r: Request) => {
    if (open.delete(r)) lastChange = Date.now();
  };
  page.on('request', started);
  page.on('requestfinished', ended);
  page.on('requestfailed', ended);
  return {
    visit() {
      open = new Set();
      lastChange = Date.now();
    },
    async quiet() {
      const t0 = Date.now();
      while (Date.now() - t0 < 5_000 && (open.size > 0 || Date.now() - lastChange < 120)) await page.waitForTimeout(20);
      if (open.size) console.info(`[axe] still in flight after 5 s on ${page.url()}: ${[...open].map((r) => r.url()).join(' ')}`);
    },
  };
}

/** Every page each viewer may open, at one width: the violations found and how many pages were opened. */
async function walk(width: 'phone' | 'desktop'): Promise<{ width: string; found: string[]; opened: number }> {
  const ex = await examples();
  // A load as the yard starts one (the demo pool has none open), and its delivery link read off the dispatch
  // note, as the receiving end gets it.
  const yard = await contextFor('yard', width);
  const order = await one<{ id: number }>(
    `SELECT ho.id FROM hire_orders ho JOIN users u ON u.home_site_id = ho.depot_site_id
      WHERE u.email = 'yard@northmere.example' AND ho.status IN ('open', 'confirmed', 'loading') ORDER BY ho.id LIMIT 1`,
  );
  expect(order, 'the yard depot has an open hire order').toBeDefined();
  const started = await yard.request.post('/api/loads', { data: { purpose: 'hire', hireOrderId: order.id }, headers: { Origin: t.app.url } });
  expect(started.status(), await started.text()).toBe(201);
  ex.loadRef = ((await started.json()) as { data: { reference: string } }).data.reference;
  const note = await yard.newPage();
  await note.goto(`/loads/${ex.loadRef}/note`);
  const confirmPath = new URL((await note.getByTestId('confirm-link').getAttribute('href'))!).pathname;
  await yard.close();
  // A confirmed collection run back to the yard's depot, as a planner saves and confirms one.
  const desk = await contextFor('planner', width);
  const stop = await one<{ depot: number; site: number }>(
    `SELECT u.home_site_id AS depot, (SELECT id FROM sites WHERE kind = 'customer' ORDER BY id LIMIT 1) AS site FROM users u WHERE u.email = 'yard@northmere.example'`,
  );
  const day = await one<{ d: string }>(`SELECT to_char((now() AT TIME ZONE 'Europe/Amsterdam')::date, 'YYYY-MM-DD') AS d`);
  const run = await desk.request.post('/api/planning/runs', {
    data: { depotId: stop.depot, plannedOn: day.d, carrier: 'Axe Haulage', stops: [{ siteId: stop.site, expectedBins: 2 }] },
    headers: { Origin: t.app.url },
  });
  expect(run.status(), await run.text()).toBe(201);
  ex.runId = ((await run.json()) as { data: { id: number } }).data.id;
  const confirmed = await desk.request.post(`/api/planning/runs/${ex.runId}/status`, { data: { command: 'confirm', version: 0 }, headers: { Origin: t.app.url } });
  expect(confirmed.status(), await confirmed.text()).toBe(200);
  await desk.close();

  const found: string[] = [];
  let opened = 0;
  for (const viewer of VIEWERS) {
    const ctx = await contextFor(viewer, width);
    const page = await ctx.newPage();
    const requests = quietAfterLoad(page);
    for (const route of pageRoutes()) {
      const url = urlFor(route, viewer, ex, confirmPath);
      if (!mayOpen(viewer, url)) continue;
      requests.visit();
      const res = await page.goto(url);
      expect(res?.status(), `${viewer} ${url}`).toBeLessThan(500);
      await requests.quiet();
      opened += 1;
      for (const v of await axe(page)) found.push(`${width} ${viewer} ${url} [${v.id}, ${v.impact}] ${v.help}: ${v.nodes.join(' | ')}`);
    }
    await ctx.close();
  }
  return { width, found, opened };
}

describe('accessibility: WCAG 2 A/AA (axe-core) on every page, every role, 390 and 1280 px', () => {
  test('every page route is opened by at least one role', () => {
    const orphans = pageRoutes().filter((r) => !VIEWERS.some((v) => mayOpen(v, r.replace(/\[[^\]]+\]/g, 'x'))));
    expect(orphans).toEqual([]);
  });

  // Both widths walk at once, each in its own browser context: most of a visit is waiting for the server.
  test('no violations at 390 and 1280 px', async () => {
    const walks = await Promise.all((['phone', 'desktop'] as const).map((width) => walk(width)));
    for (const w of walks) expect(w.opened, `${w.width}: pages opened`).toBeGreaterThan(40);
    const found = walks.flatMap((w) => w.found);
    expect(found, found.join('\n')).toEqual([]);
  }, 600_000);
});
