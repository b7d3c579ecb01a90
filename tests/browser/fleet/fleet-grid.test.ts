import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync } from 'node:fs';
import pg from 'pg';
import Papa from 'papaparse';
import type { Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp, expectNoPageOverflow } from '../support/app';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();

let db: pg.Client;

beforeAll(async () => {
  db = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await db.connect();
});
afterAll(async () => {
  await db?.end();
});

const login = (role: string) => DEMO_LOGINS.find((l) => l.role === role)!;

async function signedIn(role: string, kind: 'desktop' | 'phone' = 'desktop') {
  const ctx = await newContext(t.browser, t.app, kind);
  const page = await ctx.newPage();
  await signIn(page, login(role).email, DEMO_PASSWORD);
  await page.waitForURL((u) => u.pathname !== '/login');
  return { ctx, page };
}

/** Collects Content-Security-Policy violations the page reports. */
async function watchCsp(page: Page): Promise<string[]> {
  const violations: string[] = [];
  page.on('console', (m) => {
    if (m.text().startsWith('CSP-VIOLATION')) violations.push(m.text());
  });
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => console.log(`CSP-VIOLATION ${e.violatedDirective} ${e.blockedURI}`));
  });
  return violations;
}

const gridRows = (page: Page) => page.locator('#fleet-grid .ag-grid-scrolling-container .ag-row');
/** Waits until rows carry data (the grid draws empty "loading" rows first). */
const rowsLoaded = (page: Page) => gridRows(page).locator('[col-id="grai"] a').first().waitFor();

