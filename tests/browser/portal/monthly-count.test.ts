// The monthly count at phone size (390 px): a customer opens the count of one of their sites, ticks the bins on the
// list — one by a photo of its label through the scanner — leaves one out, and confirms; the difference is a dispute.
// A planner at a desk settles the missing bin as lost (the bin is marked missing through the scan service), the
// count is settled, the customer sees the outcome, and the pool overview's shrinkage card counts it.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { expectNoPageOverflow, newContext, screenshot, signIn, useApp } from '../support/app';
import { one, rows, closeDb } from '../support/db';
import { hydrated, labelPng, pickPhoto } from '../support/yard';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

const customer = DEMO_LOGINS.find((l) => l.role === 'customer')!;
const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;

async function signedIn(email: string, kind: 'phone' | 'desktop', width?: number): Promise<Page> {
  const page = await (await newContext(t.browser, t.app, kind)).newPage();
  if (width) await page.setViewportSize({ width, height: 900 });
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/login'));
  return page;
}

describe('the monthly count', () => {
  test('a customer confirms a count with one bin missing at phone size; the planner settles it as lost', async () => {
    // The customer's site with the most bins standing there; this month's count of it starts afresh.
    const site = await one<{ id: number; name: string; org: number }>(
      `SELECT s.id, s.name, s.organisation_id AS org FROM sites s JOIN users u ON u.organisation_id = s.organisation_id
        WHERE u.email = $1 AND s.active ORDER BY (SELECT count(*) FROM assets a WHERE a.site_id = s.id AND a.status IN ('on_hire', 'awaiting_collection')) DESC, s.id LIMIT 1`,
      [customer.email],
    );
    await one(`DELETE FROM site_counts WHERE site_id = $1 AND month = to_char(now() AT TIME ZONE (SELECT time_zone FROM settings LIMIT 1), 'YYYY-MM') RETURNING id`, [
      site.id,
    ]).catch(() => undefined);
    const bins = await rows<{ id: number; grai: string; serial: string }>(
      `SELECT id, grai, serial FROM assets WHERE site_id = $1 AND customer_id = $2 AND status IN ('on_hire', 'awaiting_collection') ORDER BY serial`,
      [site.id, site.org],
    );
    expect(bins.length, 'the demo site has bins to count').toBeGreaterThanOrEqual(2);
    const absent = bins.at(-1)!;
    const byPhoto = bins[0]!;

    const page = await signedIn(customer.email, 'phone');
    await page.goto('/portal/counts');
    await expectNoPageOverflow(page, '/portal/counts at 390');
    const card = page.locator(`[data-count-site="${site.id}"]`);
    await expect(card.getAttribute('data-standing')).resolves.toMatch(/^(due|overdue)$/);
    await expect(card.locator('[data-bins-now]').innerText()).resolves.toBe(String(bins.length));
    await screenshot(page, 'portal-counts-390');
    await card.getByRole('link', { name: `Count ${site.name}` }).click();
    await page.waitForURL(`**/portal/counts/${site.id}`);
    await hydrated(page);
    await expect(page.locator('[data-count-bin]').count()).resolves.toBe(bins.length);
    // One bin by a photo of its label (the yard's scanner), the others ticked, the last one left out.
    await pickPhoto(page, '[data-count-scanner] [data-photo-input]', {
      name: 'label.png',
      mimeType: 'image/png',
      buffer: await labelPng(`https://id.example.org/8003/${byPhoto.grai}`),
    });
    await expect.poll(() => page.locator('[data-count-note]').innerText()).toContain(`Ticked ${byPhoto.serial}`);
    await expect(page.locator(`[data-count-bin="${byPhoto.serial}"] input`).isChecked()).resolves.toBe(true);
    for (const b of bins.slice(1, -1)) await page.locator(`[data-count-bin="${b.serial}"] input`).check();
    await expect(page.locator('[data-count-summary]').innerText()).resolves.toContain(`${bins.length - 1} of ${bins.length} ticked, 1 not seen`);
    await expectNoPageOverflow(page, '/portal/counts/<site> at 390');
    await screenshot(page, 'portal-count-sheet-390');
    await Promise.all([page.waitForURL('**/portal/counts/*?sent=*'), page.click('button:has-text("Confirm the count")')]);
    const countId = Number(new URL(page.url()).searchParams.get('sent'));
    await expect(page.locator('[data-count]').getAttribute('data-count-status')).resolves.toBe('disputed');
    await expect(page.locator('[data-count-line]').count()).resolves.toBe(1);
    await expect(page.locator(`[data-count-line="${absent.grai}"]`).innerText()).resolves.toContain(absent.serial);
    const stored = await one<{ method: string; confirmed: number; expected: number }>(
      'SELECT method, cardinality(confirmed_grais) AS confirmed, cardinality(expected_grais) AS expected FROM site_counts WHERE id = $1',
      [countId],
    );
    expect(stored).toEqual({ method: 'scanned', confirmed: bins.length - 1, expected: bins.length });
    await screenshot(page, 'portal-count-sent-390');

    // The planner, at a desk: the count is listed with one bin to settle; settle it as lost.
    const desk = await signedIn(planner.email, 'desktop');
    await desk.goto('/planning/counts');
    await expect(desk.locator(`[data-count-row="${countId}"] [data-open]`).innerText()).resolves.toBe('1');
    await desk.locator(`[data-count-row="${countId}"] a`).click();
    await desk.waitForURL(`**/planning/counts/${countId}`);
    await hydrated(desk);
    await screenshot(desk, 'planning-count-1280');
    const form = desk.locator(`[data-resolve="${absent.grai}"]`);
    await form.getByLabel('Lost: mark it missing').check();
    await form.getByLabel('Note (optional)').fill('Not at the site; not seen at the depot');
    await form.getByRole('button', { name: 'Settle' }).click();
    await expect.poll(() => desk.locator(`[data-grai="${absent.grai}"] [data-resolution]`).getAttribute('data-resolution')).toBe('lost');
    await expect(desk.locator('[data-count]').getAttribute('data-count-status')).resolves.toBe('resolved');
    const bin = await one<{ status: string; by: number; planner: number }>(
      `SELECT a.status, e.user_id AS by, (SELECT id FROM users WHERE email = $2) AS planner
         FROM assets a JOIN site_count_lines l ON l.asset_id = a.id JOIN scan_events e ON e.id = l.scan_event_id WHERE a.id = $1 AND l.count_id = $3`,
      [absent.id, planner.email, countId],
    );
    expect(bin).toEqual({ status: 'missing', by: bin.planner, planner: bin.planner });

    // The customer sees it settled; the pool overview counts the bin among the declared missing and the counts' lost.
    await page.reload();
    await expect(page.locator('[data-count]').getAttribute('data-count-status')).resolves.toBe('resolved');
    await expect(page.locator(`[data-count-line="${absent.grai}"] [data-count-state]`).getAttribute('data-count-state')).resolves.toBe('lost');
    await desk.goto('/fleet');
    const lost = await one<{ n: number }>(
      `SELECT count(*)::int AS n FROM site_count_lines l JOIN scan_events e ON e.id = l.scan_event_id WHERE l.resolution = 'lost' AND e.voided_at IS NULL`,
    );
    await expect(desk.locator('[data-counts-lost]').innerText()).resolves.toBe(String(lost.n));
    for (const p of [page, desk]) await p.context().close();
  }, 120_000);

  test('the count pages fit 390, 1280 and 1920 px', async () => {
    const count = await one<{ id: number; site_id: number }>('SELECT id, site_id FROM site_counts ORDER BY id DESC LIMIT 1');
    for (const width of [390, 1280, 1920]) {
      const kind = width === 390 ? 'phone' : 'desktop';
      const cust = await signedIn(customer.email, kind, width === 390 ? undefined : width);
      const desk = await signedIn(planner.email, kind, width === 390 ? undefined : width);
      for (const [page, path] of [
        [cust, '/portal/counts'],
        [cust, `/portal/counts/${count.site_id}`],
        [desk, '/planning/counts?show=all'],
        [desk, `/planning/counts/${count.id}`],
      ] as const) {
        const res = await page.goto(path);
        expect(res?.status(), path).toBe(200);
        await expectNoPageOverflow(page, `${path} at ${width}`);
        await screenshot(page, `${path.split('?')[0]!.replace(/^\//, '').replace(/\//g, '-').replace(/-\d+$/, '-one')}-${width}`);
      }
      for (const p of [cust, desk]) await p.context().close();
    }
  }, 120_000);
});
