// Offline for real: the app server is stopped (a browser's offline switch does
// not stop a service worker's own fetches). The yard hand records two actions
// on bins from the phone's depot snapshot, reloads the page with the server
// still down (the service worker serves it), and when the server is back both
// scans reach the log exactly once. A scan the server refuses on sync stays
// listed with its reason until dismissed. Runs on http://localhost, which
// Chromium treats as a secure context (service workers need one).
import { describe, test, expect } from 'vitest';
import type { Page } from 'playwright-core';
import { randomUUID } from 'node:crypto';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { availableBinsAtHome, hydrated, query, type PickedBin } from '../support/yard';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();

const YARD = 'yard@northmere.example';

const attr = (page: Page, name: string) => page.locator('[data-sync-status]').getAttribute(name);

async function waitFor(fn: () => Promise<boolean>, timeoutMs = 30_000, what = 'condition') {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    if (await fn()) return;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`timed out waiting for ${what}`);
}

async function openOfflineCard(page: Page, bin: PickedBin) {
  await page.fill('#scan-text', bin.grai);
  await page.click('[data-scan-input] button[type=submit]');
  await page.locator(`[data-offline-card][data-grai="${bin.grai}"]`).waitFor();
}

describe('yard work without signal', () => {
  test('two scans recorded offline survive a reload and sync exactly once when the server is back', async () => {
    const [checkBin, holdBin, staleBin] = await availableBinsAtHome(YARD, 3);
    expect(staleBin).toBeDefined();
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, YARD, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/yard');
    await hydrated(page);

    // The service worker takes over and the phone stores its depot snapshot.
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
    await waitFor(() => page.evaluate(() => navigator.serviceWorker.controller !== null), 15_000, 'the service worker to control the page');
    await waitFor(
      () =>
        page.evaluate(
          () =>
            new Promise<boolean>((resolve) => {
              const req = indexedDB.open('loopfold-yard');
              req.onsuccess = () => {
                const db = req.result;
                if (!db.objectStoreNames.contains('snapshot')) return resolve(false);
                const count = db.transaction('snapshot').objectStore('snapshot').count();
                count.onsuccess = () => resolve(count.result > 0);
                count.onerror = () => resolve(false);
              };
              req.onerror = () => resolve(false);
            }),
        ),
      20_000,
      'the depot snapshot',
    );
    await waitFor(() => page.evaluate(async () => (await (await caches.open('loopfold-yard-pages')).match('/yard')) !== undefined), 15_000, 'the yard page to be kept');

    // Someone else quarantines a bin after the phone took its snapshot: the phone does not know.
    const other = await page.request.post('/api/scan-events', { data: { clientEventId: randomUUID(), assetId: staleBin!.id, action: 'quarantine', note: 'held by the office' } });
    expect(other.status()).toBe(201);

    await t.app.stop();
    await ctx.setOffline(true);
    await waitFor(async () => (await attr(page, 'data-sync-state')) === 'offline', 5_000, 'the offline indicator');

    // Prep check on one bin, from the cached snapshot.
    await openOfflineCard(page, checkBin!);
    const card = page.locator('[data-offline-card]');
    await card.locator('[data-action="prep_check"]').click();
    await card.locator('[data-form="prep_check"] button[type=submit]').click();
    await card.locator('[data-queued]').waitFor();
    // The phone runs the rule table on its own: after a passed check it offers the liner.
    await card.locator('[data-action="fit_liner"]').waitFor();
    expect(await attr(page, 'data-pending-count')).toBe('1');

    // Quarantine on another.
    await openOfflineCard(page, holdBin!);
    await card.locator('[data-action="quarantine"]').click();
    await card.locator('[data-form="quarantine"] input[type=checkbox]').check();
    await card.locator('[data-form="quarantine"] button[type=submit]').click();
    await card.locator('[data-queued]').waitFor();

    // A prep check on the bin the office quarantined meanwhile: the phone still thinks it is available.
    await openOfflineCard(page, staleBin!);
    await card.locator('[data-action="prep_check"]').click();
    await card.locator('[data-form="prep_check"] button[type=submit]').click();
    await card.locator('[data-queued]').waitFor();
    expect(await attr(page, 'data-pending-count')).toBe('3');
    await page.locator('[data-sync-status] > button').click();
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'yard-offline-queued-phone');

    // Reload with the server still down: the service worker serves the page, the queue is still there.
    await page.reload();
    await page.getByRole('heading', { name: 'Scan a bin' }).waitFor();
    await hydrated(page);
    await waitFor(async () => (await attr(page, 'data-pending-count')) === '3', 10_000, 'the queue after reload');
    await page.locator('[data-sync-status] > button').click();
    const ids = await page.locator('[data-waiting-item]').evaluateAll((els) => els.map((e) => e.getAttribute('data-waiting-item')!));
    expect(ids).toHaveLength(3);

    // Signal back: the `online` event sends everything waiting.
    await t.app.start();
    await ctx.setOffline(false);
    await waitFor(async () => (await attr(page, 'data-pending-count')) === '0', 30_000, 'the queue to drain');
    await waitFor(async () => (await attr(page, 'data-refused-count')) === '1', 5_000, 'the refusal');

    const rows = await query<{ client_event_id: string; n: number }>(
      'SELECT client_event_id::text, count(*)::int AS n FROM scan_events WHERE client_event_id = ANY($1::uuid[]) GROUP BY 1',
      [ids],
    );
    const counts = Object.fromEntries(rows.map((r) => [r.client_event_id, r.n]));
    expect(counts[ids[0]!]).toBe(1);
    expect(counts[ids[1]!]).toBe(1);
    expect(counts[ids[2]!]).toBeUndefined(); // refused: nothing recorded

    const states = await query<{ id: number; status: string; prep_checked: boolean }>('SELECT id, status, prep_checked FROM assets WHERE id = ANY($1::int[])', [
      [checkBin!.id, holdBin!.id, staleBin!.id],
    ]);
    const byId = new Map(states.map((s) => [s.id, s]));
    expect(byId.get(checkBin!.id)).toMatchObject({ status: 'available', prep_checked: true });
    expect(byId.get(holdBin!.id)).toMatchObject({ status: 'quarantine' });
    expect(byId.get(staleBin!.id)).toMatchObject({ status: 'quarantine' });

    // The refusal is on screen with the rule table's reason, and stays until dismissed.
    const refused = page.locator('[data-refused-item]');
    await refused.waitFor();
    await expect(refused.textContent()).resolves.toMatch(/Prep check is not possible while the bin is in quarantine/);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'yard-offline-refused-phone');
    await page.reload();
    await hydrated(page);
    await waitFor(async () => (await attr(page, 'data-refused-count')) === '1', 10_000, 'the refusal after reload');
    await page.locator('[data-sync-status] > button').click();
    await page.locator('[data-refused-item] button', { hasText: 'Dismiss' }).click();
    await waitFor(async () => (await attr(page, 'data-refused-count')) === '0', 5_000, 'the dismissal');

    // Sending again changes nothing: each client event id is recorded once.
    const again = await page.request.post('/api/scan-events', {
      data: { events: [{ clientEventId: ids[0], assetId: checkBin!.id, action: 'prep_check', prepResult: 'pass' }] },
    });
    const body = (await again.json()) as { data: { results: Array<{ ok: boolean; outcome: { replayed: boolean } }> } };
    expect(body.data.results[0]!.outcome.replayed).toBe(true);
    const [{ n }] = await query<{ n: number }>('SELECT count(*)::int AS n FROM scan_events WHERE client_event_id = $1', [ids[0]]);
    expect(n).toBe(1);
    await ctx.close();
  }, 120_000);

  test('a bin page saved on the phone opens offline and its actions wait in the queue', async () => {
    const [bin] = await availableBinsAtHome(YARD, 1);
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, YARD, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/yard');
    await hydrated(page);
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
    await waitFor(() => page.evaluate(() => navigator.serviceWorker.controller !== null), 15_000, 'the service worker');
    await waitFor(() => page.evaluate(async () => (await (await caches.open('loopfold-yard-pages')).match('/yard')) !== undefined), 15_000, 'the yard page to be kept');
    await page.goto(`/bins/${bin!.grai}`); // opened once with signal: kept
    await page.locator('button[data-action="prep_check"]').waitFor();

    await t.app.stop();
    await page.reload();
    await hydrated(page);
    await page.locator('button[data-action="prep_check"]').click();
    await page.locator('[data-form="prep_check"] button[type=submit]').click();
    await page.locator('[data-queued]').waitFor();
    expect(await attr(page, 'data-pending-count')).toBe('1');

    // A bin page never opened falls back to the yard page, which shows that bin from the snapshot.
    const [unseen] = await availableBinsAtHome(YARD, 1, [bin!.id]);
    await page.goto(`/bins/${unseen!.grai}`);
    await hydrated(page);
    await page.locator(`[data-offline-card][data-grai="${unseen!.grai}"]`).waitFor();

    await t.app.start();
    await page.locator('[data-sync-status] > button').click();
    await page.getByRole('button', { name: 'Send now' }).click();
    await waitFor(async () => (await attr(page, 'data-pending-count')) === '0', 20_000, 'the queue to drain');
    const [row] = await query<{ prep_checked: boolean }>('SELECT prep_checked FROM assets WHERE id = $1', [bin!.id]);
    expect(row!.prep_checked).toBe(true);
    await ctx.close();
  }, 90_000);
});
