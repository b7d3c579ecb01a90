// A planner opens the repositioning plan for the demo pool: the figures on the cards are the sums of the lanes
// table, every depot's shortage is covered by the lanes into it or named as still short, the page answers within a
// second or two, a bad setting is refused in words, and customers and the yard cannot open it.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot, expectNoPageOverflow } from '../support/app';
import { closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

const num = (s: string | null) => Number((s ?? '').replace(/[^\d.]/g, ''));

describe('repositioning empties', () => {
  test('the cards add up the lanes; shortages are covered or named', async () => {
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.getByRole('link', { name: 'Repositioning' }).first().click();
    await page.waitForURL('**/planning/repositioning');
    const t0 = Date.now();
    const res = await page.goto('/planning/repositioning?horizonDays=21');
    const seconds = (Date.now() - t0) / 1000;
    expect(res?.status()).toBe(200);
    console.info(`[repositioning] page answered in ${seconds.toFixed(2)} s`);
    expect(seconds).toBeLessThan(8); // the goal is 1 s on a quiet machine; this bounds a loaded one

    const lanes = await page
      .locator('[data-testid="plan-lanes"] tbody tr')
      .evaluateAll((trs) => trs.map((tr) => Array.from(tr.querySelectorAll('td'), (td) => td.textContent ?? '')));
    const trucks = lanes.reduce((s, l) => s + num(l[3]!), 0);
    const cost = lanes.reduce((s, l) => s + num(l[5]!), 0);
    expect(num(await page.locator('[data-figure="trucks"]').textContent())).toBe(trucks);
    expect(num(await page.locator('[data-figure="cost"]').textContent())).toBeCloseTo(cost, 2);
    await expect(page.locator('[data-figure="solver"]').textContent()).resolves.toMatch(/Shortages: (optimal|nothing to solve)/);

    // Every depot short of bins gets lanes into it carrying at least its shortage, or is named as still short.
    const rows = await page
      .locator('[data-testid="depot-balance"] tbody tr')
      .evaluateAll((trs) =>
        trs.map((tr) => ({ depot: tr.getAttribute('data-depot')!, short: Number((tr.querySelectorAll('td')[5]?.textContent ?? '').replace(/from.*$/s, '').replace(/\D/g, '')) })),
      );
    const stillShort = (await page.locator('.notice-attention li').allTextContents()).join('\n');
    const into = new Map<string, number>();
    for (const l of lanes) into.set(l[1]!.trim(), (into.get(l[1]!.trim()) ?? 0) + num(l[2]!.split('\n')[0]!.replace(/for its orders.*/s, '')));
    for (const r of rows.filter((x) => x.short > 0)) {
      expect((into.get(r.depot) ?? 0) >= r.short || stillShort.includes(r.depot), `${r.depot} is short ${r.short}`).toBe(true);
    }
    for (const width of [1280, 1920, 390]) {
      await page.setViewportSize({ width, height: 900 });
      await screenshot(page, `repositioning-${width}`);
      await expectNoPageOverflow(page, `repositioning at ${width} px`);
    }

    const bad = await page.goto('/planning/repositioning?horizonDays=0&roadFactor=9');
    expect(bad?.status()).toBe(400);
    await expect(page.locator('[role="alert"]').textContent()).resolves.toMatch(/horizon is at least 1.*road factor is at most 3/s);
    await ctx.close();
  });

  test('customers and the yard cannot open it', async () => {
    for (const email of ['yard@northmere.example', 'buyer@haldenoils.example']) {
      const ctx = await newContext(t.browser, t.app, 'desktop');
      const page = await ctx.newPage();
      await signIn(page, email, DEMO_PASSWORD);
      await page.waitForURL((u) => !u.pathname.startsWith('/login'));
      expect((await page.goto('/planning/repositioning'))?.status(), email).toBe(403);
      await ctx.close();
    }
  });
});
