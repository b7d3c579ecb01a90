import { describe, test, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { OPERATOR } from '@/db/seed/scenario';
import { makeGrai, groupGrai } from '@/lib/gs1';
import { IMPORT_COLUMNS } from '@/lib/bins/register-csv';

const t = useApp();

// Serials unique to this run, so the tests can run again on the same database.
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const grai = (serial: string) => makeGrai(OPERATOR.gs1CompanyPrefix, '10010', serial);
const grouped = (value: string) => groupGrai(value, OPERATOR.gs1PrefixLength);
// Shaped like the published examples (UN Model Regulations 6.5.2.1.2), with the demo bin type's code.
const MARK = '31HA2/Y/05 24/NL/NMP 4417/2313/1285';
const HEADER = IMPORT_COLUMNS.map((c) => c.name).join(',');

async function desk(email = 'planner@northmere.example', kind: 'desktop' | 'phone' = 'desktop'): Promise<Page> {
  const ctx = await newContext(t.browser, t.app, kind);
  const page = await ctx.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => u.pathname !== '/login');
  return page;
}

/** Opens a page and waits until its islands have hydrated (their forms are disabled until then). */
async function open(page: Page, path: string) {
  const res = await page.goto(path);
  await page.waitForFunction(() => !document.querySelector('astro-island[ssr]'));
  return res;
}

async function exportedCsv(page: Page): Promise<string> {
  const res = await page.request.get('/bins/export.csv');
  expect(res.status()).toBe(200);
  return res.text();
}

describe('registering one bin', () => {
  test('a planner types a UN mark, sees it decoded and the month filled in, and registers the bin', async () => {
    for (const kind of ['desktop', 'phone'] as const) {
      const page = await desk(undefined, kind);
      const serial = `BR${RUN}${kind === 'phone' ? 'P' : 'D'}`;
      await open(page, '/bins/new');
      await page.getByRole('heading', { name: 'Register a bin' }).waitFor();
      await page.locator('#f-binTypeId').selectOption({ index: 1 });
      await page.locator('#f-siteId').selectOption({ label: 'Rotterdam Botlek depot (DEP-RTM)' });
      await page.fill('#f-grai', grai(serial));
      await expect(page.locator('#grai-ok').textContent()).resolves.toContain(grouped(grai(serial)));

      await page.fill('#f-unMarking', '31HA2/Y/13 24/NL/NMP 4417/2313/1285');
      await expect(page.locator('#un-mark-problem').textContent()).resolves.toContain('Month of manufacture 13 is outside 01–12');

      await page.fill('#f-unMarking', MARK);
      const decoded = page.locator('#un-mark-decoded');
      await decoded.waitFor();
      const text = await decoded.textContent();
      expect(text).toContain('31HA2: Composite IBC for liquids');
      expect(text).toContain('Y: packing groups II and III');
      expect(text).toContain('May 2024');
      expect(text).toContain('NMP 4417');
      expect(text).toContain('2,313 kg');
      expect(text).toContain('1,285 kg');
      // [computed, 6.5.6.6.4] 2313 / (1.8 × 1285) = 1
      expect(text).toContain('1 bin of up to 1,285 kg each');
      expect(await page.inputValue('#f-manufactureMonth')).toBe('2024-05');
      await page.locator('#month-from-mark').waitFor();
      // 30 months from May 2024, end of month (ADR 6.5.4.4.1; conventions in inspection-due.ts)
      await expect.poll(() => page.locator('#due-preview').textContent()).toContain('30 Nov 2026');
      await screenshot(page, `bins-new-mark-${kind}`);

      await page.click('#bin-form-submit');
      await page.locator('#register-done').waitFor();
      await expect(page.locator('#registered-grai').textContent()).resolves.toBe(grouped(grai(serial)));
      await screenshot(page, `bins-new-done-${kind}`);
      expect(await exportedCsv(page)).toContain(`${grai(serial)},${serial},FX1000,available,DEP-RTM,,2024-05,${MARK},0`);
      await page.context().close();
    }
  });

  test('problems come back per field: a wrong check digit and a GRAI already registered', async () => {
    const page = await desk();
    await open(page, '/bins/new');
    const value = grai(`BR${RUN}X`);
    const wrong = value.slice(0, 13) + String((Number(value.charAt(13)) + 1) % 10) + value.slice(14);
    await page.fill('#f-grai', wrong);
    await expect(page.locator('#grai-live-problem').textContent()).resolves.toMatch(/^Wrong check digit/);
    await page.click('#bin-form-submit');
    await page.locator('#bin-form-notice').waitFor();
    await expect(page.locator('#f-grai-problem').textContent()).resolves.toMatch(/Wrong check digit/);
    await expect(page.locator('#f-binTypeId-problem').textContent()).resolves.toMatch(/Choose a bin type/);
    await screenshot(page, 'bins-new-problems-desktop');

    await page.click('#mode-serial');
    await page.locator('#f-binTypeId').selectOption({ index: 1 });
    await page.locator('#f-siteId').selectOption({ index: 1 });
    await page.fill('#f-serial', `BR${RUN}D`); // registered by the test above
    await expect(page.locator('#built-grai').textContent()).resolves.toContain(grouped(grai(`BR${RUN}D`)));
    await page.fill('#f-manufactureMonth', '2024-05');
    await page.click('#bin-form-submit');
    await expect(page.locator('#f-serial-problem').textContent()).resolves.toMatch(/is already registered/);
    await page.context().close();
  });
});

