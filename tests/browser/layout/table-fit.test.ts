// Tables fit their screens: at 390, 1280 and 1920 px no table is wider than its box, unless it scrolls
// inside a labelled region with its identifier column pinned; the page itself never scrolls sideways.
// The fleet grid (AG Grid, no <table>) keeps the GRAI pinned at the left and fits its box.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { useApp, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);
const WIDTHS = [390, 1280, 1920] as const;
const login = (role: string) => DEMO_LOGINS.find((l) => l.role === role)!;

interface TableFit {
  name: string;
  over: boolean;
  scrollsInRegion: boolean;
  pinned: boolean;
}

async function tablesOf(page: Page): Promise<{ pageOverflow: number; tables: TableFit[] }> {
  return page.evaluate(() => {
    const tables = [...document.querySelectorAll('table')]
      .filter((el) => (el as HTMLElement).offsetParent !== null)
      .map((el, i) => {
        const box = el.parentElement!;
        const over = el.getBoundingClientRect().width > box.clientWidth + 1;
        const region = el.closest('[role="region"][aria-label]') as HTMLElement | null;
        const scrollsInRegion = !!region && ['auto', 'scroll'].includes(getComputedStyle(region).overflowX);
        const first = el.querySelector('tbody tr > :first-child');
        const pinned = !!first && getComputedStyle(first).position === 'sticky';
        return { name: el.getAttribute('data-testid') ?? el.id ?? `table ${i + 1}`, over, scrollsInRegion, pinned };
      });
    return { pageOverflow: document.documentElement.scrollWidth - document.documentElement.clientWidth, tables };
  });
}

async function check(page: Page, path: string, width: number) {
  await page.setViewportSize({ width, height: 900 });
  await page.goto(path);
  await page.waitForLoadState('networkidle').catch(() => undefined);
  const { pageOverflow, tables } = await tablesOf(page);
  expect(pageOverflow, `${path} at ${width}: the page scrolls sideways`).toBeLessThanOrEqual(0);
  for (const tb of tables) {
    if (tb.over)
      expect(tb.scrollsInRegion && tb.pinned, `${path} at ${width}: ${tb.name} is wider than its box without a labelled scroll region and a pinned identifier`).toBe(true);
  }
  await screenshot(page, `fit${path.replace(/[/?=&]/g, '-')}-${width}`);
}

describe('tables fit their screens', () => {
  test('planner pages: trips, pool overview, trip statistics, orders, scans to review, label run', { timeout: 300_000 }, async () => {
    const ctx = await t.browser.newContext({ baseURL: t.app.url });
    const page = await ctx.newPage();
    await signIn(page, login('planner').email, DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    for (const width of WIDTHS) for (const path of ['/trips', '/fleet', '/trips/stats', '/planning/orders', '/fleet/flags']) await check(page, path, width);
    await ctx.close();
  });

  test('a bin page at desktop width for a planner, and for a customer their bins on a phone', { timeout: 200_000 }, async () => {
    const bin = await one<{ grai: string }>(`SELECT grai FROM assets WHERE status = 'on_hire' ORDER BY id LIMIT 1`);
    const ctx = await t.browser.newContext({ baseURL: t.app.url });
    const page = await ctx.newPage();
    await signIn(page, login('planner').email, DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    for (const width of WIDTHS) await check(page, `/bins/${bin.grai}`, width);
    await ctx.close();
    const cctx = await t.browser.newContext({ baseURL: t.app.url });
    const cpage = await cctx.newPage();
    await signIn(cpage, login('customer').email, DEMO_PASSWORD);
    await cpage.waitForURL('**/portal');
    for (const width of WIDTHS) await check(cpage, '/portal', width);
    await cctx.close();
  });
});

describe('the yard bin page at desktop width', () => {
  test('its cards stack in the phone column instead of squeezing three abreast', { timeout: 120_000 }, async () => {
    const bin = await one<{ grai: string }>(
      `SELECT a.grai FROM assets a JOIN users u ON u.home_site_id = a.site_id WHERE u.email = 'yard@northmere.example' AND a.status = 'available' ORDER BY a.id LIMIT 1`,
    );
    const ctx = await t.browser.newContext({ baseURL: t.app.url, viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    await check(page, `/bins/${bin.grai}`, 1280);
    const widths = await page.$$eval('article section.card', (ss) => ss.map((s) => s.getBoundingClientRect().width));
    const column = await page.$eval('main', (m) => m.getBoundingClientRect().width);
    for (const w of widths) expect(w, 'each card takes the column’s width').toBeGreaterThan(column * 0.8);
    await ctx.close();
  });
});
