// The customer's side of the hire on a phone (390 px): a customer signs in, sees their bins on hire per site (days on
// hire, free days left, overdue marked, bins on the road), asks for a collection of empties with a count and a ready
// day; the planner sees it on the requests page and plans the run, the customer sees the run's day; the confirmation
// mail arrives in the local mailbox, readable on the admin's "Sent mail" page. Also: an order placed as a draft,
// and every portal page screenshotted at 390, 1280 and 1920 px, fitting its width.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { one, rows, closeDb } from '../support/db';
import { waitForMail, closeDb as closeMailDb } from '../support/accounts';
import { hydrated } from '../support/yard';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(async () => {
  await closeDb();
  await closeMailDb();
});

const customer = DEMO_LOGINS.find((l) => l.role === 'customer')!;
const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
const admin = DEMO_LOGINS.find((l) => l.role === 'admin')!;

async function signedIn(email: string, kind: 'phone' | 'desktop', width?: number): Promise<Page> {
  const ctx = await newContext(t.browser, t.app, kind);
  const page = await ctx.newPage();
  if (width) await page.setViewportSize({ width, height: 900 });
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/login'));
  return page;
}

/** Nothing sticks out sideways: the page is as wide as the screen. */
async function expectFits(page: Page, where: string) {
  const { scroll, client } = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, client: document.documentElement.clientWidth }));
  expect(scroll, `${where} is wider than the screen`).toBeLessThanOrEqual(client);
}

