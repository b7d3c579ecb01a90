// After a prep check on the phone the confirmation stays in view at the top of
// the bin's actions, with the new status; "Undo" takes the scan back as a void.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { hydrated } from '../support/yard';

const t = useApp();
afterAll(closeDb);

describe('saying what happened after an action on the phone', () => {
  test('prep check → confirmation in view after the reload → undo → void with the set reason', { timeout: 120_000 }, async () => {
    const bin = await one<{ grai: string; id: number }>(
      `SELECT a.grai, a.id FROM assets a JOIN users u ON u.home_site_id = a.site_id
        WHERE u.email = 'yard@northmere.example' AND a.status = 'available' AND NOT a.prep_checked
          AND (a.next_due IS NULL OR a.next_due > current_date + 7) ORDER BY a.id DESC LIMIT 1`,
    );
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    await page.goto(`/bins/${bin.grai}`);
    await hydrated(page);
    await page.click('button[data-action="prep_check"]');
    await page.click('form[data-form="prep_check"] button[type="submit"]');
    // 2.5 s after the tap the page has reloaded and still says what was recorded
    await page.waitForTimeout(2500);
    await page.waitForLoadState('load');
    const note = page.locator('#scan-confirmation');
    await expect(note.textContent()).resolves.toMatch(/Prep check recorded\. The bin is now available\./);
    await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('available');
    await expect(one<{ prep_checked: boolean }>('SELECT prep_checked FROM assets WHERE id = $1', [bin.id])).resolves.toMatchObject({ prep_checked: true });
    const inView = await page.locator('#bin-actions').evaluate((el) => {
      const r = el.getBoundingClientRect();
      return r.top >= 0 && r.top < window.innerHeight / 2;
    });
    expect(inView, 'the actions are at the top of the screen').toBe(true);
    await expect(
      note.evaluate((el) => {
        const r = el.getBoundingClientRect();
        return r.bottom <= window.innerHeight;
      }),
    ).resolves.toBe(true);
    await screenshot(page, 'scan-confirmation-390');

    await page.click('#scan-undo');
    await page.waitForSelector('#scan-confirmation[data-confirmation="undone"]', { timeout: 20_000 });
    await expect(page.locator('#scan-confirmation').textContent()).resolves.toMatch(/Prep check undone/);
    await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('available');
    const ev = await one<{ void_reason: string }>(`SELECT void_reason FROM scan_events WHERE asset_id = $1 AND action = 'prep_check' ORDER BY id DESC LIMIT 1`, [bin.id]);
    expect(ev.void_reason).toBe('undone by the person who scanned it');
    await expect(one<{ prep_checked: boolean }>('SELECT prep_checked FROM assets WHERE id = $1', [bin.id])).resolves.toMatchObject({ prep_checked: false });
    await ctx.close();
  });
});
