// A recall from the lot to the customer's notice: the planner opens a lot's trace, recalls it, writes the
// notice and sends it; the notice reaches the customer's address in the local mailbox and the page records it.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot, expectNoPageOverflow } from '../support/app';
import { one, rows, closeDb } from '../support/db';
import { waitForMail } from '../support/accounts';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('recalling a liner lot', () => {
  test('recall, trace and the notice in the customer’s mailbox', { timeout: 150_000 }, async () => {
    // A lot of its own (the demo's lots stay as they are for other tests) and one past trip that used it.
    const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE code = 'DEP-RTM'`);
    const customer = await one<{ id: number; name: string; email: string; site: number; site_name: string }>(
      `SELECT o.id, o.name, o.contact_email AS email, s.id AS site, s.name AS site_name FROM organisations o JOIN sites s ON s.organisation_id = o.id
        WHERE o.kind = 'customer' AND o.contact_email IS NOT NULL AND s.kind = 'customer' ORDER BY o.id, s.id LIMIT 1`,
    );
    const bin = await one<{ id: number; serial: string }>(`SELECT id, serial FROM assets WHERE status <> 'retired' ORDER BY id DESC LIMIT 1`);
    const lot = await one<{ id: number }>(
      `INSERT INTO liner_lots (supplier, lot_number, spec, quantity_received, received_on, expiry_date, site_id)
       VALUES ('Polyvale Liners', 'RC-' || to_char(clock_timestamp(), 'HH24MISSMS'), 'PE bag', 50, current_date - 60, current_date + 300, $1) RETURNING id`,
      [depot.id],
    );
    await one(`INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at) VALUES ($1, $2, 'receipt', 50, now() - interval '60 days') RETURNING id`, [lot.id, depot.id]);
    const trip = await one<{ id: number }>(
      `INSERT INTO trips (asset_id, customer_id, depot_site_id, customer_site_id, liner_lot_id, dispatched_at, delivered_at, filled_at, fill_product, returned_at, status)
       VALUES ($1, $2, $3, $4, $5, now() - interval '40 days', now() - interval '39 days', now() - interval '38 days', 'Glucose syrup', now() - interval '20 days', 'closed') RETURNING id`,
      [bin.id, customer.id, depot.id, customer.site, lot.id],
    );
    const { lot_number: lotNumber } = await one<{ lot_number: string }>('SELECT lot_number FROM liner_lots WHERE id = $1', [lot.id]);

    const desk = await newContext(t.browser, t.app, 'desktop');
    const page = await desk.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto(`/liners/lots/${lot.id}/trace`);
    const traced = page.locator('[data-testid="trace"] tbody tr[data-use="trip"]');
    await expect(traced.count()).resolves.toBe(1);
    await expect(traced.first().getAttribute('data-trip')).resolves.toBe(String(trip.id));
    await expect(traced.first().textContent()).resolves.toContain('Glucose syrup');
    await expect(traced.first().textContent()).resolves.toContain(customer.site_name);

    // The recall asks for a reason; without one it is refused with a message and nothing changes.
    page.on('dialog', (d) => void d.accept());
    await page.click('[data-testid="status-form"] button[value="recall"]');
    await page.waitForSelector('[data-testid="status-form"] [data-form-error]:not(.hidden)');
    await expect(page.locator('[data-testid="status-form"] [data-form-error]').textContent()).resolves.toMatch(/why the lot is stopped/);
    await expect(one<{ status: string }>('SELECT status FROM liner_lots WHERE id = $1', [lot.id])).resolves.toEqual({ status: 'released' });
    await page.fill('#status-reason', 'Supplier reports weak seams in this lot');
    await Promise.all([page.waitForEvent('load'), page.click('[data-testid="status-form"] button[value="recall"]')]);
    await expect(page.locator('[data-testid="lot-stopped"]').textContent()).resolves.toMatch(/Recalled since .*Supplier reports weak seams/);

    const since = new Date(Date.now() - 5_000);
    await page.fill('#notice-message', 'Please set aside the glucose syrup filled in this bin until we confirm it is safe.');
    await Promise.all([page.waitForEvent('load'), page.click('[data-testid="notice-form"] button[type="submit"]')]);
    const mail = await waitForMail(customer.email, { since, subject: new RegExp(`Liner lot ${lotNumber} recalled`) });
    expect(mail.text).toContain(`• ${bin.serial}: trip`);
    expect(mail.text).toContain('Glucose syrup');
    expect(mail.text).toContain('Please set aside the glucose syrup');
    await expect(page.locator(`[data-testid="notices"] [data-recipient="${customer.email}"]`).textContent()).resolves.toMatch(/sent/);
    const recorded = await rows<{ email: string; status: string }>(
      `SELECT r.email, r.status FROM liner_recall_notice_recipients r JOIN liner_recall_notices n ON n.id = r.notice_id WHERE n.lot_id = $1`,
      [lot.id],
    );
    expect(recorded).toContainEqual({ email: customer.email, status: 'sent' });

    for (const [width, name] of [
      [1280, 'desktop'],
      [1920, '1920'],
      [390, '390'],
    ] as const) {
      await page.setViewportSize({ width, height: 900 });
      await expectNoPageOverflow(page, `lot trace at ${width} px`);
      await screenshot(page, `liner-lot-trace-${name}`);
    }
    await desk.close();
  });
});
