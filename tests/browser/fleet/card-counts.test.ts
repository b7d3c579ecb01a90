// Every figure card on the pool overview and the yard start page opens a list, and its number is that
// list's length: the overview's cards against the fleet grid's own count, the yard's open orders
// against the orders "Start a load" offers, and each other yard figure against its list on /yard/bins.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, expectNoPageOverflow, screenshot } from '../support/app';
import { closeDb } from '../support/db';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { hydrated } from '../support/yard';

const t = useApp();
afterAll(closeDb);
const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
const number = (s: string | null) => Number((s ?? '').replace(/[^\d]/g, ''));

describe('a card’s number is the length of the list it opens', () => {
  test('pool overview: each card against the grid it opens (30 and 7 silent days)', { timeout: 180_000 }, async () => {
    const ctx = await newContext(t.browser, t.app, 'desktop');
    ctx.setDefaultTimeout(30_000);
    const page = await ctx.newPage();
    await signIn(page, planner.email, DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    for (const overview of ['/fleet', '/fleet?stale=7']) {
      await page.goto(overview);
      const cards = await page.$$eval('a[data-card]', (as) =>
        as.map((a) => ({ id: a.getAttribute('data-card')!, href: a.getAttribute('href')!, n: a.querySelector('[data-testid^="count-"]')!.textContent })),
      );
      expect(cards.map((c) => c.id)).toEqual(['in-service', 'with-customers', 'overdue', 'awaiting', 'silent']);
      for (const card of cards) {
        await page.goto(card.href);
        await hydrated(page).catch(() => undefined);
        // The grid settles on its own count of the card's filter (it may show another for a moment while it starts).
        await expect.poll(async () => number(await page.locator('#bin-count').textContent()), { timeout: 30_000, message: `${overview} → ${card.id}` }).toBe(number(card.n));
      }
    }
    await ctx.close();
  });

  test('yard start page: the open orders and bins to prepare are those "Start a load" lists', { timeout: 120_000 }, async () => {
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    const orders = number(await page.getByTestId('open-orders').textContent());
    const toPrepare = number(await page.getByTestId('to-prepare').textContent());
    await page.click('a[data-card="to-prepare"]');
    await page.waitForURL('**/loads/new');
    const listed = await page.$$eval('[data-start-order]', (bs) => bs.map((b) => b.querySelector('.num')!.textContent!));
    expect(listed.length).toBe(orders);
    const open = listed.map((s) => s.match(/(\d+)\/(\d+)/)!).reduce((sum, m) => sum + Math.max(0, Number(m[2]) - Number(m[1])), 0);
    expect(open).toBe(toPrepare);

    // Every other figure on the page opens its list on /yard/bins, and the number is that list's length.
    await page.goto('/yard');
    const figures = await page.$$eval('a[data-yard-figure]', (as) =>
      as.map((a) => ({ id: a.getAttribute('data-yard-figure')!, href: a.getAttribute('href')!, text: a.textContent })),
    );
    for (const id of ['here', 'returning', 'awaiting', 'tests-due', 'held']) expect(figures.map((f) => f.id)).toContain(id);
    expect(figures.filter((f) => f.id.startsWith('here-')).length, 'each status at the depot opens its list').toBeGreaterThan(1);
    for (const f of figures) {
      const n = number((f.text ?? '').match(/\d[\d,]*/)?.[0] ?? '');
      await page.goto(f.href);
      await expect(page.getByTestId('list-count').textContent(), f.id).resolves.toBe(n.toLocaleString('en-GB'));
      await expect(page.locator('[data-testid="yard-list"] > li').count(), f.id).resolves.toBe(n);
    }
    await expectNoPageOverflow(page, 'a yard list');
    await screenshot(page, 'yard-list-phone');
    await ctx.close();
  });
});
