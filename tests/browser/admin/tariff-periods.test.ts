// An admin changes a customer's hire terms from a date on the customers page: a refused entry names the field and
// changes nothing; new terms from a future day are saved, the terms in force end the day before, and the periods
// table shows both with the one in force marked.
import { afterAll, describe, expect, test } from 'vitest';
import { expectNoPageOverflow, newContext, screenshot, signIn, useApp } from '../support/app';
import { closeDb, one, rows } from '../support/db';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { hydrated } from '../support/yard';
import { addDays } from '@/lib/calendar';

const t = useApp();
const admin = DEMO_LOGINS.find((l) => l.role === 'admin')!;

afterAll(closeDb);

describe('hire terms by period', () => {
  test('new terms from a date end the open period the day before', async () => {
    const ctx = await newContext(t.browser, t.app, 'desktop');
    ctx.setDefaultTimeout(20_000);
    const page = await ctx.newPage();
    await signIn(page, admin.email, DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/admin/customers');
    await hydrated(page);
    const customerId = Number(await page.locator('#tariff-customer').inputValue());
    const before = await rows<{ id: number }>('SELECT id FROM tariffs WHERE customer_id = $1', [customerId]);
    await page.locator('[data-tariff-periods] tbody tr').first().waitFor();
    const latest = await one<{ valid_from: string }>(`SELECT to_char(max(valid_from), 'YYYY-MM-DD') AS valid_from FROM tariffs WHERE customer_id = $1`, [customerId]);
    const from = addDays(latest.valid_from > '2027-01-01' ? latest.valid_from : '2027-01-01', 40);

    // A daily rate that is not an amount: refused with the field named, nothing added.
    await page.fill('#tariff-validFrom', from);
    await page.fill('#tariff-dailyRate', '1.999');
    await page.click('#tariff-form button[type="submit"]');
    await expect(page.locator('#tariff-dailyRate-problem').textContent()).resolves.toMatch(/amount/);
    expect(await rows('SELECT id FROM tariffs WHERE customer_id = $1', [customerId])).toHaveLength(before.length);

    await page.fill('#tariff-dailyRate', '2.35');
    await page.click('#tariff-form button[type="submit"]');
    await expect(page.locator('#tariff-notice').textContent()).resolves.toMatch(/New terms from .* saved\. The terms before end on/);
    const saved = await rows<{ valid_from: string; valid_to: string | null; daily_rate: string }>(
      `SELECT to_char(valid_from, 'YYYY-MM-DD') AS valid_from, to_char(valid_to, 'YYYY-MM-DD') AS valid_to, daily_rate::text FROM tariffs
        WHERE customer_id = $1 ORDER BY valid_from DESC LIMIT 2`,
      [customerId],
    );
    expect(saved[0]).toEqual({ valid_from: from, valid_to: null, daily_rate: '2.35' });
    expect(saved[1]!.valid_to).toBe(addDays(from, -1));
    await expect.poll(() => page.locator('[data-tariff-periods] tbody tr').count()).toBe(before.length + 1);
    await expect.poll(() => page.locator('[data-tariff-periods] tr[data-in-force]').count()).toBe(1);
    for (const width of [1280, 1920]) {
      await page.setViewportSize({ width, height: 900 });
      await expectNoPageOverflow(page, `customers page at ${width} px`);
    }
    await page.locator('#tariffs').scrollIntoViewIfNeeded();
    await screenshot(page, 'admin-tariffs-1920');
    await ctx.close();
  });
});
