// Each home shows live counts from the database: the test reads the same
// rows with SQL and compares.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from './support/app';
import { rows, one, closeDb } from './support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('homes show live counts', () => {
  test('yard: the depot’s bins by status and the bins to prepare', async () => {
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    const depot = await one<{ home_site_id: number }>(`SELECT home_site_id FROM users WHERE email = 'yard@northmere.example'`);
    const expected = await rows<{ status: string; n: number }>(`SELECT status, count(*)::int AS n FROM assets WHERE site_id = $1 AND status <> 'retired' GROUP BY status`, [
      depot.home_site_id,
    ]);
    const shown = await page.$$eval('[data-testid="depot-counts"] li', (lis) =>
      lis.map((li) => ({ status: li.getAttribute('data-status'), n: Number(li.getAttribute('data-count')) })),
    );
    expect(shown.sort((a, b) => a.status!.localeCompare(b.status!))).toEqual(expected.sort((a, b) => a.status.localeCompare(b.status)));
    const total = expected.reduce((s, r) => s + r.n, 0);
    await expect(page.locator('[data-testid="depot-total"]').textContent()).resolves.toBe(String(total));
    const prep = await one<{ n: number }>(
      `SELECT COALESCE(sum(GREATEST(0, quantity - (SELECT count(*) FROM trips t WHERE t.hire_order_id = ho.id))), 0)::int AS n
         FROM hire_orders ho WHERE depot_site_id = $1 AND status IN ('confirmed','loading')`,
      [depot.home_site_id],
    );
    await expect(page.locator('[data-testid="to-prepare"]').textContent()).resolves.toBe(`${prep.n} bins to prepare`);
    await screenshot(page, 'yard-home-phone');
    await ctx.close();
  });

  test('customer: bins on hire and waiting for collection, only their own', async () => {
    for (const kind of ['desktop', 'phone'] as const) {
      const ctx = await newContext(t.browser, t.app, kind);
      const page = await ctx.newPage();
      await signIn(page, 'buyer@haldenoils.example', DEMO_PASSWORD);
      await page.waitForURL('**/portal');
      const org = await one<{ organisation_id: number }>(`SELECT organisation_id FROM users WHERE email = 'buyer@haldenoils.example'`);
      const c = await one<{ on_hire: number; awaiting: number }>(
        `SELECT count(*) FILTER (WHERE status = 'on_hire')::int AS on_hire, count(*) FILTER (WHERE status = 'awaiting_collection')::int AS awaiting
           FROM assets WHERE customer_id = $1`,
        [org.organisation_id],
      );
      await expect(page.locator('[data-total="on_hire"]').textContent()).resolves.toBe(String(c.on_hire));
      await expect(page.locator('[data-total="awaiting_collection"]').textContent()).resolves.toBe(String(c.awaiting));
      // another customer's bin is not visible to them
      const other = await one<{ grai: string }>(`SELECT grai FROM assets WHERE customer_id <> $1 AND status = 'on_hire' LIMIT 1`, [org.organisation_id]);
      const html = await page.content();
      expect(html).not.toContain(other.grai);
      const res = await page.goto(`/bins/${other.grai}`);
      expect(res?.status()).toBe(404);
      await page.goto('/portal');
      await screenshot(page, `portal-home-${kind}`);
      await ctx.close();
    }
  });
});
