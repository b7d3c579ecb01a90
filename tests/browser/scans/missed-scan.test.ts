// Story 10: a bin comes back that was never scanned as collected. The yard
// receives it anyway; the missed steps are inferred and flagged; the planner
// finds it under "Scans to review", opens the bin and voids the receive
// (the history keeps it, struck through) — or confirms it.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('a missed scan', () => {
  test('receive infers fold and collect; the planner sees the flag and voids the scan', async () => {
    const bin = await one<{ grai: string; serial: string }>(`SELECT grai, serial FROM assets WHERE status = 'on_hire' AND NOT filled ORDER BY id LIMIT 1`);
    const yardCtx = await newContext(t.browser, t.app, 'phone');
    const yard = await yardCtx.newPage();
    await signIn(yard, 'yard@northmere.example', DEMO_PASSWORD);
    await yard.waitForURL('**/yard');
    await yard.goto(`/bins/${bin.grai}`);
    await yard.click('button[data-action="receive"]');
    await yard.click('form[data-form="receive"] button[type="submit"]');
    const notice = yard.locator('p[role="status"]:has-text("Recorded")');
    await notice.waitFor();
    await expect(notice.textContent()).resolves.toMatch(/inferred and flagged for a planner: Fold, Collect/);
    await yardCtx.close();

    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/fleet/flags');
    const row = page.locator('tr', { hasText: bin.serial }).first();
    await expect(row.textContent()).resolves.toMatch(/Receive at depot.*inferred before it: Fold, Collect/s);
    await screenshot(page, 'scans-to-review-desktop');
    await row.locator('a:has-text("Open bin")').click();
    await page.waitForURL(`**/bins/${bin.grai}`);
    await expect(page.locator('[data-testid="timeline"]').first().textContent()).resolves.toMatch(/Inferred — not scanned/);
    page.once('dialog', (d) => void d.accept());
    await page.fill('[data-void-form] input[name="reason"]', 'Bin was still at the customer; wrong label scanned');
    await page.click('[data-void-form] button[type="submit"]');
    await page.waitForSelector('text=Voided: Bin was still at the customer');
    await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('on_hire');
    await screenshot(page, 'bin-voided-desktop');
    await ctx.close();
    const after = await one<{ status: string; n: number }>(
      `SELECT a.status, (SELECT count(*)::int FROM scan_events e WHERE e.asset_id = a.id AND e.voided_at IS NOT NULL) AS n FROM assets a WHERE grai = $1`,
      [bin.grai],
    );
    expect(after).toEqual({ status: 'on_hire', n: 3 }); // the receive and its two inferred steps, kept and voided
  });
});
