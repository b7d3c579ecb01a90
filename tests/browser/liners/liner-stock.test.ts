// The planner's liner stock page: a lot at the Duisburg depot that will expire long before the depot uses
// it is flagged with the liners at risk and a transfer to a depot that will use them in time; the figures on
// screen match the ledger; the moves filter and export.
import { describe, test, expect, afterAll } from 'vitest';
import { join } from 'node:path';
import { useApp, newContext, signIn, screenshot, ARTIFACTS } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('the liner stock page', () => {
  test('a lot expiring before use is flagged with a proposed transfer; on hand matches the ledger; moves filter and export', { timeout: 150_000 }, async () => {
    // A spec Rotterdam uses (liner kits, 60 in the last 8 weeks, 40 left) and Duisburg does not, where 300 of it
    // arrived with 20 days to go: all 300 would expire at Duisburg; Rotterdam would use about 1.07 a day of them.
    const depot = await one<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE code = 'DEP-DUI'`);
    const rtm = await one<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE code = 'DEP-RTM'`);
    const supplier = await one<{ id: number }>(`SELECT id FROM liner_suppliers WHERE name = 'Polyvale Liners'`);
    const spec = await one<{ id: number }>(
      `INSERT INTO liner_specs (code, name, material, layers, nominal_capacity_l, valve_type, valve_size, gland_size, food_contact, supplier_id, article_number)
       VALUES ('XT-1000', 'Test kit bag 1,000 L', 'PE', 1, 1000, 'ball', 'DN80', 'DN150', FALSE, $1, 'PVL-XT') RETURNING id`,
      [supplier.id],
    );
    await one(`INSERT INTO bin_type_liner_specs (bin_type_id, liner_spec_id) SELECT id, $1 FROM bin_types WHERE code = 'FX1000' RETURNING bin_type_id`, [spec.id]);
    const order = await one<{ id: number }>(`SELECT id FROM hire_orders WHERE depot_site_id = $1 ORDER BY id LIMIT 1`, [rtm.id]);
    const newLot = async (lotNumber: string, site: number, qty: number, expiresInDays: number) => {
      const lot = await one<{ id: number }>(
        `INSERT INTO liner_lots (supplier, lot_number, spec, quantity_received, received_on, expiry_date, site_id, liner_spec_id, supplier_id)
         VALUES ('Polyvale Liners', $1, 'PE kit bag', $2, (now() AT TIME ZONE 'Europe/Amsterdam')::date - 30, (now() AT TIME ZONE 'Europe/Amsterdam')::date + $3::int, $4, $5, $6)
         RETURNING id`,
        [lotNumber, qty, expiresInDays, site, spec.id, supplier.id],
      );
      await one(`INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at) VALUES ($1, $2, 'receipt', $3, now() - interval '30 days') RETURNING id`, [
        lot.id,
        site,
        qty,
      ]);
      return lot.id;
    };
    await newLot('XP-SHORT-1', depot.id, 300, 20);
    const used = await newLot('XT-RTM-1', rtm.id, 100, 400);
    for (const daysAgo of [20, 10, 3]) {
      await one(
        `INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at, hire_order_id, folded_bins) VALUES ($1, $2, 'kit_sent', -20, now() - make_interval(days => $3), $4, 20) RETURNING id`,
        [used, rtm.id, daysAgo, order.id],
      );
    }

    const desk = await newContext(t.browser, t.app, 'desktop');
    const page = await desk.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/liners/stock');
    const row = page.locator(`tr[data-depot="${depot.id}"][data-spec="XT-1000"]`);
    await expect(row.locator('[data-lot-state]').first().getAttribute('data-lot-state')).resolves.toBe('at_risk');
    await screenshot(page, 'liner-stock-pool-desktop');

    await row.locator('a').click();
    await page.waitForURL(`**/liners/stock/${depot.id}`);
    const card = page.locator('section[data-spec="XT-1000"]');
    const lotRow = card.locator('tr[data-lot="XP-SHORT-1"]');
    await expect(lotRow.locator('[data-lot-state]').getAttribute('data-lot-state')).resolves.toBe('at_risk');
    const atRisk = Number((await lotRow.locator('[data-testid="at-risk"] strong').textContent())!.replace(/,/g, ''));
    expect(atRisk).toBe(300); // Duisburg has no use for this spec
    // Rotterdam: 60 used in 56 days → 60/56 a day; the liners arrive a day later, so days 0–19 count: 20 × 60/56 = 21.4 → 21.
    await expect(lotRow.locator('[data-testid="proposed-transfer"]').textContent()).resolves.toBe(`Proposed: send 21 to ${rtm.name}, which will use them in time.`);
    await expect(lotRow.locator('td').nth(0).textContent()).resolves.toBe('1'); // first expiry: used first (the # column)
    await expect(page.locator('[data-testid="expiring-soon"]').textContent()).resolves.toMatch(/XP-SHORT-1 \(XT-1000\) · 300 liners · expires .* · 300 at risk/);

    // On hand on screen = the ledger's sum over the spec's released, unexpired lots at the depot.
    const ledger = await one<{ n: number }>(
      `SELECT COALESCE(sum(x.n), 0)::int AS n FROM (SELECT sum(m.quantity) AS n FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
         WHERE m.site_id = $1 AND l.liner_spec_id = $2 AND l.status = 'released' AND l.expiry_date >= (now() AT TIME ZONE 'Europe/Amsterdam')::date
         GROUP BY l.id HAVING sum(m.quantity) > 0) x`,
      [depot.id, spec.id],
    );
    await expect(card.locator('[data-figure="on-hand"]').textContent()).resolves.toBe(ledger.n.toLocaleString('en-GB'));
    for (const [width, name] of [
      [1280, 'desktop'],
      [1920, '1920'],
      [390, '390'],
    ] as const) {
      await page.setViewportSize({ width, height: 900 });
      await screenshot(page, `liner-stock-depot-${name}`);
      await card.screenshot({ path: join(ARTIFACTS, 'screenshots', `liner-stock-card-${name}.png`) });
    }
    await page.setViewportSize({ width: 1280, height: 860 });

    // The moves: filtered to this lot's receipt, and the same filter as CSV.
    await page.selectOption('#f-kind', 'receipt');
    await page.fill('#f-lot', 'XP-SHORT');
    await page.click('[data-testid="ledger-filter"] button[type="submit"]');
    await page.waitForURL(/kind=receipt/);
    const ledgerRows = page.locator('[data-testid="ledger"] tbody tr');
    await expect(ledgerRows.count()).resolves.toBe(1);
    await expect(ledgerRows.first().textContent()).resolves.toMatch(/Received\s*XP-SHORT-1\s*\+300/);
    const href = await page.locator('a:has-text("Download CSV")').getAttribute('href');
    const csv = await page.evaluate(async (h) => (await fetch(h!)).text(), href);
    expect(csv.split('\r\n').filter(Boolean)).toHaveLength(2);
    expect(csv).toMatch(/receipt,Received,XP-SHORT-1,300/);

    // A bad date in the filter is a message, not an error page.
    await page.goto(`/liners/stock/${depot.id}?from=2026-13-45`);
    await expect(page.locator('[role="alert"]:not(.hidden)').textContent()).resolves.toMatch(/date/);
    await page.goto('/liners/stock/999999');
    await expect(page.locator('h1').textContent()).resolves.toBe('No such depot');
    await desk.close();
  });
});
