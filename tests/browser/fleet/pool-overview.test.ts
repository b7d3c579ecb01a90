// The planner's pool pages end to end on the seeded demo pool: the overview's counts against the e2e
// database (queried here with pg, in SQL written independently of the app's queries), the trip list sorted
// by clicking its headers, a trip page with its events, the statistics and reuse pages with the CSV, and
// the customer role kept out of all of it. Screenshots of every page at 1280 px and 390 px.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { one, rows, closeDb } from '../support/db';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();

const LONG = 120_000;
let desktop: BrowserContext;
let phone: BrowserContext;
let page: Page;
let zone: string;

const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
const customer = DEMO_LOGINS.find((l) => l.role === 'customer')!;
const number = (text: string | null) => Number((text ?? '').replace(/[^\d.-]/g, ''));

async function signedIn(kind: 'desktop' | 'phone', email = planner.email): Promise<BrowserContext> {
  const ctx = await newContext(t.browser, t.app, kind);
  const p = await ctx.newPage();
  await signIn(p, email, DEMO_PASSWORD);
  await p.waitForURL((u) => u.pathname !== '/login');
  await p.close();
  return ctx;
}

/** The same page on a phone, for the 390 px screenshot. */
async function onPhone(path: string, name: string, ready?: (p: Page) => Promise<unknown>) {
  const p = await phone.newPage();
  expect((await p.goto(path))?.status()).toBe(200);
  if (ready) await ready(p);
  await screenshot(p, `${name}-phone`);
  await p.close();
}

beforeAll(async () => {
  desktop = await signedIn('desktop');
  phone = await signedIn('phone');
  page = await desktop.newPage();
  zone = (await one<{ time_zone: string }>('SELECT time_zone FROM settings WHERE id = 1')).time_zone;
}, LONG);
afterAll(async () => {
  await desktop?.close();
  await phone?.close();
  await closeDb();
});

describe('pool overview', () => {
  test(
    'the counts on the page are the counts in the database',
    async () => {
      expect((await page.goto('/fleet'))?.status()).toBe(200);
      await expect.poll(() => page.locator('h1').textContent()).toBe('Pool overview');
      expect(await page.locator('a[data-testid="grid-link"]').getAttribute('href')).toBe('/fleet/bins');
      expect(await page.locator('a[data-testid="grid-link"]').textContent()).toContain('All bins (grid)');

      const byStatus = Object.fromEntries((await rows<{ status: string; n: number }>('SELECT status, count(*)::int AS n FROM assets GROUP BY status')).map((r) => [r.status, r.n]));
      const inService = Object.entries(byStatus)
        .filter(([s]) => s !== 'retired' && s !== 'missing')
        .reduce((n, [, c]) => n + c, 0);
      expect(inService).toBeGreaterThan(100);
      expect(number(await page.getByTestId('count-in-service').textContent())).toBe(inService);
      expect(number(await page.getByTestId('count-with-customers').textContent())).toBe((byStatus.on_hire ?? 0) + (byStatus.awaiting_collection ?? 0));
      expect(number(await page.getByTestId('count-awaiting').textContent())).toBe(byStatus.awaiting_collection ?? 0);
      for (const status of ['available', 'on_hire', 'awaiting_collection']) {
        expect(number(await page.getByTestId(`total-${status}`).textContent()), status).toBe(byStatus[status] ?? 0);
      }

      // Per depot: bins there now, retired and missing ones not counted.
      const depots = await rows<{ code: string; n: number }>(
        `SELECT s.code, count(a.id)::int AS n FROM sites s LEFT JOIN assets a ON a.site_id = s.id AND a.status NOT IN ('retired', 'missing')
        WHERE s.kind = 'depot' GROUP BY s.code`,
      );
      for (const d of depots) {
        expect(number(await page.locator(`[data-testid="site-table"] tr[data-site-code="${d.code}"] [data-total]`).textContent()), d.code).toBe(d.n);
      }

      // Not scanned for 30 days: last scan on or before today − 30 in the operator's zone.
      const stale = await one<{ n: number }>(
        `SELECT count(*)::int AS n FROM assets
        WHERE status NOT IN ('retired', 'missing')
          AND (last_scan_at IS NULL OR (last_scan_at AT TIME ZONE $1)::date <= (now() AT TIME ZONE $1)::date - 30)`,
        [zone],
      );
      expect(number(await page.getByTestId('count-stale').textContent())).toBe(stale.n);

      // Every site with coordinates is drawn, and the charts are drawn in the t.browser.
      const placed = await one<{ n: number }>(`SELECT count(*)::int AS n FROM sites WHERE latitude IS NOT NULL AND active`);
      await expect.poll(() => page.locator('[data-testid="site-picture"] svg g[data-site-code]').count()).toBe(placed.n);
      await page.locator('[data-testid="chart-trips"] svg.recharts-surface').first().waitFor({ timeout: 20_000 });
      await page.locator('[data-testid="chart-tests"] svg.recharts-surface').first().waitFor();
      await screenshot(page, 'pool-overview-desktop');
      await onPhone('/fleet', 'pool-overview', (p) => p.locator('[data-testid="chart-trips"] svg.recharts-surface').first().waitFor({ timeout: 20_000 }));
    },
    LONG,
  );

  test(
    'a number of days that is not a whole number from 1 to 3650 is refused with the default kept',
    async () => {
      const res = await page.goto('/fleet?stale=0');
      expect(res?.status()).toBe(400);
      expect(await page.locator('#stale-error').textContent()).toMatch(/from 1 to 3650/);
      await page.goto('/fleet?stale=90');
      expect(await page.locator('#stale-heading').textContent()).toBe('Not scanned for 90 days');
    },
    LONG,
  );
});

