// Yard staff receive a lot of liners on the phone (390 px): the carton's code read from a photo by the yard's QR
// reader fills lot, dates and count; the lot is received against a purchase order with its certificate (a PDF,
// its type sniffed from the bytes — a text file named .pdf is refused).
import { describe, test, expect, afterAll } from 'vitest';
import { PHONE, signIn, useApp, screenshot, expectNoPageOverflow } from '../support/app';
import { hydrated, labelPng, pickPhoto } from '../support/yard';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);
const YARD = 'yard@northmere.example';

const ymd = (d: Date) => d.toISOString().slice(0, 10);
const yymmdd = (d: Date) => ymd(d).slice(2).replace(/-/g, '');
// The smallest file that is a PDF by its bytes (header and trailer).
const PDF = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj 2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');

describe('receiving liners on the phone', () => {
  test('scan the carton, choose the order, add the certificate: the lot is on the shelf and the order counts it', { timeout: 120_000 }, async () => {
    const home = await one<{ id: number }>(`SELECT home_site_id AS id FROM users WHERE email = $1`, [YARD]);
    const spec = await one<{ id: number; supplier_id: number }>(
      `SELECT sp.id, sp.supplier_id FROM liner_specs sp JOIN liner_suppliers s ON s.id = sp.supplier_id WHERE sp.active AND s.active AND sp.food_contact ORDER BY sp.id LIMIT 1`,
    );
    expect(spec, 'the demo has a food-contact spec with a supplier').toBeDefined();
    const po = await one<{ id: number }>(
      `INSERT INTO liner_purchase_orders (supplier_id, liner_spec_id, depot_site_id, quantity, price_per_liner, ordered_on, wanted_by)
       VALUES ($1, $2, $3, 300, 4.1, current_date - 7, current_date + 7) RETURNING id`,
      [spec.supplier_id, spec.id, home.id],
    );
    const lot = `RX-${Date.now().toString(36).toUpperCase()}`;
    const expiry = new Date(Date.now() + 400 * 86_400_000);
    const made = new Date(Date.now() - 10 * 86_400_000);

    const ctx = await t.browser.newContext({ baseURL: t.app.url, ...PHONE });
    const page = await ctx.newPage();
    await signIn(page, YARD, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/yard');
    await page.goto('/yard/liners/receive');
    await hydrated(page);
    await pickPhoto(page, '[data-photo-input]', {
      name: 'carton.png',
      mimeType: 'image/png',
      buffer: await labelPng(`(01)09501234567890(17)${yymmdd(expiry)}(11)${yymmdd(made)}(10)${lot}(30)200`),
    });
    // Either the carton's read or the reader's notice: say which, so a failure names its cause.
    await page.locator('[data-testid="carton-read"], [data-qr-capture] [role="alert"], [data-qr-capture] [role="status"]').first().waitFor();
    const notice = await page.locator('[data-qr-capture]').textContent();
    await screenshot(page, 'liner-receive-after-photo-390');
    expect(await page.getByTestId('carton-read').count(), `no carton read; the reader says: ${notice}`).toBe(1);
    await expect(page.inputValue('#rcv-lot')).resolves.toBe(lot);
    await expect(page.inputValue('#rcv-expiry')).resolves.toBe(ymd(expiry));
    await expect(page.inputValue('#rcv-made')).resolves.toBe(ymd(made));
    await expect(page.inputValue('#rcv-qty')).resolves.toBe('200');

    await page.selectOption('#rcv-po', String(po.id));
    await expect(page.inputValue('#rcv-spec')).resolves.toBe(String(spec.id));
    await expect(page.inputValue('#rcv-supplier')).resolves.toBe(String(spec.supplier_id));

    // A text file named .pdf: refused by its bytes, nothing recorded.
    await page.setInputFiles('#rcv-cert', { name: 'certificate.pdf', mimeType: 'application/pdf', buffer: Buffer.from('not a pdf at all') });
    await page.click('[data-testid="receive-form"] button[type="submit"]');
    await expect(page.getByTestId('receive-error').textContent()).resolves.toMatch(/file type is not accepted/);
    await expect(one<{ n: number }>('SELECT count(*)::int AS n FROM liner_lots WHERE lot_number = $1', [lot])).resolves.toEqual({ n: 0 });
    await expectNoPageOverflow(page, 'receiving at 390 px');
    await screenshot(page, 'liner-receive-390');

    await page.setInputFiles('#rcv-cert', { name: 'declaration.pdf', mimeType: 'application/pdf', buffer: PDF });
    await page.click('[data-testid="receive-form"] button[type="submit"]');
    await expect(page.getByTestId('received').textContent()).resolves.toMatch(new RegExp(`Lot ${lot} received: 200 liners .*Counted against LPO-`));
    await screenshot(page, 'liner-received-390');

    const row = await one<{ id: number; site_id: number; quantity_received: number; purchase_order_id: number; manufactured_on: string; content_type: string; purpose: string }>(
      `SELECT l.id, l.site_id, l.quantity_received, l.purchase_order_id, l.manufactured_on::text, a.content_type, a.purpose
         FROM liner_lots l JOIN attachments a ON a.id = l.certificate_id WHERE l.lot_number = $1`,
      [lot],
    );
    expect(row).toMatchObject({
      site_id: home.id,
      quantity_received: 200,
      purchase_order_id: po.id,
      manufactured_on: ymd(made),
      content_type: 'application/pdf',
      purpose: 'certificate',
    });
    await expect(one<{ n: number }>(`SELECT sum(quantity)::int AS n FROM liner_moves WHERE lot_id = $1 AND kind = 'receipt'`, [row.id])).resolves.toEqual({ n: 200 });
    await expect(one<{ status: string }>('SELECT status FROM liner_purchase_orders WHERE id = $1', [po.id])).resolves.toEqual({ status: 'open' });

    // The compact stock view: count the lot (5 short), then send 10 to another depot.
    await page.goto('/yard/liners');
    const item = page.locator(`[data-testid="yard-lots"] li[data-lot="${lot}"]`);
    await expect(item.locator('[data-figure="on-hand"]').textContent()).resolves.toBe('200');
    await item.locator('summary').click();
    await item.locator('[data-testid="count-form"] input[name="counted"]').fill('195');
    await Promise.all([page.waitForEvent('load'), item.locator('[data-testid="count-form"] button').click()]);
    await expect(page.getByTestId('recent-counts').textContent()).resolves.toContain(`${lot}: counted 195, expected 200 (-5)`);
    await expect(item.locator('[data-figure="on-hand"]').textContent()).resolves.toBe('195');
    await item.locator('summary').click();
    await item.locator('[data-testid="transfer-form"] input[name="quantity"]').fill('10');
    await Promise.all([page.waitForEvent('load'), item.locator('[data-testid="transfer-form"] button').click()]);
    await expect(item.locator('[data-figure="on-hand"]').textContent()).resolves.toBe('185');
    await expect(one<{ n: number; to: number }>(`SELECT -quantity AS n, to_site_id AS to FROM liner_moves WHERE lot_id = $1 AND kind = 'sent'`, [row.id])).resolves.toMatchObject({
      n: 10,
    });
    await expectNoPageOverflow(page, 'yard liners at 390 px');
    await screenshot(page, 'yard-liners-390');
    await ctx.close();
  });
});
