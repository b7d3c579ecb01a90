// Stories 1 and 2 on a phone: a yard hand prepares bins on their pages
// (receive → prep check → fit liner), loads them against a hire order in
// continuous scan mode (a bin that is not ready is refused with the reason),
// sends the truck and prints the note; the receiving end confirms delivery
// through the note's link with a name and a photo.
import { describe, test, expect, afterAll } from 'vitest';
import QRCode from 'qrcode';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { recordAction } from '../support/yard';
import { one, rows, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

const record = recordAction;

describe('preparing and loading bins on a phone', () => {
  test('receive → prep check → fit liner on the bin page, then a load of two with the note and delivery confirmation', { timeout: 120_000 }, async () => {
    const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE code = 'DEP-RTM'`);
    // One folded empty coming back from a customer (received first) and one already at the yard's depot,
    // both in test date and not prep-checked yet.
    const type = `(SELECT id FROM bin_types WHERE code = 'FX1000')`;
    const returning = await one<{ grai: string; serial: string; bin_type_id: number; status: string }>(
      `SELECT grai, serial, bin_type_id, status FROM assets WHERE status = 'awaiting_collection' AND next_due > current_date + 30
          AND bin_type_id = ${type} ORDER BY id LIMIT 1`,
    );
    const here = await one<{ grai: string; serial: string; bin_type_id: number; status: string }>(
      `SELECT grai, serial, bin_type_id, status FROM assets WHERE site_id = $1 AND status = 'available' AND NOT prep_checked
          AND next_due > current_date + 30 AND bin_type_id = ${type} ORDER BY id LIMIT 1`,
      [depot.id],
    );
    const bins = [returning, here];
    expect(bins.every(Boolean)).toBe(true);
    const order = await one<{ id: number; reference: string }>(
      `SELECT id, reference FROM hire_orders WHERE depot_site_id = $1 AND status IN ('confirmed','loading') AND bin_type_id = $2 ORDER BY needed_by LIMIT 1`,
      [depot.id, bins[0]!.bin_type_id],
    );
    expect(order).toBeTruthy();

    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');

    for (const [i, bin] of bins.entries()) {
      // typed entry on the yard page opens the bin
      await page.goto('/yard');
      await page.fill('#scan-text', bin.grai);
      await page.click('[data-scan-input] button[type="submit"]');
      await page.waitForURL(`**/bins/${bin.grai}`);
      await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe(bin.status);
      if (bin.status === 'awaiting_collection') {
        await record(page, 'receive'); // never scanned as collected: the collection is inferred and flagged
        await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('available');
        await expect(page.locator('[data-testid="timeline"]').first().textContent()).resolves.toMatch(/Inferred — not scanned/);
      }
      await record(page, 'prep_check');
      await record(page, 'fit_liner');
      await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('prepared');
      if (i === 0) await screenshot(page, 'bin-prepared-phone');
    }

    // the load
    await page.goto(`/loads/new?order=${order.id}`);
    await page.click(`[data-start-order="${order.id}"]`);
    await page.waitForURL(/\/loads\/LD-/);
    // This load by its reference: the page may resume one another file opened for the same order.
    const loadRef = new URL(page.url()).pathname.split('/')[2]!;
    const notReady = await one<{ grai: string }>(`SELECT grai FROM assets WHERE site_id = $1 AND status = 'available' ORDER BY id DESC LIMIT 1`, [depot.id]);
    for (const g of [bins[0]!.grai, notReady.grai, bins[1]!.grai]) {
      await page.fill('#scan-text', g);
      await page.click('[data-scan-input] button[type="submit"]');
      await page.waitForFunction((grai) => document.querySelector('[data-testid="load-attempts"]')?.textContent?.includes(grai), g);
    }
    const refused = page.locator('[data-testid="load-attempts"] li[data-ok="false"]');
    await expect(refused.first().textContent()).resolves.toMatch(/not possible while the bin is available/);
    await expect(page.locator('[data-testid="load-count"]').textContent()).resolves.toMatch(/^2\//);
    await screenshot(page, 'load-scanning-phone');
    await page.fill('#carrier', 'Dijkstra Transport');
    await page.fill('#vehicle', 'BX-482-T');
    await page.fill('#driver', 'Sem Visser');
    await page.click('button:has-text("Dispatch 2 bins")');
    await page.waitForURL(/\/note$/);
    await expect(page.locator('[data-testid="note-count"]').textContent()).resolves.toMatch(/2 bins/);
    const noteText = await page.locator('[data-testid="note-bins"]').textContent();
    for (const b of bins) expect(noteText).toContain(b.serial);
    await screenshot(page, 'dispatch-note-phone');
    const link = await page.locator('[data-testid="confirm-link"]').getAttribute('href');
    await ctx.close();

    // the receiving end, not signed in
    const anon = await newContext(t.browser, t.app, 'phone');
    const p2 = await anon.newPage();
    await p2.goto(new URL(link!).pathname);
    await p2.fill('#name', 'Mila de Boer');
    const png = await QRCode.toBuffer('delivery photo stand-in', { type: 'png' });
    await p2.setInputFiles('#photo', { name: 'load.png', mimeType: 'image/png', buffer: png });
    await p2.click('#confirm-form button[type="submit"]');
    await p2.waitForSelector('#confirm-done:not(.hidden)');
    await expect(p2.locator('#confirm-done').textContent()).resolves.toMatch(/2 bins recorded as delivered/);
    await screenshot(p2, 'delivery-confirmed-phone');
    await anon.close();

    const after = await rows<{ status: string }>(`SELECT status FROM assets WHERE grai = ANY($1)`, [bins.map((b) => b.grai)]);
    expect(after.map((a) => a.status)).toEqual(['on_hire', 'on_hire']);
    const load = await one<{ status: string; received_by_name: string; delivery_photo_id: number | null }>(
      `SELECT status, received_by_name, delivery_photo_id FROM loads WHERE reference = $1`,
      [loadRef],
    );
    expect(load).toMatchObject({ status: 'delivered', received_by_name: 'Mila de Boer' });
    expect(load.delivery_photo_id).not.toBeNull();
  });
});
