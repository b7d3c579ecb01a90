// An admin sets up part of the pool in a real browser: adds a depot with its
// position, changes it, and meets the app's own 404 inside the app frame.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { closeDb } from '../support/accounts';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { hydrated } from '../support/yard';

const t = useApp();
const admin = DEMO_LOGINS.find((l) => l.role === 'admin')!;
const LONG = 120_000;

afterAll(async () => {
  await closeDb();
});

async function adminPage(kind: 'desktop' | 'phone' = 'desktop'): Promise<Page> {
  const ctx = await newContext(t.browser, t.app, kind);
  ctx.setDefaultTimeout(20_000);
  const page = await ctx.newPage();
  await signIn(page, admin.email, DEMO_PASSWORD);
  await page.waitForURL('**/fleet');
  return page;
}

describe('setting up the pool', () => {
  test(
    'an admin adds a depot with its position, then moves and renames it',
    async () => {
      const code = `DEP-B${Date.now().toString(36).slice(-5).toUpperCase()}`;
      const page = await adminPage();
      await page.goto('/admin/sites?kind=depot');
      await hydrated(page);
      await page.click('#sites-new');
      await expect(page.locator('#sites-f-kind').inputValue()).resolves.toBe('depot');
      await page.fill('#sites-f-code', code.toLowerCase());
      await page.fill('#sites-f-name', 'Browser depot');
      // a latitude without its longitude is refused with the field named, and nothing is added
      await page.fill('#sites-f-latitude', '52,0907');
      await page.click('#sites-save');
      await expect.poll(() => page.locator('#sites-f-longitude-problem').textContent()).toMatch(/longitude/i);
      await page.fill('#sites-f-longitude', '5.1214');
      await page.click('#sites-save');
      await expect.poll(() => page.locator('#sites-flash').textContent()).toMatch(`Browser depot (${code}) added.`);
      const row = page.locator(`#sites-table tr[data-row="Browser depot (${code})"]`);
      await expect(row.textContent()).resolves.toMatch(/Depot/);

      await page.click(`button[aria-label="Change Browser depot (${code})"]`);
      await page.fill('#sites-f-name', 'Browser depot east');
      await page.fill('#sites-f-longitude', '5.2');
      await page.click('#sites-save');
      await expect.poll(() => page.locator('#sites-flash').textContent()).toMatch(`Browser depot east (${code}) saved.`);
      await page.setViewportSize({ width: 1920, height: 1000 });
      const moved = page.locator(`#sites-table tr[data-row="Browser depot east (${code})"]`);
      await expect(moved.textContent()).resolves.toMatch(/52\.0907, 5\.2000/);
      await screenshot(page, 'admin-sites-1920');

      // after a reload the change is what the server holds
      await page.reload();
      await hydrated(page);
      await expect(page.locator(`#sites-table tr[data-row="Browser depot east (${code})"]`).count()).resolves.toBe(1);
      await page.context().close();
    },
    LONG,
  );

  test(
    'the other set-up pages open and their tables fit at 1280 px; phones get cards',
    async () => {
      const page = await adminPage();
      for (const [path, table] of [
        ['/admin/customers', '#customers-table'],
        ['/admin/bin-types', '#bin-types-table'],
        ['/admin/sites', '#sites-table'],
      ] as const) {
        await page.goto(path);
        const fits = await page.locator(table).evaluate((el) => el.scrollWidth <= el.parentElement!.clientWidth + 1);
        expect(fits, `${path} table fits its box`).toBe(true);
        await screenshot(page, `admin${path.replace(/\//g, '-')}-1280`);
      }
      await page.context().close();
      const phone = await adminPage('phone');
      await phone.goto('/admin/bin-types');
      await expect(phone.locator('li[data-row]').first().isVisible()).resolves.toBe(true);
      const overflow = await phone.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await screenshot(phone, 'admin-bin-types-390');
      await phone.context().close();
    },
    LONG,
  );

  test(
    'an address that leads nowhere is the app’s own 404, inside its frame',
    async () => {
      const page = await adminPage();
      const res = await page.goto('/admin/no-such-page');
      expect(res!.status()).toBe(404);
      await expect(page.locator('#not-found h1').textContent()).resolves.toMatch(/no page at this address/);
      await expect(page.locator('nav[aria-label="Main"] a[href="/admin/sites"]').count()).resolves.toBeGreaterThan(0);
      const api = await page.request.get('/api/admin/no-such-thing');
      expect(api.status()).toBe(404);
      expect((await api.json()).error.code).toBe('not_found');
      await page.context().close();
    },
    LONG,
  );
});
