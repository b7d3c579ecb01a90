// A customer pays an invoice online on a phone: part of it first, then the rest, each time on the payment
// provider's pay page (the local fake, reached by the app only through the provider's SDK) and back; the invoice
// shows each payment once the provider's signed event has arrived, and is settled at the end. A declined card
// changes nothing.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, expectNoPageOverflow, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { hydrated } from '../support/yard';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { formatMoney, minorUnitsToDecimal } from '@/lib/billing/money';

const t = useApp();
afterAll(closeDb);

describe('paying an invoice online', () => {
  test('part, a declined card, then the rest: settled, each payment from the verified event', { timeout: 90_000 }, async () => {
    const inv = await one<{ id: number; gross: string }>(
      `SELECT i.id, i.gross_minor AS gross FROM invoices i JOIN users u ON u.organisation_id = i.customer_id
        WHERE u.email = 'buyer@haldenoils.example' AND i.series = 'invoice' AND NOT EXISTS (SELECT 1 FROM invoice_payments p WHERE p.invoice_id = i.id)
        ORDER BY i.id LIMIT 1`,
    );
    expect(inv, 'the demo customer has an unpaid invoice').toBeDefined();
    const gross = Number(inv.gross);
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'buyer@haldenoils.example', DEMO_PASSWORD);
    await page.waitForURL('**/portal');
    await page.goto(`/portal/invoices/${inv.id}`);
    await hydrated(page);
    await expectNoPageOverflow(page, 'invoice with the pay box (phone)');
    await expect(page.inputValue('#pay-amount')).resolves.toBe(minorUnitsToDecimal(gross, 2));

    // More than is outstanding: refused on the page, the provider never asked.
    const sessions = t.app.pay.sent.length;
    await page.fill('#pay-amount', minorUnitsToDecimal(gross + 1, 2));
    await page.click('button[data-pay-online]');
    await expect(page.locator('#pay-problem').textContent()).resolves.toMatch(/more than/);

    // Part of it: the provider's page, a declined card first, then a card that pays.
    await page.fill('#pay-amount', '25.00');
    await Promise.all([page.waitForURL(`${t.app.pay.base}/pay/**`), page.click('button[data-pay-online]')]);
    await page.click('button[data-pay="declined"]');
    await expect(page.locator('[role="alert"]').textContent()).resolves.toMatch(/declined/);
    expect(t.app.pay.sent.length).toBe(sessions);
    await screenshot(page, 'pay-provider-page-390');
    await Promise.all([page.waitForURL(`**/portal/invoices/${inv.id}?checkout=*`), page.click('button[data-pay="card"]')]);
    await expect(page.locator('[data-checkout="paid"]').count()).resolves.toBe(1);
    await expect(page.locator('[data-testid="invoice-paid"]').textContent()).resolves.toBe(formatMoney(2500, 'EUR'));
    await expect(page.locator('[data-testid="invoice-outstanding"]').textContent()).resolves.toBe(formatMoney(gross - 2500, 'EUR'));
    await expect(page.locator('[data-invoice-state]').getAttribute('data-invoice-state')).resolves.toMatch(/part_paid|overdue/);
    await screenshot(page, 'pay-invoice-part-paid-390');

    // The rest.
    await hydrated(page);
    await expect(page.inputValue('#pay-amount')).resolves.toBe(minorUnitsToDecimal(gross - 2500, 2));
    await Promise.all([page.waitForURL(`${t.app.pay.base}/pay/**`), page.click('button[data-pay-online]')]);
    await Promise.all([page.waitForURL(`**/portal/invoices/${inv.id}?checkout=*`), page.click('button[data-pay="card"]')]);
    await expect(page.locator('[data-invoice-state]').getAttribute('data-invoice-state')).resolves.toBe('paid');
    await expect(page.locator('[data-testid="invoice-outstanding"]').textContent()).resolves.toBe(formatMoney(0, 'EUR'));
    await expect(page.locator('form[data-form="pay-online"]').count()).resolves.toBe(0);
    const rows = await one<{ n: number; sum: string }>(
      `SELECT count(*)::int AS n, sum(amount_minor)::text AS sum FROM invoice_payments WHERE invoice_id = $1 AND method = 'card'`,
      [inv.id],
    );
    expect([rows.n, Number(rows.sum)]).toEqual([2, gross]);
    expect(t.app.pay.sent.filter((e) => e.type === 'checkout.session.completed')).toHaveLength(2);
    await ctx.close();
  });
});