describe('the fleet grid', () => {
  test('a planner opens it from the pool overview, filters to one status, sorts by next test due and exports the rows', async () => {
    const { ctx, page } = await signedIn('planner');
    const violations = await watchCsp(page);
    await page.goto('/fleet');
    await expect(page.locator('h1').first().textContent()).resolves.toMatch(/Pool overview/);
    await page.click('#open-fleet-grid');
    await page.waitForURL('**/fleet/bins');
    await rowsLoaded(page);
    const total = Number((await db.query('SELECT count(*)::int AS n FROM assets')).rows[0].n);
    await expect(page.locator('#bin-count').textContent()).resolves.toBe(`${total} bins`);
    await screenshot(page, 'fleet-grid-desktop');

    // one status
    const onHire = Number((await db.query(`SELECT count(*)::int AS n FROM assets WHERE status = 'on_hire'`)).rows[0].n);
    expect(onHire).toBeGreaterThan(0);
    await Promise.all([
      page.waitForResponse((r) => r.url().includes('/api/fleet/bins?') && decodeURIComponent(r.url()).includes('on_hire')),
      page.selectOption('#status-quick', 'on_hire'),
    ]);
    await expect.poll(() => page.locator('#bin-count').textContent()).toBe(`${onHire} bins`);
    await expect(page.getByRole('list', { name: 'Active filters' }).textContent()).resolves.toMatch(/Status:\s*On hire/);

    // sorted by next test due (click the header)
    await Promise.all([
      page.waitForResponse((r) => r.url().includes('/api/fleet/bins?') && decodeURIComponent(r.url()).includes('"colId":"nextDue"')),
      page.click('#fleet-grid .ag-header-cell[col-id="nextDue"] .ag-header-cell-label'),
    ]);
    await rowsLoaded(page);
    // The status word; a bin whose test has lapsed carries the "Test lapsed" mark beside it.
    const statuses = (await page.locator('#fleet-grid .ag-row [col-id="status"]').allTextContents()).map((t) => t.replace('Test lapsed', '').trim()).filter(Boolean);
    expect(statuses.length).toBeGreaterThan(0); // the rows drawn in the viewport
    expect(new Set(statuses)).toEqual(new Set(['On hire']));
    await screenshot(page, 'fleet-grid-filtered-desktop');

    // export
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('#export-csv')]);
    expect(download.suggestedFilename()).toMatch(/^loopfold-bins-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = readFileSync((await download.path())!, 'utf8').replace(/^\uFEFF/, '');
    const parsed = Papa.parse<Record<string, string>>(csv.trim(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(onHire);
    expect(new Set(parsed.data.map((r) => r.Status))).toEqual(new Set(['On hire']));
    const expected = (await db.query(`SELECT grai, next_due::text AS due FROM assets WHERE status = 'on_hire' ORDER BY next_due ASC NULLS LAST, id ASC`)).rows as Array<{
      grai: string;
      due: string | null;
    }>;
    expect(parsed.data.map((r) => r.GRAI)).toEqual(expected.map((r) => r.grai));
    expect(parsed.data.map((r) => r['Next test due'] || null)).toEqual(expected.map((r) => r.due));

    expect(violations).toEqual([]);
    await ctx.close();
  });

  test('saving a view keeps its filter and sort; it opens again by its link', async () => {
    const { ctx, page } = await signedIn('planner');
    await page.goto('/fleet/bins?view=builtin:quarantine');
    await gridRows(page)
      .first()
      .waitFor({ state: 'attached' })
      .catch(() => undefined);
    const quarantined = Number((await db.query(`SELECT count(*)::int AS n FROM assets WHERE status = 'quarantine'`)).rows[0].n);
    await expect.poll(() => page.locator('#bin-count').textContent()).toBe(`${quarantined} ${quarantined === 1 ? 'bin' : 'bins'}`);
    await expect(page.locator('#view-select').inputValue()).resolves.toBe('builtin:quarantine');

    await page.selectOption('#status-quick', 'available');
    await expect.poll(() => page.locator('#bin-count').textContent()).toMatch(/ bins?$/);
    await page.getByRole('button', { name: 'Save as new view' }).click();
    await page.fill('#view-name', 'Available, browser test');
    await page.getByLabel('Share with all planners and admins').check();
    await page.getByRole('button', { name: 'Save view' }).click();
    await expect(page.getByRole('status').filter({ hasText: 'Saved “Available, browser test”' }).textContent()).resolves.toBeTruthy();
    const viewId = await page.locator('#view-select').inputValue();
    expect(viewId).toMatch(/^\d+$/);
    expect(new URL(page.url()).searchParams.get('view')).toBe(viewId);

    // an admin sees the shared view and gets the same rows from it
    const admin = await signedIn('admin');
    await admin.page.goto(`/fleet/bins?view=${viewId}`);
    const available = Number((await db.query(`SELECT count(*)::int AS n FROM assets WHERE status = 'available'`)).rows[0].n);
    await expect.poll(() => admin.page.locator('#bin-count').textContent()).toBe(`${available} bins`);
    await expect(admin.page.locator('#view-select option:checked').textContent()).resolves.toMatch(/Available, browser test/);
    await admin.ctx.close();

    // the owner deletes it, confirming first
    await page.getByRole('button', { name: 'Delete', exact: true }).click();
    await page.getByRole('button', { name: 'Delete view' }).click();
    await expect(page.getByRole('status').filter({ hasText: 'Deleted' }).textContent()).resolves.toBeTruthy();
    await ctx.close();
  });

  test('clicking a row opens that bin’s page', async () => {
    const { ctx, page } = await signedIn('planner');
    await page.goto('/fleet/bins');
    await rowsLoaded(page);
    const first = gridRows(page).first();
    const serial = (await first.locator('[col-id="serial"]').textContent())!.trim();
    const grai = (await db.query('SELECT grai FROM assets WHERE serial = $1', [serial])).rows[0].grai as string;
    expect(await first.locator('[col-id="grai"] a').getAttribute('href')).toBe(`/bins/${grai}`);
    await first.locator('[col-id="status"]').click();
    await page.waitForURL((u) => u.pathname === `/bins/${grai}`);
    await ctx.close();
  });

  test('it reads at phone width too', async () => {
    const { ctx, page } = await signedIn('planner', 'phone');
    await page.goto('/fleet/bins');
    await rowsLoaded(page);
    // At phone width the rows still load, each with its GRAI link in view, and the grid scrolls inside itself.
    const first = gridRows(page).locator('[col-id="grai"] a').first();
    expect((await first.textContent())!.replace(/[\s·]/g, '')).toMatch(/^\d{14}/); // grouped for reading: 0 9521234 10010 2 · 100002
    await expect(first.isVisible()).resolves.toBe(true);
    await expectNoPageOverflow(page, 'fleet grid at phone width');
    await screenshot(page, 'fleet-grid-phone');
    await page.goto('/fleet');
    await expect(page.locator('h1').first().textContent()).resolves.toMatch(/Pool overview/);
    await expectNoPageOverflow(page, 'pool overview at phone width');
    await screenshot(page, 'pool-overview-phone');
    await ctx.close();
  });

  test('a customer can reach neither the grid page nor its API (403)', async () => {
    const { ctx, page } = await signedIn('customer');
    const res = await page.goto('/fleet/bins');
    expect(res?.status()).toBe(403);
    for (const path of ['/api/fleet/bins', '/api/fleet/bins/export.csv', '/api/fleet/views']) {
      const api = await page.request.get(path);
      expect(api.status(), path).toBe(403);
      expect((await api.json()).error.code).toBe('forbidden');
    }
    await ctx.close();
  });
});

describe('Content-Security-Policy', () => {
  test('the grid page runs with no violations; an injected script or <style> is blocked, a style attribute is not', async () => {
    const { ctx, page } = await signedIn('planner');
    const violations = await watchCsp(page);
    const res = await page.goto('/fleet/bins');
    const policy = res!.headers()['content-security-policy']!;
    expect(policy).toMatch(/script-src 'self' 'sha256-/);
    expect(policy).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(policy).toMatch(/style-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
    expect(policy).toContain("style-src-attr 'unsafe-inline'");
    expect(policy).toContain("frame-ancestors 'none'");
    await rowsLoaded(page);
    expect(violations).toEqual([]);

    const outcome = await page.evaluate(async () => {
      // Wait for the browser to report both blocked elements (script and style), not for a fixed time.
      const blocked = new Promise<void>((resolve, reject) => {
        let seen = 0;
        document.addEventListener('securitypolicyviolation', () => (++seen >= 2 ? resolve() : undefined));
        setTimeout(() => reject(new Error('the browser reported fewer than two CSP violations in 10 s')), 10_000);
      });
      const s = document.createElement('script');
      s.textContent = 'window.__injected = true;';
      document.head.append(s);
      const probe = document.createElement('div');
      probe.id = 'csp-probe';
      document.body.append(probe);
      const st = document.createElement('style');
      st.textContent = '#csp-probe { width: 77px; }';
      document.head.append(st);
      const div = document.createElement('div');
      div.setAttribute('style', 'width: 123px');
      document.body.append(div);
      await blocked;
      return {
        script: (window as unknown as { __injected?: boolean }).__injected ?? false,
        style: getComputedStyle(probe).width === '77px',
        attr: getComputedStyle(div).width,
      };
    });
    expect(outcome).toEqual({ script: false, style: false, attr: '123px' });
    await expect.poll(() => violations.length).toBeGreaterThanOrEqual(2);
    expect(violations.join('\n')).toMatch(/script-src/);
    expect(violations.join('\n')).toMatch(/style-src/);
    await ctx.close();
  });

  test('the sign-in page keeps working under the policy', async () => {
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    const violations = await watchCsp(page);
    await signIn(page, login('yard').email, DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    expect(violations).toEqual([]);
    await ctx.close();
  });
});