describe('correcting a bin', () => {
  test('the edit form says why GRAI and status are fixed, saves, and refuses a stale form as changed meanwhile', async () => {
    const serial = `BR${RUN}D`;
    const first = await desk();
    const second = await first.context().newPage();
    for (const p of [first, second]) {
      await open(p, `/bins/${grai(serial)}/edit`);
      await p.locator('#bin-form').waitFor();
    }
    await expect(first.locator('#fixed-grai').textContent()).resolves.toBe(grouped(grai(serial)));
    await expect(first.getByText("Not editable: the GRAI is the bin's identity").isVisible()).resolves.toBe(true);
    await expect(first.getByText('Not editable here: status and place follow the scan log').isVisible()).resolves.toBe(true);

    await first.fill('#f-lastIntermediateTestMonth', '2026-01');
    await first.click('#bin-form-submit');
    await expect(first.locator('#bin-form-notice').textContent()).resolves.toContain('Saved. Next test due 31 Jul 2028.');
    await screenshot(first, 'bins-edit-saved-desktop');

    await second.fill('#f-lastIntermediateTestMonth', '2025-12');
    await second.click('#bin-form-submit');
    await expect(second.locator('#bin-form-notice').textContent()).resolves.toContain('Someone changed this bin after you opened the form');
    await second.locator('#reload-form').waitFor();
    await screenshot(second, 'bins-edit-stale-desktop');
    expect(await exportedCsv(first)).toContain(`${grai(serial)},${serial},FX1000,available,DEP-RTM,,2024-05,${MARK},0,2026-01-01,,2028-07-31,2029-05-31,2028-07-31`);

    const phone = await desk(undefined, 'phone');
    await open(phone, `/bins/${grai(serial)}/edit`);
    await phone.locator('#bin-form').waitFor();
    await screenshot(phone, 'bins-edit-phone');
    await phone.context().close();
    await first.context().close();
  });
});

