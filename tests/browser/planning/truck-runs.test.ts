// Two "empties ready" requests at two customer sites near Rotterdam, one from the public bin page and one the planner
// takes on the phone and records on the requests page; the planner lets the app group them into one run, names the carrier and confirms it; the yard receives both bins against the run on a
// phone, and the run is done.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot, expectNoPageOverflow } from '../support/app';
import { hydrated } from '../support/yard';
import { db, one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
/** Other files' open requests, set aside while this one suggests its run (see below) and opened again after. */
let setAside: number[] = [];
afterAll(async () => {
  if (setAside.length) await db().query(`UPDATE collection_requests SET status = 'open' WHERE id = ANY($1)`, [setAside]);
  await closeDb();
});

describe('collection runs', () => {
  test('a planner groups two collection requests into a run that the yard then receives', { timeout: 180_000 }, async () => {
    const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE code = 'DEP-RTM'`);
    const sites = await Promise.all(['HAL-ZWD', 'HAL-MDK'].map((code) => one<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE code = $1`, [code])));
    const bins = await Promise.all(
      sites.map((s) => one<{ grai: string }>(`SELECT grai FROM assets WHERE site_id = $1 AND status IN ('on_hire', 'awaiting_collection') ORDER BY id LIMIT 1`, [s.id])),
    );
    for (const b of bins) expect(b, 'the demo pool has a bin on hire at each site').toBeDefined();
    // Open requests elsewhere (the demo's, or another file's report) join the suggestion, and how many there are
    // decides whether the two sites share a truck: this test sets them aside so its run is the same in any order.
    setAside = (
      await db().query<{ id: number }>(`UPDATE collection_requests SET status = 'cancelled' WHERE status = 'open' AND site_id <> ALL($1) RETURNING id`, [sites.map((s) => s.id)])
    ).rows.map((r) => r.id);

    // Nothing open yet at the first site either, which the label's report would join (merged requests).
    await db().query(`UPDATE collection_requests SET status = 'cancelled' WHERE site_id = $1 AND status IN ('open', 'scheduled')`, [sites[0]!.id]);
    // The public bin page's form, as whoever stands by the bins sends it (other files may have used up this
    // address's hourly allowance of reports).
    await db().query(`DELETE FROM rate_limits WHERE key LIKE 'public_form:report:%' OR key LIKE 'public_bin:%'`);
    for (const b of bins.slice(0, 1)) {
      const form = new FormData();
      for (const [k, v] of Object.entries({ quantity: '1', contactName: 'Gate office', contactPhone: '+31101234567' })) form.set(k, v);
      const res = await fetch(`${t.app.url}/api/public/bins/${b!.grai}/collection-request`, { method: 'POST', headers: { origin: t.app.url }, body: form });
      expect(res.status, await res.text()).toBe(201);
    }

    const desk = await newContext(t.browser, t.app, 'desktop');
    const planner = await desk.newPage();
    await signIn(planner, 'planner@northmere.example', DEMO_PASSWORD);
    await planner.waitForURL('**/fleet');

    // The second site rings: the planner records its request (a missing site is refused by name first). No request
    // of that site is open yet (another file may have left one, which this one would join: merged requests).
    await db().query(`UPDATE collection_requests SET status = 'cancelled' WHERE site_id = $1 AND status IN ('open', 'scheduled')`, [sites[1]!.id]);
    await planner.goto('/requests');
    await hydrated(planner);
    const record = planner.locator('[data-testid="record-collection"]');
    await record.locator('summary').click();
    await record.locator('#pcr-quantity').fill('1');
    await record.locator('#pcr-contact').fill('Gate office');
    await record.getByRole('button', { name: 'Save the request' }).click();
    await expect(record.locator('#pcr-siteId-problem').textContent()).resolves.toBe('Choose the customer site.');
    await record.locator('#pcr-site').selectOption(String(sites[1]!.id));
    await record.getByRole('button', { name: 'Save the request' }).click();
    await planner.waitForURL(/\/requests#collections$/);
    const recorded = await one<{ source: string; quantity: number }>(`SELECT source, quantity FROM collection_requests WHERE site_id = $1 ORDER BY id DESC LIMIT 1`, [
      sites[1]!.id,
    ]);
    expect(recorded).toEqual({ source: 'planner', quantity: 1 });
    await screenshot(planner, 'requests-recorded-desktop');

    await planner.goto('/planning/runs');
    await planner.selectOption('#s-depot', String(depot.id));
    await planner.click('[data-testid="suggest-form"] button[type="submit"]');
    await planner.waitForURL(/depot=/);
    await hydrated(planner);
    // The suggested run that takes both sites.
    const card = planner.locator('[data-testid="suggested-run"]', { hasText: sites[0]!.name }).filter({ hasText: sites[1]!.name });
    await expect(card.count()).resolves.toBe(1);
    await screenshot(planner, 'runs-suggested-desktop');
    await card.locator('[data-testid="plan-run"]').click();
    await planner.waitForURL(/\/planning\/runs\/\d+$/);
    await hydrated(planner);
    const runId = Number(new URL(planner.url()).pathname.split('/').pop());
    await expect(planner.locator('[data-run-status]').first().getAttribute('data-run-status')).resolves.toBe('planned');

    // One bin expected at each of the two stops; any other stop the suggestion added goes.
    for (const stop of await planner.locator('[data-testid="edit-stops"] li').all()) {
      const site = Number(await stop.getAttribute('data-stop-site'));
      if (sites.some((s) => s.id === site)) await stop.locator('input[type="number"]').fill('1');
      else await stop.getByRole('button', { name: 'Remove' }).click();
    }
    await planner.fill('#run-carrier', 'Maas Haulage');
    await planner.click('[data-testid="save-run"]');
    await planner.waitForLoadState('load');
    await hydrated(planner);
    await expect(planner.locator('[data-testid="run-received"]').textContent()).resolves.toMatch(/0 of 2 expected/);
    await planner.click('[data-command="confirm"]');
    await planner.waitForFunction(() => document.querySelector('[data-run-status]')?.getAttribute('data-run-status') === 'confirmed');
    await screenshot(planner, 'run-confirmed-desktop');
    for (const [width, name] of [
      [1920, 'wide'],
      [390, 'phone'],
    ] as const) {
      await planner.setViewportSize({ width, height: 900 });
      await expectNoPageOverflow(planner, `run page at ${width} px`);
      await screenshot(planner, `run-confirmed-${name}`);
    }
    await planner.setViewportSize({ width: 1280, height: 860 });
    const stored = await one<{ reference: string; scheduled: number }>(
      `SELECT r.reference, (SELECT count(*)::int FROM collection_requests c WHERE c.truck_run_id = r.id AND c.status = 'scheduled') AS scheduled FROM truck_runs r WHERE r.id = $1`,
      [runId],
    );
    expect(stored.scheduled).toBeGreaterThanOrEqual(2);
    await planner.goto(`/planning/runs/${runId}/sheet`);
    await expect(planner.locator('[data-testid="sheet-ref"]').textContent()).resolves.toBe(stored.reference);

    // The yard, on a phone: the run is due back; each bin scanned is received against it.
    const phone = await newContext(t.browser, t.app, 'phone');
    const yard = await phone.newPage();
    await signIn(yard, 'yard@northmere.example', DEMO_PASSWORD);
    await yard.waitForURL('**/yard');
    await yard.click('[data-testid="yard-runs-link"]');
    await yard.waitForURL('**/yard/runs');
    await expect(yard.locator(`[data-run-id="${runId}"] [data-testid="yard-run-count"]`).textContent()).resolves.toMatch(/0 received · 2 still expected/);
    await expectNoPageOverflow(yard, 'yard runs');
    await screenshot(yard, 'yard-runs-phone');
    await yard.click(`[data-run-id="${runId}"] a`);
    await yard.waitForURL(`**/yard/runs/${runId}`);
    await hydrated(yard);
    for (const [i, b] of bins.entries()) {
      await yard.fill('#scan-text', b!.grai);
      await yard.click('[data-scan-input] button[type="submit"]');
      await yard.waitForFunction((n) => (document.querySelector('[data-testid="run-count"]')?.textContent ?? '').startsWith(`${n}/`), i + 1);
      if (i === 0) {
        await expect(yard.locator('[data-testid="run-stops-left"]').textContent()).resolves.toMatch(/1 still expected \(0 of 1\)/);
        await screenshot(yard, 'yard-run-receiving-phone');
      }
    }
    await yard.waitForSelector('[data-testid="run-done"]');
    await expectNoPageOverflow(yard, 'run receiving');
    await screenshot(yard, 'yard-run-done-phone');
    await phone.close();

    await planner.goto(`/planning/runs/${runId}`);
    await expect(planner.locator('[data-run-status]').first().getAttribute('data-run-status')).resolves.toBe('done');
    await expect(planner.locator('[data-testid="run-received"]').textContent()).resolves.toMatch(/2 of 2 expected/);
    const statuses = await one<{ done: number }>(`SELECT count(*)::int AS done FROM collection_requests WHERE truck_run_id = $1 AND status = 'done'`, [runId]);
    expect(statuses.done).toBeGreaterThanOrEqual(2);
    await desk.close();
  });
});
