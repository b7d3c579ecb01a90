// The planner's queue of flagged scans in bulk: filter to the old ones, tick two and confirm them, then void one
// ticked scan with a reason (refused without one). The count shown is the length of the list under the filter.
import { describe, test, expect, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { useApp, newContext, signIn, screenshot, expectNoPageOverflow } from '../support/app';
import { hydrated } from '../support/yard';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

const waiting = (where = 'TRUE') =>
  one<{ n: number }>(`SELECT count(*)::int AS n FROM scan_events e WHERE e.flagged AND NOT e.inferred AND e.voided_at IS NULL AND e.reviewed_at IS NULL AND ${where}`);

describe('scans to review in bulk', () => {
  test('filter, tick, confirm; void with a reason', { timeout: 120_000 }, async () => {
    const phone = await newContext(t.browser, t.app, 'phone');
    const p = await phone.newPage();
    await signIn(p, 'planner@northmere.example', DEMO_PASSWORD);
    await p.waitForURL('**/fleet');
    await p.goto('/fleet/flags?age=older');
    await hydrated(p);
    await screenshot(p, 'flags-phone');
    await expectNoPageOverflow(p, 'scans to review on a phone');
    await phone.close();
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/fleet/flags');
    await page.selectOption('#f-age', 'older');
    await page.click('[data-testid="flag-filter"] button[type="submit"]');
    await page.waitForURL(/age=older/);
    await hydrated(page);
    const old = `e.occurred_at <= now() - interval '30 days'`;
    const before = (await waiting(old)).n;
    expect(before, 'the demo history has old flags').toBeGreaterThan(3);
    await expect(page.locator('[data-testid="flag-total"]').textContent()).resolves.toMatch(new RegExp(`^${before.toLocaleString('en-GB')} waiting`));
    await screenshot(page, 'flags-filtered-desktop');

    const rows = page.locator('tbody tr[data-flag-id]');
    const firstTwo = [Number(await rows.nth(0).getAttribute('data-flag-id')), Number(await rows.nth(1).getAttribute('data-flag-id'))];
    for (const i of [0, 1]) await rows.nth(i).locator('input[type="checkbox"]').check();
    await page.locator('[data-testid="ticked-count"]', { hasText: '2 ticked' }).waitFor();
    await page.click('[data-testid="confirm-ticked"]');
    await page.locator('[data-testid="bulk-summary"]', { hasText: '2 scans confirmed.' }).waitFor();
    for (const id of firstTwo) await expect(page.locator(`tr[data-flag-id="${id}"]`).count()).resolves.toBe(0);
    expect((await waiting(old)).n).toBe(before - 2);
    await page.locator('[data-testid="flag-total"]', { hasText: `${(before - 2).toLocaleString('en-GB')} waiting` }).waitFor();

    // Void a fresh one (only a bin's latest scan can be voided): a receive of a bin still on hire, its fold and
    // collect missed. Without a reason the server says why and nothing changes; with one it goes.
    const bin = await one<{ grai: string }>(`SELECT grai FROM assets WHERE status = 'on_hire' AND NOT filled ORDER BY id DESC LIMIT 1`);
    const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE code = 'DEP-RTM'`);
    const res = await page.request.post('/api/scan-events', {
      headers: { origin: t.app.url },
      data: { clientEventId: randomUUID(), grai: bin.grai, action: 'receive', siteId: depot.id },
    });
    expect(res.status(), await res.text()).toBe(201);
    const target = ((await res.json()) as { data: { eventId: number } }).data.eventId;
    await page.goto('/fleet/flags?age=today');
    await hydrated(page);
    await page.locator(`tr[data-flag-id="${target}"] input[type="checkbox"]`).check();
    await page.click('[data-testid="void-ticked"]');
    await page.click('[data-testid="void-ticked-confirm"]');
    await page.locator('#void-reason-problem', { hasText: 'Say why these scans are wrong' }).waitFor();
    expect((await one<{ v: boolean }>('SELECT voided_at IS NOT NULL AS v FROM scan_events WHERE id = $1', [target])).v).toBe(false);
    await page.fill('#void-reason', 'Wrong label scanned at the gate');
    await page.click('[data-testid="void-ticked"]');
    await page.click('[data-testid="void-ticked-confirm"]');
    await page.locator('[data-testid="bulk-summary"]', { hasText: '1 scan voided.' }).waitFor();
    const voided = await one<{ reason: string; status: string }>('SELECT e.void_reason AS reason, a.status FROM scan_events e JOIN assets a ON a.id = e.asset_id WHERE e.id = $1', [
      target,
    ]);
    expect(voided).toEqual({ reason: 'Wrong label scanned at the gate', status: 'on_hire' });
    await screenshot(page, 'flags-after-bulk-desktop');
    await ctx.close();
  });
});
