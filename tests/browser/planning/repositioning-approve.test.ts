// A planner approves the repositioning plan: its lanes become repositioning orders and collection runs, listed under
// the plan with what is done; a run from the plan opens on the runs page; what is left is withdrawn again.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { hydrated } from '../support/yard';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('repositioning plan to work', () => {
  test('approving creates the orders and runs and shows how far they are', { timeout: 180_000 }, async () => {
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    page.on('dialog', (d) => void d.accept());
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/planning/repositioning?horizonDays=21');
    await hydrated(page);
    // Another file may have left an approved plan open: withdraw it first (one approved plan at a time).
    while ((await page.locator('[data-testid="withdraw-plan"]').count()) > 0) {
      // The withdrawal reloads the page: wait for that load, not the current page's (already done).
      const reloaded = page.waitForEvent('load');
      await page.locator('[data-testid="withdraw-plan"]').first().click();
      await reloaded;
      await hydrated(page);
    }
    const lanes = await page.locator('[data-testid="plan-lanes"] tbody tr').count();
    expect(lanes, 'the demo plan has lanes').toBeGreaterThan(0);
    await page.click('[data-testid="approve-plan"]');
    await page.waitForSelector('[data-testid="approved-plans"] [data-plan-id] [data-testid="withdraw-plan"]');
    const planId = Number(await page.locator('[data-testid="approved-plans"] [data-plan-id]').first().getAttribute('data-plan-id'));
    const made = await one<{ orders: number; runs: number }>(
      `SELECT (SELECT count(*)::int FROM repositioning_orders WHERE plan_id = $1) AS orders, (SELECT count(*)::int FROM truck_runs WHERE repositioning_plan_id = $1) AS runs`,
      [planId],
    );
    expect(made.orders + made.runs).toBeGreaterThanOrEqual(lanes);
    const card = page.locator(`[data-plan-id="${planId}"]`);
    await expect(card.locator('[data-testid="plan-done"]').textContent()).resolves.toBe(`0 of ${made.orders + made.runs} done`);
    await expect(card.locator('[data-repositioning-order]').count()).resolves.toBe(made.orders);
    await expect(card.locator('[data-run-id]').count()).resolves.toBe(made.runs);
    await expect(page.locator('[data-testid="approve-plan"]').count()).resolves.toBe(0); // one plan at a time
    await screenshot(page, 'repositioning-approved-desktop');
    if (made.runs > 0) {
      await card.locator('[data-run-id] a').first().click();
      await page.waitForURL(/\/planning\/runs\/\d+$/);
      await expect(page.locator('[data-run-status]').first().getAttribute('data-run-status')).resolves.toBe('planned');
      await page.goBack();
      await hydrated(page);
    }
    await page.locator(`[data-plan-id="${planId}"] [data-testid="withdraw-plan"]`).click();
    await page.waitForSelector('[data-testid="approve-plan"]');
    const left = await one<{ open: number }>(
      `SELECT (SELECT count(*)::int FROM repositioning_orders WHERE plan_id = $1 AND status = 'open')
            + (SELECT count(*)::int FROM truck_runs WHERE repositioning_plan_id = $1 AND status IN ('planned', 'confirmed')) AS open`,
      [planId],
    );
    expect(left.open).toBe(0);
    await ctx.close();
  });
});
