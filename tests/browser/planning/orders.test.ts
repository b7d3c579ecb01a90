// A planner enters a hire order on the desktop and confirms it; the yard prepares a bin, loads it
// against that order on a phone and sends the truck; the planner's order page then shows it fulfilled.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { recordAction } from '../support/yard';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

const record = recordAction;

describe('hire orders', () => {
  test('a planner enters an order, the yard loads and dispatches it, the order shows dispatched', { timeout: 150_000 }, async () => {
    const depot = await one<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE code = 'DEP-RTM'`);
    const customer = await one<{ id: number; name: string }>(`SELECT id, name FROM organisations WHERE name = 'Halden Oils'`);
    const site = await one<{ id: number }>(`SELECT id FROM sites WHERE organisation_id = $1 AND kind = 'customer' ORDER BY id LIMIT 1`, [customer.id]);
    const type = await one<{ id: number }>(`SELECT id FROM bin_types WHERE code = 'FX1000'`);
    const wanted = await one<{ d: string }>(`SELECT to_char((now() AT TIME ZONE 'Europe/Amsterdam')::date + 3, 'YYYY-MM-DD') AS d`);

    const desk = await newContext(t.browser, t.app, 'desktop');
    const planner = await desk.newPage();
    await signIn(planner, 'planner@northmere.example', DEMO_PASSWORD);
    await planner.waitForURL('**/fleet');
    await planner.goto('/planning/orders');
    await planner.click('[data-testid="new-order"]');
    await planner.waitForURL('**/planning/orders/new');
    await planner.waitForSelector('astro-island:not([ssr]) [data-testid="order-form"]'); // the form is an island: wait until it is live
    // an empty form is refused with the fields named, nothing is saved
    await planner.click('[data-testid="order-form"] button[type="submit"]');
    await expect(planner.locator('#o-quantity-problem').textContent()).resolves.toMatch(/Required/);
    await planner.selectOption('#o-customerId', String(customer.id));
    await planner.selectOption('#o-deliverySiteId', String(site.id));
    await planner.selectOption('#o-binTypeId', String(type.id));
    await planner.fill('#o-quantity', '1');
    await planner.selectOption('#o-depotSiteId', String(depot.id));
    await planner.fill('#o-neededBy', wanted.d);
    await planner.check('[data-testid="o-food"]');
    await planner.fill('#o-linerMaxFillTempC', '45');
    await screenshot(planner, 'order-form-desktop');
    await planner.click('[data-testid="order-form"] button[type="submit"]');
    await planner.waitForURL(/\/planning\/orders\/\d+\?created=1/);
    await planner.waitForFunction(() => !document.querySelector('astro-island[ssr]'));
    const orderId = Number(new URL(planner.url()).pathname.split('/').pop());
    await expect(planner.locator('[data-order-status]').first().getAttribute('data-order-status')).resolves.toBe('confirmed');
    await expect(planner.locator('[data-testid="order-tariff"]').textContent()).resolves.toMatch(/Free days\s*21 days/);
    const stored = await one<{ reference: string; status: string; liner_food_contact: boolean; liner_max_fill_temp_c: number }>(
      `SELECT reference, status, liner_food_contact, liner_max_fill_temp_c FROM hire_orders WHERE id = $1`,
      [orderId],
    );
    expect(stored).toMatchObject({ status: 'confirmed', liner_food_contact: true, liner_max_fill_temp_c: 45 });
    // 1200 × 1000 mm, 1160 mm erected: 26 floor positions × 2 levels on a standard trailer (REFERENCES §9, common practice)
    await expect(planner.locator('[data-testid="order-trucks"]').textContent()).resolves.toMatch(/takes 52 of these bins \(26 floor positions × 2 high/);
    await screenshot(planner, 'order-page-confirmed-desktop');

    // the yard prepares one bin and loads it against the new order
    const bin = await one<{ grai: string; serial: string }>(
      `SELECT grai, serial FROM assets WHERE site_id = $1 AND status = 'available' AND NOT prep_checked AND next_due > current_date + 30
          AND bin_type_id = $2 ORDER BY id DESC LIMIT 1`,
      [depot.id, type.id],
    );
    const phone = await newContext(t.browser, t.app, 'phone');
    const yard = await phone.newPage();
    await signIn(yard, 'yard@northmere.example', DEMO_PASSWORD);
    await yard.waitForURL('**/yard');
    await yard.goto(`/bins/${bin.grai}`);
    await record(yard, 'prep_check');
    await record(yard, 'fit_liner');
    await yard.goto(`/loads/new?order=${orderId}`);
    await yard.click(`[data-start-order="${orderId}"]`);
    await yard.waitForURL(/\/loads\/LD-/);
    await yard.fill('#scan-text', bin.grai);
    await yard.click('[data-scan-input] button[type="submit"]');
    await yard.waitForFunction(() => /^1\//.test(document.querySelector('[data-testid="load-count"]')?.textContent ?? ''));

    // loaded but not gone: the order is loading
    await planner.goto(`/planning/orders/${orderId}`);
    await expect(planner.locator('[data-order-status]').first().getAttribute('data-order-status')).resolves.toBe('loading');
    await expect(planner.locator('[data-testid="order-progress"]').getAttribute('data-loaded')).resolves.toBe('1');

    await yard.fill('#carrier', 'Veldhoven Haulage');
    await yard.fill('#vehicle', 'VH-204-K');
    await yard.click('button:has-text("Dispatch 1 bin")');
    await yard.waitForURL(/\/note$/);
    await phone.close();

    await planner.goto(`/planning/orders/${orderId}`);
    await expect(planner.locator('[data-order-status]').first().getAttribute('data-order-status')).resolves.toBe('dispatched');
    await expect(planner.locator('[data-testid="order-progress"]').textContent()).resolves.toMatch(/1\s*of 1 bins dispatched/);
    await expect(planner.locator('[data-testid="order-loads"]').textContent()).resolves.toMatch(/On its way/);
    await screenshot(planner, 'order-page-dispatched-desktop');

    // and the list finds it by reference
    await planner.goto(`/planning/orders?ref=${stored.reference}`);
    await expect(planner.locator('[data-testid="order-total"]').getAttribute('data-total')).resolves.toBe('1');
    await desk.close();
  });

  test('the fill planner on an order: the water example of ADR 4.1.1.4 (b) (REFERENCES §3) and a refused target', async () => {
    const order = await one<{ id: number }>(
      `SELECT ho.id FROM hire_orders ho JOIN bin_types bt ON bt.id = ho.bin_type_id WHERE bt.nominal_capacity_l = 1000 ORDER BY ho.id LIMIT 1`,
    );
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto(`/planning/orders/${order.id}`);
    await page.click('[data-testid="plan-fill"]');
    await page.waitForURL(`**/planning/orders/${order.id}/fill`);
    await page.waitForSelector('astro-island:not([ssr]) [data-testid="fill-planner"]');
    // water: d15 = 0.999099 g/mL (CRC Handbook), d50 = 0.98803 g/mL (ITS-90 equation), filled at 20 °C → 97.07 %, 970.7 L
    await page.fill('#f-d15', '0.999099');
    await page.fill('#f-d50', '0.98803');
    await page.fill('#f-temp', '20');
    await page.fill('#f-density', '0.9982');
    await page.fill('#f-target', '960');
    await expect(page.locator('[data-testid="fill-max"]').getAttribute('data-percent')).resolves.toBe('97.07');
    await expect(page.locator('[data-testid="fill-max"]').getAttribute('data-litres')).resolves.toBe('970.7');
    await expect(page.locator('[data-testid="fill-verdict"]').getAttribute('data-fits')).resolves.toBe('true');
    await page.fill('#f-target', '980');
    await expect(page.locator('[data-testid="fill-verdict"]').getAttribute('data-fits')).resolves.toBe('false');
    await expect(page.locator('[data-testid="fill-verdict"]').textContent()).resolves.toMatch(/over the maximum fill of 970.7 L/);
    await expect(page.locator('[data-testid="fill-result"]').textContent()).resolves.toMatch(/safety data sheet/);
    await screenshot(page, 'fill-planner-desktop');
    await ctx.close();
  });

  test('a customer may not open the planner pages', async () => {
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'buyer@haldenoils.example', DEMO_PASSWORD);
    await page.waitForURL('**/portal');
    const res = await page.goto('/planning/orders');
    expect(res?.status()).toBe(403);
    const api = await page.request.get('/api/planning/orders');
    expect(api.status()).toBe(403);
    await ctx.close();
  });
});