describe('trips', () => {
  test(
    'the list pages on the server; sorting by a header click; a trip page with its events',
    async () => {
      expect((await page.goto('/trips'))?.status()).toBe(200);
      const total = await one<{ n: number }>('SELECT count(*)::int AS n FROM trips');
      expect(Number(await page.getByTestId('trip-total').getAttribute('data-total'))).toBe(total.n);
      expect(await page.locator('[data-testid="trip-table"] tbody tr').count()).toBe(Math.min(50, total.n));
      await screenshot(page, 'trips-desktop');
      await onPhone('/trips', 'trips');

      // Days at the customer, longest first, then shortest first: the column reads in order.
      await page.click('a[data-sort="dwell"]');
      await page.waitForURL(/sort=dwell/);
      const dwell = async () =>
        (await page.locator('[data-testid="trip-table"] td[data-col="dwell"]').allTextContents())
          .map((t) => t.trim())
          .filter((t) => /^\d/.test(t))
          .map((t) => parseInt(t, 10));
      const longestFirst = await dwell();
      expect(longestFirst.length).toBeGreaterThan(10);
      expect(longestFirst).toEqual([...longestFirst].sort((a, b) => b - a));
      expect(await page.locator('th[aria-sort="descending"] a[data-sort="dwell"]').count()).toBe(1);
      await page.click('a[data-sort="dwell"]');
      await page.waitForURL(/dir=asc/);
      const shortestFirst = await dwell();
      expect(shortestFirst).toEqual([...shortestFirst].sort((a, b) => a - b));

      // The next page continues where the first stopped.
      await page.goto('/trips?sort=id&dir=asc');
      const firstPageIds = await page.locator('[data-testid="trip-table"] tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-trip-id'))));
      await page.getByTestId('next-page').click();
      await page.waitForURL(/page=2/);
      const secondPageIds = await page.locator('[data-testid="trip-table"] tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-trip-id'))));
      const expected = await rows<{ id: number }>('SELECT id FROM trips ORDER BY id LIMIT 100');
      expect([...firstPageIds, ...secondPageIds]).toEqual(expected.map((r) => r.id));

      // Seal mismatches only: as many as the database holds.
      await page.goto('/trips?mismatch=1');
      const mismatches = await one<{ n: number }>(
        `SELECT count(*)::int AS n FROM trips WHERE seal_mismatch OR (cardinality(seals_verified) > 0 AND NOT (seals_applied @> seals_verified AND seals_verified @> seals_applied))`,
      );
      expect(Number(await page.getByTestId('trip-total').getAttribute('data-total'))).toBe(mismatches.n);
      if (mismatches.n > 0) expect(await page.locator('[data-seal-state="mismatch"]').count()).toBe(Math.min(50, mismatches.n));

      // A closed trip's page: its steps and every event recorded against it.
      const closed = await one<{ id: number; events: number }>(
        `SELECT t.id, (SELECT count(*)::int FROM scan_events e WHERE e.trip_id = t.id) AS events FROM trips t WHERE t.status = 'closed' ORDER BY t.id LIMIT 1`,
      );
      await page.goto('/trips?sort=id&dir=asc');
      await page.click(`a[aria-label="Trip ${closed.id}"]`);
      await page.waitForURL(`**/trips/${closed.id}`);
      expect(await page.locator('h1').textContent()).toBe(`Trip #${closed.id}`);
      expect(await page.locator('[data-testid="timeline"] > li').count()).toBe(closed.events);
      expect(await page.getByTestId('trip-cycle').textContent()).toMatch(/^\d+ days?$/);
      await screenshot(page, 'trip-page-desktop');
      await onPhone(`/trips/${closed.id}`, 'trip-page');

      expect((await page.goto('/trips?sort=password_hash'))?.status()).toBe(400);
      expect((await page.request.get('/api/trips?sort=password_hash')).status()).toBe(400);
      expect((await page.goto('/trips/999999'))?.status()).toBe(404);
    },
    LONG,
  );

  test(
    'trip statistics per customer for the last 365 days',
    async () => {
      expect((await page.goto('/trips/stats'))?.status()).toBe(200);
      const customers = await one<{ n: number }>(`SELECT count(DISTINCT customer_id)::int AS n FROM trips WHERE dispatched_at > now() - interval '300 days'`);
      expect(await page.locator('[data-testid="stats-table"] tbody tr').count()).toBe(customers.n + 1); // + "All trips"
      expect(number(await page.getByTestId('overall-trips').textContent())).toBeGreaterThan(100);
      await screenshot(page, 'trip-statistics-desktop');
      await onPhone('/trips/stats', 'trip-statistics');
    },
    LONG,
  );
});

