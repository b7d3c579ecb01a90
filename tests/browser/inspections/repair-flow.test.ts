// A failed inspection opens a repair order; the yard records the work on a phone; the test after repair passes and
// the bin is back in service with the order closed. The planners' list and the order are looked at on a desk too
// (390, 1280 and 1920 px, nothing wider than the window). The bin is picked from the other end of the depot's list
// than the 2.5-year inspection test's, so the two never share one.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot, expectNoPageOverflow } from '../support/app';
import { one, closeDb } from '../support/db';
import { hydrated } from '../support/yard';
import { DEMO_PASSWORD, DEMO_LOGINS } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);
const YARD = 'yard@northmere.example';

async function leakTest(page: import('playwright-core').Page) {
  await page.fill('#leak-kpa', '21');
  await page.fill('#leak-min', '10');
  await page.click('button[data-leak="pass"]');
}

describe('failed inspection → repair order → test after repair → back in service', () => {
  test('on a phone, then the planner’s view', async () => {
    const bin = await one<{ grai: string; id: number; serial: string }>(
      `SELECT a.grai, a.id, a.serial FROM assets a JOIN users u ON u.home_site_id = a.site_id
        WHERE u.email = $1 AND a.status = 'available' AND NOT EXISTS (SELECT 1 FROM repair_orders r WHERE r.asset_id = a.id)
        ORDER BY a.next_due DESC NULLS LAST, a.id DESC LIMIT 1`,
      [YARD],
    );
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, YARD, DEMO_PASSWORD);
    await page.waitForURL('**/yard');

    // 1. The 2.5-year inspection finds the valve faulty: needs repair.
    await page.goto(`/bins/${bin.grai}/inspect`);
    await hydrated(page);
    await page.check('input[name="kind"][value="intermediate"]');
    await page.click('button[data-ok="externalCondition"]');
    await page.click('button[data-fault="serviceEquipment"]');
    await page.click('button[data-ok="markingLegible"]');
    await leakTest(page);
    await page.click('button[data-outcome="repair"]');
    await page.fill('textarea#remarks', 'Valve handle cracked, drips at the flange');
    await page.click('button[type="submit"]');
    await page.waitForSelector('[data-recorded]');
    await expect(page.locator('[role="status"]').first().textContent()).resolves.toMatch(/in quarantine/i);
    const order = await one<{ id: number; status: string; fault: string }>(`SELECT id, status, fault FROM repair_orders WHERE asset_id = $1`, [bin.id]);
    expect(order).toMatchObject({ status: 'open', fault: 'Valve handle cracked, drips at the flange' });

    // 2. The repair order, reached from the inspection's answer; the work is recorded on the phone.
    await page.click('[data-testid="repair-link"] a');
    await page.waitForURL(`**/repairs/${order.id}`);
    await hydrated(page);
    await expect(page.locator('[data-testid="repair-fault"]').textContent()).resolves.toBe(order.fault);
    await page.fill('#w-description', 'Replaced the valve handle and the flange gasket');
    await page.fill('#w-parts', 'Valve handle\nFlange gasket DN150');
    await page.fill('#w-labourHours', '1.25');
    await page.fill('#w-cost', '64.80');
    await page.click('[data-testid="repair-work-form"] button[type="submit"]');
    await page.waitForSelector('[data-testid="repair-work"] li');
    await expect(page.locator('[data-testid="repair-cost"]').textContent()).resolves.toMatch(/^64\.80 EUR · 1\.25 h/);
    await expectNoPageOverflow(page, 'repair order at 390 px');
    await screenshot(page, 'repair-order-phone');

    // 3. The test after repair passes: the bin is available again and the order closed by it.
    await page.click('[data-testid="after-repair-test"]');
    await page.waitForURL(`**/bins/${bin.grai}/inspect?kind=after_repair`);
    await hydrated(page);
    await expect(page.locator('input[name="kind"][value="after_repair"]').isChecked()).resolves.toBe(true);
    for (const key of ['externalCondition', 'serviceEquipment', 'markingLegible', 'internalCondition']) await page.click(`button[data-ok="${key}"]`);
    await leakTest(page);
    await page.click('button[data-outcome="pass"]');
    await page.click('button[type="submit"]');
    await page.waitForSelector('[data-recorded]');
    await expect(page.locator('[role="status"]').first().textContent()).resolves.toMatch(/now available/i);
    await expect(page.locator('[data-testid="repair-link"]').textContent()).resolves.toMatch(/is closed by this test/);
    const after = await one<{ status: string; closing: number | null; bin_status: string }>(
      `SELECT r.status, r.closing_inspection_id AS closing, a.status AS bin_status FROM repair_orders r JOIN assets a ON a.id = r.asset_id WHERE r.id = $1`,
      [order.id],
    );
    expect(after).toMatchObject({ status: 'closed', bin_status: 'available' });
    expect(after.closing).not.toBeNull();
    await ctx.close();

    // 4. The planner's list and the ended order, at three widths.
    const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
    for (const [width, height] of [
      [390, 844],
      [1280, 860],
      [1920, 1080],
    ] as const) {
      const desk = await t.browser.newContext({ baseURL: t.app.url, viewport: { width, height } });
      const p = await desk.newPage();
      await signIn(p, planner.email, DEMO_PASSWORD);
      await p.waitForURL((u) => !u.pathname.startsWith('/login'));
      await p.goto('/repairs?show=closed');
      const row = p.locator(`tr[data-repair-id="${order.id}"]`);
      await expect(row.locator('[data-repair-status]').textContent()).resolves.toMatch(/Repaired, test passed/);
      await expect(row.locator('[data-col="cost"]').textContent()).resolves.toBe('64.80 EUR');
      await expectNoPageOverflow(p, `repairs list at ${width} px`);
      await screenshot(p, `repairs-list-${width}`);
      await p.goto(`/repairs/${order.id}`);
      await expect(p.locator('[data-testid="repair-ended"]').textContent()).resolves.toMatch(/Repaired, test passed/);
      await expectNoPageOverflow(p, `repair order at ${width} px`);
      await screenshot(p, `repair-order-${width}`);
      await desk.close();
    }
  });
});