describe('importing from CSV', () => {
  const lines = (n: number, prefix: string) => Array.from({ length: n }, (_, i) => `${grai(`${prefix}${RUN}${i + 1}`)},FX1000,DEP-DUI,,${MARK},,`);

  test('one bad line: the preview shows it with its line number and nothing is registered; fixed, all bins are registered and exported', async () => {
    for (const kind of ['desktop', 'phone'] as const) {
      const page = await desk(undefined, kind);
      const prefix = kind === 'phone' ? 'IP' : 'ID';
      const good = lines(4, prefix);
      const bad = `${grai(`${prefix}${RUN}9`)},FX1000,DEP-NOWHERE,2024-05,,,`;
      await open(page, '/bins/import');
      await page.getByRole('heading', { name: 'Import bins from a CSV file' }).waitFor();

      await page.setInputFiles('#import-file', {
        name: 'bins-with-error.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from([HEADER, good[0], good[1], bad, good[2], good[3]].join('\r\n')),
      });
      await page.locator('#import-preview').waitFor();
      await expect(page.locator('#import-counts').textContent()).resolves.toMatch(/5 lines · 4 ready · 1 with problems/);
      const row = page.locator('tr[data-line="4"]');
      await expect(row.getAttribute('data-ok')).resolves.toBe('no');
      await expect(row.textContent()).resolves.toContain('Unknown depot "DEP-NOWHERE".');
      await expect(page.locator('#import-commit').isDisabled()).resolves.toBe(true);
      await screenshot(page, `bins-import-error-${kind}`);
      const before = await exportedCsv(page);
      for (const l of good) expect(before).not.toContain(l.split(',')[0]);

      await page.setInputFiles('#import-file', { name: 'bins.csv', mimeType: 'text/csv', buffer: Buffer.from(`\uFEFF${[HEADER, ...good].join('\r\n')}\r\n`) });
      await page.locator('#import-commit:not([disabled])').waitFor();
      await expect(page.locator('#import-commit').textContent()).resolves.toBe('Register 4 bins');
      await screenshot(page, `bins-import-ready-${kind}`);
      await page.click('#import-commit');
      await page.locator('#import-done').waitFor();
      await expect(page.locator('#import-done').textContent()).resolves.toContain('4 bins registered');
      await screenshot(page, `bins-import-done-${kind}`);

      if (kind === 'desktop') {
        const [download] = await Promise.all([page.waitForEvent('download'), page.locator('#import-done a[href="/bins/export.csv"]').click()]);
        expect(download.suggestedFilename()).toMatch(/^loopfold-bin-register-\d{4}-\d{2}-\d{2}\.csv$/);
        const file = readFileSync((await download.path())!, 'utf8');
        for (const l of good) expect(file).toContain(`${l.split(',')[0]},`);
      }
      await page.context().close();
    }
  });

  test('a file without the required columns is refused with the list of missing columns', async () => {
    const page = await desk();
    await open(page, '/bins/import');
    await page.setInputFiles('#import-file', { name: 'short.csv', mimeType: 'text/csv', buffer: Buffer.from(`grai,bin_type\n${grai('X1')},FX1000\n`) });
    await page.locator('#import-problem').waitFor();
    await expect(page.locator('#missing-columns').textContent()).resolves.toBe('Missing: depotmanufacture_month');
    await page.context().close();
  });

  test('a 20 MB upload is refused with the limit, in the page and by the server, and nothing changes', { timeout: 90_000 }, async () => {
    const page = await desk();
    await open(page, '/bins/import');
    const big = Buffer.alloc(20 * 1024 * 1024, 'a');
    await page.setInputFiles('#import-file', { name: 'huge.csv', mimeType: 'text/csv', buffer: big });
    await expect(page.locator('#import-problem').textContent()).resolves.toContain('The file is 20 MB; the limit is 5 MB for one register import.');
    await screenshot(page, 'bins-import-too-large-desktop');
    const before = await exportedCsv(page);
    const res = await page.request.post('/api/bins/import/preview', { data: big, headers: { 'Content-Type': 'text/csv' } });
    expect(res.status()).toBe(413);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/^The file is 20 MB; the limit is 5 MB/);
    const binary = await page.request.post('/api/bins/import/preview', { data: Buffer.from([0x50, 0x4b, 3, 4, 0, 0, 0]), headers: { 'Content-Type': 'text/csv' } });
    expect(binary.status()).toBe(415);
    expect(await exportedCsv(page)).toBe(before);
    await page.context().close();
  });

  test('the format is documented on the page with a template to download', async () => {
    const page = await desk();
    await open(page, '/bins/import');
    for (const c of IMPORT_COLUMNS) await expect(page.locator(`#format-heading ~ dl code:text-is("${c.name}")`).count()).resolves.toBe(1);
    const template = await page.request.get('/bins/import/template.csv');
    expect((await template.text()).replace(/^\uFEFF/, '').split('\r\n')[0]).toBe(HEADER);
    await page.context().close();
  });
});

describe('who may use the register', () => {
  test('a customer is refused the register pages, the edit page and the APIs', async () => {
    const page = await desk('buyer@haldenoils.example');
    for (const path of ['/bins/new', '/bins/import', `/bins/${grai(`BR${RUN}D`)}/edit`]) {
      const res = await page.goto(path);
      expect(res?.status(), path).toBe(403);
      await expect(page.locator('h1').textContent()).resolves.toMatch(/not open to your role/);
    }
    await screenshot(page, 'bins-import-customer-refused-desktop');
    expect((await page.request.get('/bins/export.csv')).status()).toBe(403);
    expect((await page.request.post('/api/bins/register', { data: {} })).status()).toBe(403);
    expect((await page.request.post('/api/bins/import/preview', { data: 'grai\n' })).status()).toBe(403);
    expect((await page.request.patch(`/api/bins/${grai(`BR${RUN}D`)}/edit`, { data: { version: 0, binTypeId: 1 } })).status()).toBe(403);
    await page.context().close();
  });
});
