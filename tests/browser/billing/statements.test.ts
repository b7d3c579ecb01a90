// Billing a month end to end: the admin sees every customer's draft for the last month that has ended, issues
// one, and the statement shows the same total as the row it came from; it becomes an invoice and a bank transfer
// pays part of it; the customer finds both in the portal (phone and desktop), with the same lines and the same
// outstanding amount, and downloads the lines as CSV whose amounts add up to the net. Bad input and the wrong role
// change nothing.
import { describe, test, expect, afterAll } from 'vitest';
import Papa from 'papaparse';
import { useApp, newContext, signIn, expectNoPageOverflow, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { hydrated } from '../support/yard';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { formatMoney } from '@/lib/billing/money';

const t = useApp();
afterAll(closeDb);

const CUSTOMER = 'buyer@haldenoils.example';

describe('issuing a month and checking it as the customer', () => {
  test('draft → issued statement → invoice → the portal, by the same figures', { timeout: 120_000 }, async () => {
    const cust = await one<{ id: number; name: string }>(`SELECT o.id, o.name FROM organisations o JOIN users u ON u.organisation_id = o.id WHERE u.email = $1`, [CUSTOMER]);
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, 'admin@northmere.example', DEMO_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/login'));
    await page.goto('/billing');
    await hydrated(page);
    const row = page.locator(`tr[data-customer="${cust.id}"]`);
    const draftGross = (await row.locator('[data-gross]').textContent())!.trim();
    const draftLines = Number((await row.locator('td').nth(1).textContent())!.trim());
    expect(draftLines).toBeGreaterThan(0);
    await screenshot(page, 'billing-month-1280');
    page.once('dialog', (d) => void d.accept());
    await Promise.all([page.waitForURL(/\/billing\/statements\/\d+$/), row.locator('button[data-action-button^="issue-"]').click()]);
    const id = Number(new URL(page.url()).pathname.split('/').pop());
    await expect(page.locator('[data-testid="statement-gross"]').textContent()).resolves.toBe(draftGross);
    await expect(page.locator('[data-testid="statement-lines"] tbody tr[data-line]').count()).resolves.toBe(draftLines);
    const stored = await one<{ net: string; gross: string; lines: number; sum: string }>(
      `SELECT s.net_minor AS net, s.gross_minor AS gross, (SELECT count(*)::int FROM statement_lines WHERE statement_id = s.id) AS lines,
              (SELECT sum(amount_minor) FROM statement_lines WHERE statement_id = s.id) AS sum FROM statements s WHERE s.id = $1`,
      [id],
    );
    expect(formatMoney(Number(stored.gross), 'EUR')).toBe(draftGross);
    expect([stored.lines, stored.sum]).toEqual([draftLines, stored.net]);
    await screenshot(page, 'billing-statement-1280');

    // The statement becomes an invoice (the next number), for the same total; a bank transfer pays part of it.
    await hydrated(page);
    page.once('dialog', (d) => void d.accept());
    await Promise.all([page.waitForURL(/\/billing\/invoices\/\d+$/), page.click('button[data-action-button="invoice"]')]);
    const invoiceId = Number(new URL(page.url()).pathname.split('/').pop());
    const inv = await one<{ number: string; gross: string }>(`SELECT number, gross_minor AS gross FROM invoices WHERE id = $1 AND statement_id = $2`, [invoiceId, id]);
    await expect(page.locator('[data-testid="invoice-number"]').textContent()).resolves.toBe(inv.number);
    await expect(page.locator('[data-testid="invoice-gross"]').textContent()).resolves.toBe(draftGross);
    await hydrated(page);
    await page.fill('#inv-payment-amount', '10.00');
    await Promise.all([page.waitForEvent('load'), page.click('form[data-form="payment"] button[type="submit"]')]);
    const outstanding = formatMoney(Number(inv.gross) - 1000, 'EUR');
    await expect(page.locator('[data-testid="invoice-outstanding"]').textContent()).resolves.toBe(outstanding);
    await expect(page.locator('[data-invoice-state]').getAttribute('data-invoice-state')).resolves.toBe('part_paid');
    // More than is outstanding: refused on the form, nothing recorded.
    await hydrated(page);
    await page.fill('#inv-payment-amount', '999999.00');
    await page.click('form[data-form="payment"] button[type="submit"]');
    await expect(page.locator('form[data-form="payment"] [role="alert"]').textContent()).resolves.toMatch(/more than the .* outstanding/);
    await expect(one<{ n: number }>(`SELECT count(*)::int AS n FROM invoice_payments WHERE invoice_id = $1`, [invoiceId])).resolves.toEqual({ n: 1 });
    await screenshot(page, 'billing-invoice-1280');

    // Issued now: the row links the statement; a second issue is refused and stores nothing.
    await page.goto('/billing');
    await expect(row.locator(`a[href="/billing/statements/${id}"]`).count()).resolves.toBe(1);
    const month = await page.inputValue('#bill-month');
    const again = await page.request.post('/api/billing/statements', { data: { customerId: cust.id, month }, headers: { Origin: t.app.url } });
    expect(again.status()).toBe(409);
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/issued already/);
    for (const bad of [{ customerId: 'x', month }, { customerId: cust.id, month: '2026-13' }, { customerId: cust.id }, { customerId: cust.id, month, extra: 1 }]) {
      const res = await page.request.post('/api/billing/statements', { data: bad, headers: { Origin: t.app.url } });
      expect(res.status(), JSON.stringify(bad)).toBe(400);
    }
    await expect(one<{ n: number }>(`SELECT count(*)::int AS n FROM statements WHERE customer_id = $1`, [cust.id])).resolves.toEqual({ n: 2 });
    await ctx.close();

    // The customer, on a phone and at 1920: the list, the statement, the CSV.
    for (const kind of ['phone', 'desktop'] as const) {
      const c = await newContext(t.browser, t.app, kind);
      const p = await c.newPage();
      if (kind === 'desktop') await p.setViewportSize({ width: 1920, height: 1000 });
      await signIn(p, CUSTOMER, DEMO_PASSWORD);
      await p.waitForURL('**/portal');
      await p.goto('/portal/statements');
      await expect(p.locator('[data-list="portal-statements"] li').count()).resolves.toBe(2);
      await expect(p.locator(`li[data-statement="${id}"] [data-gross]`).textContent()).resolves.toBe(draftGross);
      await expectNoPageOverflow(p, `statements list (${kind})`);
      await p.goto('/portal/invoices');
      await expect(p.locator(`tr[data-invoice="${invoiceId}"] [data-outstanding]`).textContent()).resolves.toBe(outstanding);
      await expect(p.locator(`tr[data-invoice="${invoiceId}"] [data-invoice-state]`).getAttribute('data-invoice-state')).resolves.toBe('part_paid');
      await expectNoPageOverflow(p, `invoices list (${kind})`);
      await p.goto('/portal/statements');
      await p.click(`li[data-statement="${id}"] a[href="/portal/statements/${id}"]`);
      await p.waitForURL(`**/portal/statements/${id}`);
      await expect(p.locator('[data-testid="statement-gross"]').textContent()).resolves.toBe(draftGross);
      const shown = kind === 'phone' ? '[data-testid="statement-lines-phone"] li[data-line]' : '[data-testid="statement-lines"] tbody tr[data-line]';
      await expect(p.locator(shown).count()).resolves.toBe(draftLines);
      await expectNoPageOverflow(p, `statement (${kind})`);
      await screenshot(p, `portal-statement-${kind === 'phone' ? 390 : 1920}`);
      if (kind === 'phone') {
        const csv = await p.request.get(`/api/portal/statements/${id}.csv`);
        expect(csv.status()).toBe(200);
        const parsed = Papa.parse<Record<string, string>>((await csv.text()).replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true });
        expect(parsed.data).toHaveLength(draftLines);
        const cents = parsed.data.reduce((n, r) => n + Math.round(Number(r.amount) * 100), 0);
        expect(String(cents)).toBe(stored.net);
      }
      await c.close();
    }
  });

  test('a planner may neither open billing nor issue: money is for the admin', async () => {
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL((u) => !u.pathname.startsWith('/login'));
    const res = await page.request.post('/api/billing/statements', { data: { customerId: 1, month: '2026-01' }, headers: { Origin: t.app.url } });
    expect(res.status()).toBe(403);
    expect((await page.goto('/billing'))!.status()).toBe(403);
    await ctx.close();
  });
});