describe('the customer portal at phone size', () => {
  test('bins on hire per site, as the database holds them', async () => {
    const page = await signedIn(customer.email, 'phone');
    expect(new URL(page.url()).pathname).toBe('/portal');
    await expectFits(page, '/portal');
    const org = await one<{ id: number }>(`SELECT organisation_id AS id FROM users WHERE email = $1`, [customer.email]);
    const perSite = await rows<{ site_id: number; n: number }>(
      `SELECT site_id, count(*)::int AS n FROM assets WHERE customer_id = $1 AND status IN ('on_hire', 'awaiting_collection') AND site_id IS NOT NULL GROUP BY site_id`,
      [org.id],
    );
    expect(perSite.length).toBeGreaterThan(0);
    for (const s of perSite) {
      await expect(page.locator(`[data-site="${s.site_id}"] li[data-bin]`).count(), `site ${s.site_id}`).resolves.toBe(s.n);
    }
    const onHire = await one<{ n: number }>(`SELECT count(*)::int AS n FROM assets WHERE customer_id = $1 AND status = 'on_hire'`, [org.id]);
    await expect(page.locator('[data-total="on_hire"]').innerText()).resolves.toBe(String(onHire.n));
    // Overdue bins come first at their site and are marked with a word, not only a colour.
    const overdue = page.locator('li[data-overdue="yes"]');
    if ((await overdue.count()) > 0) await expect(overdue.first().innerText()).resolves.toMatch(/over/);
    const road = await one<{ n: number }>(`SELECT count(*)::int AS n FROM assets WHERE customer_id = $1 AND status = 'in_transit'`, [org.id]);
    await expect(page.locator('[data-road-bin]').count()).resolves.toBe(road.n);
    await screenshot(page, 'portal-home-390');
    await page.context().close();
  });

  test('a collection request: the planner sees it and plans the run, the customer sees the day, the mail arrives', async () => {
    const since = new Date(Date.now() - 1000);
    const page = await signedIn(customer.email, 'phone');
    await page.getByRole('link', { name: /Empties ready for collection/ }).click();
    await page.waitForURL('**/portal/collections');
    await expectFits(page, '/portal/collections');
    const site = await page.locator('#pc-siteId option').first().innerText();
    await page.fill('#pc-quantity', '7');
    await page.fill('#pc-note', 'Stacked by dock 4');
    await Promise.all([page.waitForURL('**/portal/collections?sent=*'), page.click('button:has-text("Ask for collection")')]);
    const id = Number(new URL(page.url()).searchParams.get('sent'));
    await expect(page.locator(`[data-collection="${id}"]`).innerText()).resolves.toMatch(/7 folded bins/);
    await expect(page.locator(`[data-collection="${id}"] [data-request-status]`).getAttribute('data-request-status')).resolves.toBe('open');
    await screenshot(page, 'portal-collections-390');

    const mail = await waitForMail(customer.email, { since, subject: /collection request/i });
    expect(mail.subject).toBe(`We have your collection request: 7 folded bins at ${site}`);
    expect(mail.text).toMatch(/\/portal\/collections/);

    // The planner, at a desk: the request is on the requests page; schedule it for a run day.
    const desk = await signedIn(planner.email, 'desktop');
    await desk.goto('/requests');
    await hydrated(desk); // the run day is the island's state: typed before hydration, it would be lost
    const card = desk.locator(`li[data-request="collection"][data-id="${id}"]`);
    await expect(card.innerText()).resolves.toMatch(/7 folded bins/);
    await expect(card.innerText()).resolves.toMatch(/customer portal/);
    const today = await one<{ d: string }>(`SELECT to_char(ready_on, 'YYYY-MM-DD') AS d FROM collection_requests WHERE id = $1`, [id]);
    const runDay = await one<{ d: string }>(`SELECT to_char($1::date + 2, 'YYYY-MM-DD') AS d`, [today.d]);
    await card.locator(`[data-run-day="${id}"]`).fill(runDay.d);
    await card.locator('button[data-step="scheduled"]').click();
    await expect.poll(() => card.locator('[data-request-status]').getAttribute('data-request-status')).toBe('scheduled');
    await expect
      .poll(async () => (await one<{ d: string | null }>(`SELECT to_char(planned_for, 'YYYY-MM-DD') AS d FROM collection_requests WHERE id = $1`, [id])).d)
      .toBe(runDay.d);

    await page.reload();
    await expect(page.locator(`[data-collection="${id}"] [data-planned]`).getAttribute('data-planned')).resolves.toBe(runDay.d);
    await expect(page.locator(`[data-collection="${id}"]`).innerText()).resolves.toMatch(/Collection run planned for/);

    // The admin reads the same message in the app's mailbox view.
    const mailbox = await signedIn(admin.email, 'desktop');
    await mailbox.goto('/admin/mail?tab=local');
    await expect(mailbox.locator('body').innerText()).resolves.toContain(mail.subject);
    for (const p of [page, desk, mailbox]) await p.context().close();
  }, 120_000);

  test('an order placed as a draft shows in the list, and the planner sees it as a draft', async () => {
    const page = await signedIn(customer.email, 'phone');
    await page.goto('/portal/orders/new');
    await expectFits(page, '/portal/orders/new');
    await page.fill('#po-quantity', '12');
    await page.fill('#po-product', 'Rapeseed oil, cold pressed');
    await page.check('input[name="linerFoodContact"]');
    await Promise.all([page.waitForURL('**/portal/orders?placed=*'), page.click('button:has-text("Send the order")')]);
    const reference = new URL(page.url()).searchParams.get('placed')!;
    const row = await one<{ status: string; quantity: number; liner_food_contact: boolean }>(`SELECT status, quantity, liner_food_contact FROM hire_orders WHERE reference = $1`, [
      reference,
    ]);
    expect(row).toEqual({ status: 'draft', quantity: 12, liner_food_contact: true });
    await expect(page.locator(`[data-order="${reference}"] [data-order-status]`).getAttribute('data-order-status')).resolves.toBe('draft');
    await screenshot(page, 'portal-orders-390');
    // a refused form keeps what was typed and says why
    await page.goto('/portal/orders/new');
    await page.fill('#po-quantity', '12');
    await page.fill('#po-neededBy', '2000-01-01');
    await page.locator('form[data-portal-form="order"]').evaluate((f: HTMLFormElement) => f.setAttribute('novalidate', ''));
    await page.click('button:has-text("Send the order")');
    await expect(page.locator('[data-problem-for="po-neededBy"]').innerText()).resolves.toMatch(/passed/);
    await expect(page.locator('#po-quantity').inputValue()).resolves.toBe('12');
    await page.context().close();
  });

  test("a fill record with seal numbers, and the fill planner of the bin's order", async () => {
    const page = await signedIn(customer.email, 'phone');
    await page.goto('/portal/fill');
    await expectFits(page, '/portal/fill');
    const grai = await page.locator('#pf-grai option:not([value=""])').first().getAttribute('value');
    expect(grai, 'the demo customer has an empty bin on hire').toBeTruthy();
    await page.selectOption('#pf-grai', grai!);
    await page.fill('#pf-product', 'Rapeseed oil, cold pressed');
    // "Plan the fill" keeps what was typed and opens the order's fill planner
    await Promise.all([page.waitForURL('**/portal/fill?*'), page.click('button:has-text("Plan the fill")')]);
    await expect(page.locator('#pf-product').inputValue()).resolves.toBe('Rapeseed oil, cold pressed');
    const planned = await page.locator('[data-fill-planner]').count();
    const order = await one<{ reference: string | null }>(
      `SELECT ho.reference FROM assets a JOIN trips t ON t.id = a.current_trip_id LEFT JOIN hire_orders ho ON ho.id = t.hire_order_id WHERE a.grai = $1`,
      [grai],
    );
    expect(planned).toBe(order.reference ? 1 : 0);
    await screenshot(page, 'portal-fill-planner-390');
    await page.fill('#pf-volumeL', '950');
    await page.fill('#pf-temperatureC', '20');
    await page.fill('#pf-seals', 'TE700001, TE700002');
    await Promise.all([page.waitForURL('**/portal/fill?recorded=*'), page.click('button:has-text("Record the fill")')]);
    await expect(page.locator(`[data-fill="${grai}"] [data-seals]`).innerText()).resolves.toBe('TE700001, TE700002');
    const trip = await one<{ product: string; volume: string; seals: string[]; action: string }>(
      `SELECT t.fill_product AS product, t.fill_volume_l::text AS volume, t.seals_applied AS seals,
              (SELECT e.action FROM scan_events e WHERE e.asset_id = a.id ORDER BY e.id DESC LIMIT 1) AS action
         FROM assets a JOIN trips t ON t.id = a.current_trip_id WHERE a.grai = $1`,
      [grai],
    );
    expect(trip).toEqual({ product: 'Rapeseed oil, cold pressed', volume: '950.0', seals: ['TE700001', 'TE700002'], action: 'fill_seal' });
    await page.context().close();
  });

  test('every portal page fits 390, 1280 and 1920 px', async () => {
    for (const width of [390, 1280, 1920]) {
      const page = await signedIn(customer.email, width === 390 ? 'phone' : 'desktop', width === 390 ? undefined : width);
      for (const path of [
        '/portal',
        '/portal/orders',
        '/portal/orders/new',
        '/portal/collections',
        '/portal/deliveries',
        '/portal/damage',
        '/portal/people',
        '/portal/fill',
        '/portal/counts',
      ]) {
        const res = await page.goto(path);
        expect(res?.status(), path).toBe(200);
        await expectFits(page, `${path} at ${width}`);
        await screenshot(page, `portal${path.replace(/\//g, '-').replace(/^-portal/, '') || '-home'}-${width}`);
      }
      await page.context().close();
    }
  }, 120_000);
});
