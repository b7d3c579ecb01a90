// At the test bench on a phone: a yard hand (flagged as a qualified inspector) records a 2.5-year inspection
// with its leakproofness test and a photo, and sees the due date move. Below the minimum of ADR/RID 6.5.6.7.3
// (20 kPa for 10 minutes) the form refuses and nothing is recorded. The expected due date is worked out with
// date-fns (the app does not use it): end of the month 30 months after the test month.
import { describe, test, expect, afterAll } from 'vitest';
import QRCode from 'qrcode';
import { addMonths, endOfMonth, format } from 'date-fns';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { hydrated } from '../support/yard';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('recording a 2.5-year inspection on a phone', () => {
  test('with a photo: the due date moves and the test mark shows', async () => {
    const bin = await one<{ grai: string; id: number; next_full_due: string; today: string }>(
      `SELECT a.grai, a.id, a.next_full_due::text, current_date::text AS today FROM assets a JOIN users u ON u.home_site_id = a.site_id
         JOIN bin_types bt ON bt.id = a.bin_type_id
        WHERE u.email = 'yard@northmere.example' AND a.status = 'available' AND a.next_intermediate_due < a.next_full_due
          AND bt.policy_kind = 'un' AND bt.intermediate_months = 30
        ORDER BY a.next_due, a.id LIMIT 1`,
    );
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    await page.goto(`/bins/${bin.grai}`);
    await page.click('a[data-action="inspect"]');
    await page.waitForURL(`**/bins/${bin.grai}/inspect`);
    await hydrated(page);
    await expect(page.locator('[role="note"]').first().textContent()).resolves.toMatch(/relief valve/);
    await page.check('input[name="kind"][value="intermediate"]');
    for (const key of ['externalCondition', 'serviceEquipment', 'markingLegible']) await page.click(`button[data-ok="${key}"]`);
    // Below the minimum first: refused at once, on its field.
    await page.fill('#leak-kpa', '15');
    await page.fill('#leak-min', '10');
    await page.click('button[data-leak="pass"]');
    await page.click('button[data-outcome="pass"]');
    await page.click('button[type="submit"]');
    await expect(page.locator('#leak-kpa-problem').textContent()).resolves.toMatch(/at least 20 kPa/);
    expect((await one<{ n: number }>('SELECT count(*)::int AS n FROM inspections WHERE asset_id = $1 AND performed_on = current_date', [bin.id])).n).toBe(0);
    await page.fill('#leak-kpa', '21');
    const photo = await QRCode.toBuffer('stand-in photo of the test rig', { type: 'png', width: 300 });
    await page.locator('#photos').setInputFiles({ name: 'rig.png', mimeType: 'image/png', buffer: photo });
    await screenshot(page, 'inspection-form-phone');
    await page.click('button[type="submit"]');
    await page.waitForSelector('[data-recorded]');
    const [y, m] = bin.today.split('-').map(Number) as [number, number];
    const due = format(endOfMonth(addMonths(new Date(y, m - 1, 1), 30)), 'yyyy-MM-dd');
    const nextDue = due < bin.next_full_due ? due : bin.next_full_due;
    const long = (d: string) => format(new Date(`${d}T12:00:00`), 'd MMM yyyy');
    await expect(page.locator('[data-testid="next-due"]').textContent()).resolves.toBe(long(nextDue));
    await expect(page.locator('[data-testid="test-mark"]').textContent()).resolves.toMatch(new RegExp(`^${bin.today.slice(5, 7)} ${bin.today.slice(2, 4)} · `));
    await screenshot(page, 'inspection-recorded-phone');
    const rec = await one<{ id: number; photo_ids: number[]; leak_test_pressure_kpa: string; next_intermediate_due: string }>(
      `SELECT id, photo_ids, leak_test_pressure_kpa, next_intermediate_due::text FROM inspections WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`,
      [bin.id],
    );
    expect(rec.photo_ids).toHaveLength(1);
    expect(Number(rec.leak_test_pressure_kpa)).toBe(21);
    expect(rec.next_intermediate_due).toBe(due);
    const asset = await one<{ next_intermediate_due: string; next_due: string }>('SELECT next_intermediate_due::text, next_due::text FROM assets WHERE id = $1', [bin.id]);
    expect(asset).toEqual({ next_intermediate_due: due, next_due: nextDue });
    // The bin page shows the new date and the mark; the printable record says what it is.
    await page.click('a:has-text("Back to the bin")');
    await page.waitForURL(`**/bins/${bin.grai}`);
    await expect(page.locator('body').textContent()).resolves.toContain(long(due));
    await expect(page.locator('[data-testid="test-mark"]').textContent()).resolves.toMatch(/ · /);
    await page.goto(`/inspections/${rec.id}`);
    await expect(page.locator('main').textContent()).resolves.toMatch(/A record, not a certification/);
    await screenshot(page, 'inspection-record-phone');
    await ctx.close();
  });
});