describe('reuse report', () => {
  test(
    'figures, the PPWR note, the record-not-certificate statement, and the CSV per customer',
    async () => {
      expect((await page.goto('/fleet/reuse'))?.status()).toBe(200);
      expect(await page.getByTestId('not-a-certificate').textContent()).toMatch(/not a compliance certificate/);
      const note = (await page.getByTestId('ppwr-note').textContent()) ?? '';
      expect(note).toMatch(/1 January 2030/);
      expect(note).toMatch(/40 %/);
      expect(note).toMatch(/intermediate bulk containers/);
      expect(note).toMatch(/2008\/68\/EC/);
      expect(number(await page.getByTestId('reuse-rotations').textContent())).toBeGreaterThan(100);
      await screenshot(page, 'reuse-report-desktop');
      await onPhone('/fleet/reuse', 'reuse-report');

      const halden = await one<{ id: number; name: string }>(`SELECT id, name FROM organisations WHERE name = 'Halden Oils'`);
      await page.selectOption('#r-customer', String(halden.id));
      await page.click('form[data-testid="reuse-form"] button[type="submit"]');
      await page.waitForURL(new RegExp(`customer=${halden.id}`));
      const href = await page.getByTestId('csv-link').getAttribute('href');
      const csv = await page.request.get(href!);
      expect(csv.status()).toBe(200);
      expect(csv.headers()['content-type']).toBe('text/csv; charset=utf-8');
      const lines = (await csv.text())
        .replace(/^\uFEFF/, '')
        .trimEnd()
        .split('\r\n');
      expect(lines[0]).toMatch(/^customer,grai,serial,/);
      expect(lines.length).toBeGreaterThan(1);
      expect(lines.slice(1).every((l) => l.startsWith('Halden Oils,'))).toBe(true);
      // One row per bin that came back from Halden Oils in the last 365 days.
      const bins = await one<{ n: number }>(
        `SELECT count(DISTINCT asset_id)::int AS n FROM trips
        WHERE customer_id = $1 AND (returned_at AT TIME ZONE $2)::date BETWEEN (now() AT TIME ZONE $2)::date - 364 AND (now() AT TIME ZONE $2)::date`,
        [halden.id, zone],
      );
      expect(lines.length - 1).toBe(bins.n);
    },
    LONG,
  );
});

describe('customers are kept out', () => {
  test(
    'the customer role gets 403 on every pool page and endpoint',
    async () => {
      const ctx = await signedIn('desktop', customer.email);
      const p = await ctx.newPage();
      for (const path of ['/fleet', '/trips', '/trips/1', '/trips/stats', '/fleet/reuse']) {
        expect((await p.goto(path))?.status(), path).toBe(403);
      }
      expect((await p.request.get('/api/trips')).status()).toBe(403);
      expect((await p.request.get('/api/fleet/reuse.csv')).status()).toBe(403);
      await ctx.close();
    },
    LONG,
  );
});
