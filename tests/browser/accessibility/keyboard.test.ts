// A planner's flow by keyboard alone: find a bin, open it, void a scan (WCAG 2.1.1 keyboard, 2.4.1 bypass blocks,
// 2.4.7 focus visible). After signing in, not one mouse event: Tab, typing and Enter only. Every element the Tab key
// lands on must show a focus indicator (an outline or a ring) and sit inside the viewport.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { randomUUID } from 'node:crypto';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

interface Focused {
  tag: string;
  text: string;
  indicator: boolean;
  inView: boolean;
  matches: boolean;
}

/** Where the focus is now, whether it shows (outline or box-shadow ring) and whether it matches `selector`. */
function focused(page: Page, selector: string): Promise<Focused> {
  return page.evaluate((sel) => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { tag: 'body', text: '', indicator: true, inView: true, matches: false };
    const cs = getComputedStyle(el);
    const outline = cs.outlineStyle !== 'none' && parseFloat(cs.outlineWidth) >= 1;
    const ring = cs.boxShadow !== 'none' && cs.boxShadow !== '';
    const r = el.getBoundingClientRect();
    const inView = r.width > 1 && r.height > 1 && r.bottom > 0 && r.top < innerHeight && r.right > 0 && r.left < innerWidth;
    return {
      tag: el.tagName.toLowerCase(),
      text: (el.innerText || el.getAttribute('aria-label') || (el as HTMLInputElement).name || '').slice(0, 40),
      indicator: outline || ring,
      inView,
      matches: el.matches(sel),
    };
  }, selector);
}

/** Presses Tab until the focus reaches `selector`, checking every stop on the way shows its focus. */
async function tabTo(page: Page, selector: string, max = 120): Promise<number> {
  for (let i = 1; i <= max; i++) {
    await page.keyboard.press('Tab');
    const f = await focused(page, selector);
    expect(f.indicator, `Tab stop ${i} (${f.tag} "${f.text}") shows a focus indicator`).toBe(true);
    expect(f.inView, `Tab stop ${i} (${f.tag} "${f.text}") is scrolled into view`).toBe(true);
    if (f.matches) return i;
  }
  throw new Error(`${selector} was not reached in ${max} presses of Tab`);
}

describe('a planner by keyboard alone', () => {
  test('skip link, find a bin, open it and void its last scan', async () => {
    // A bin the yard has just quarantined (newest ids, away from the bins other tests take oldest first).
    const bin = await one<{ id: number; grai: string }>(
      `SELECT a.id, a.grai FROM assets a JOIN users u ON u.home_site_id = a.site_id
        WHERE u.email = 'yard@northmere.example' AND a.status = 'available' ORDER BY a.id DESC LIMIT 1`,
    );
    const yardCtx = await newContext(t.browser, t.app, 'phone');
    const yard = await yardCtx.newPage();
    await signIn(yard, 'yard@northmere.example', DEMO_PASSWORD);
    await yard.waitForURL('**/yard');
    const quarantined = await yard.request.post('/api/scan-events', { data: { clientEventId: randomUUID(), assetId: bin.id, action: 'quarantine', note: 'valve handle loose' } });
    expect(quarantined.status()).toBe(201);
    await yardCtx.close();

    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.locator('body').focus();

    // The first Tab stop is the skip link, visible when focused; the find field comes right after the navigation.
    await page.keyboard.press('Tab');
    const skip = await focused(page, 'a.skip-link');
    expect(skip).toMatchObject({ matches: true, indicator: true, inView: true, text: 'Skip to the page' });
    await tabTo(page, '#find-bin');
    await page.keyboard.type(bin.grai);
    await screenshot(page, 'keyboard-find-bin-desktop');
    await Promise.all([page.waitForURL(`**/bins/${bin.grai}`), page.keyboard.press('Enter')]);

    // On the bin page: skip the navigation, then Tab to the void form of the last scan.
    await page.keyboard.press('Tab');
    expect((await focused(page, 'a.skip-link')).matches).toBe(true);
    await page.keyboard.press('Enter');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('main');
    await tabTo(page, '[data-void-form] input[name="reason"]');
    await page.keyboard.type('Quarantined the wrong bin: the loose handle is on the next one');
    await tabTo(page, '[data-void-form] button[type="submit"]', 1);
    await screenshot(page, 'keyboard-void-focused-desktop');
    page.once('dialog', (d) => void d.accept()); // the browser's own confirm: Enter on it is the same as OK
    await page.keyboard.press('Enter');
    await page.waitForSelector('text=Voided: Quarantined the wrong bin');
    await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('available');
    await ctx.close();

    const after = await one<{ status: string; voided: number }>(
      `SELECT a.status, (SELECT count(*)::int FROM scan_events e WHERE e.asset_id = a.id AND e.voided_at IS NOT NULL AND e.void_reason LIKE 'Quarantined the wrong bin%') AS voided
         FROM assets a WHERE a.id = $1`,
      [bin.id],
    );
    expect(after).toEqual({ status: 'available', voided: 1 });
  });
});
