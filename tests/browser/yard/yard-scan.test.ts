// A yard hand identifies bins on a phone (390 × 844): by typing the GRAI, by a
// photo of the QR label, and through the live camera (Chromium's fake capture
// device fed a clip of the label). The yard page's own JavaScript is measured
// against the phone budget, and the QR decoder must load only on demand.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { chromium, type Browser, type Page } from 'playwright-core';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { ARTIFACTS, PHONE, newContext, screenshot, signIn, useApp, expectNoPageOverflow } from '../support/app';
import { availableBinsAtHome, gzipSizeOf, hydrated, labelPng, qrClip, type PickedBin, pickPhoto } from '../support/yard';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { groupGrai } from '@/lib/gs1';

const t = useApp();

const YARD = 'yard@northmere.example';
const BUDGET_BYTES = 150 * 1024; // initial JavaScript of a yard page, gzip (DESIGN §7: the phone page stays small)

let bins: PickedBin[];

beforeAll(async () => {
  bins = await availableBinsAtHome(YARD, 3);
  expect(bins).toHaveLength(3);
});

async function yardPage(b: Browser, baseURL = t.app.url): Promise<Page> {
  const ctx = await b.newContext({ baseURL, ...PHONE });
  const page = await ctx.newPage();
  await signIn(page, YARD, DEMO_PASSWORD);
  await page.waitForURL((u) => u.pathname === '/yard');
  await hydrated(page);
  return page;
}

const scriptUrls = (page: Page) =>
  page.evaluate(() =>
    performance
      .getEntriesByType('resource')
      .map((e) => new URL(e.name))
      .filter((u) => u.origin === location.origin && u.pathname.endsWith('.js'))
      .map((u) => u.pathname),
  );

describe('identifying a bin on the yard', () => {
  test('the yard pages stay inside the phone budget and load the QR decoder only on demand', async () => {
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, YARD, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/yard');
    const report: Record<string, { scripts: Array<{ url: string; gzip: number }>; gzip: number }> = {};
    for (const path of ['/yard', `/bins/${bins[0]!.grai}`]) {
      // A fresh page each time, so the list holds what that page loads by itself.
      const p = await ctx.newPage();
      await p.goto(path);
      await p.waitForLoadState('networkidle');
      const scripts = [...new Set(await scriptUrls(p))];
      expect(scripts.some((u) => u.includes('/qr-reader.'))).toBe(false);
      const sizes = scripts.map((url) => ({ url, gzip: gzipSizeOf(url) }));
      const gzip = sizes.reduce((sum, x) => sum + x.gzip, 0);
      expect(gzip).toBeLessThan(BUDGET_BYTES);
      report[path.startsWith('/bins/') ? '/bins/[grai]' : path] = { scripts: sizes, gzip };
      console.log(`[yard budget] ${path} initial JS: ${(gzip / 1024).toFixed(1)} KiB gzip in ${scripts.length} files (budget ${BUDGET_BYTES / 1024} KiB)`);
      await p.close();
    }
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'yard-online-phone');
    mkdirSync(ARTIFACTS, { recursive: true });
    writeFileSync(join(ARTIFACTS, 'yard-js.json'), JSON.stringify({ budget: BUDGET_BYTES, pages: report }, null, 2));
    await ctx.close();
  });

  test('the yard and bin pages at desktop width (planners open the same bin page)', async () => {
    const yardCtx = await newContext(t.browser, t.app, 'desktop');
    const yard = await yardCtx.newPage();
    await signIn(yard, YARD, DEMO_PASSWORD);
    await yard.waitForURL((u) => u.pathname === '/yard');
    await expect(yard.locator('h1').first().isVisible()).resolves.toBe(true);
    await expectNoPageOverflow(yard, 'yard start page at desktop width');
    await screenshot(yard, 'yard-online-desktop');
    await yardCtx.close();
    const ctx = await newContext(t.browser, t.app, 'desktop');
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/fleet');
    await page.goto(`/bins/${bins[0]!.grai}`);
    await hydrated(page);
    await page.locator('button[data-action="quarantine"]').click();
    const form = page.locator('[data-form="quarantine"]');
    await form.waitFor();
    // The planner gets the same action form as the yard, with its submit button in view and nothing cut off.
    await expect(form.locator('button[type="submit"]').isVisible()).resolves.toBe(true);
    await expectNoPageOverflow(page, 'bin page with an open action form at desktop width');
    await screenshot(page, 'bin-actions-planner-desktop');
    await ctx.close();
  });

  test('typed entry: the grouped GRAI from the label opens the bin', async () => {
    const page = await yardPage(t.browser);
    const bin = bins[0]!;
    await page.fill('#scan-text', groupGrai(bin.grai, 7));
    await page.click('[data-scan-input] button[type=submit]');
    await page.waitForURL((u) => u.pathname === `/bins/${bin.grai}`);
    await expect(page.locator('h1').first().getAttribute('aria-label')).resolves.toBe(`GRAI ${bin.grai}`);
    await hydrated(page);
    await page.locator('button[data-action="prep_check"]').click();
    await screenshot(page, 'bin-actions-yard-phone');
    await page.context().close();
  });

  test('typed entry with a wrong check digit is caught before anything is looked up', async () => {
    const page = await yardPage(t.browser);
    const bin = bins[0]!;
    const wrong = bin.grai.slice(0, 13) + String((Number(bin.grai[13]) + 1) % 10) + bin.grai.slice(14);
    await page.fill('#scan-text', wrong);
    await page.click('[data-scan-input] button[type=submit]');
    await page.locator('#scan-error').waitFor();
    await expect(page.locator('#scan-error').textContent()).resolves.toMatch(/check digit/i);
    expect(new URL(page.url()).pathname).toBe('/yard');
    await page.context().close();
  });

  test('a photo of the QR label opens the bin, and the decoder arrives only then', { timeout: 90_000 }, async () => {
    const page = await yardPage(t.browser);
    const bin = bins[1]!;
    const loaded: string[] = [];
    page.on('request', (r) => loaded.push(new URL(r.url()).pathname));
    await page.waitForLoadState('networkidle');
    expect(loaded.some((u) => u.includes('/qr-reader.'))).toBe(false);
    await pickPhoto(page, '[data-photo-input]', { name: 'label.png', mimeType: 'image/png', buffer: await labelPng(`https://id.example.org/8003/${bin.grai}`) });
    await page.waitForURL((u) => u.pathname === `/bins/${bin.grai}`);
    const chunk = loaded.find((u) => u.includes('/qr-reader.'));
    expect(chunk).toBeDefined();
    const chunkGzip = gzipSizeOf(chunk!);
    console.log(`[yard budget] QR decoder chunk ${chunk}: ${(chunkGzip / 1024).toFixed(1)} KiB gzip, loaded on demand`);
    writeFileSync(join(ARTIFACTS, 'yard-qr-chunk.json'), JSON.stringify({ chunk, gzip: chunkGzip }, null, 2));
    await page.context().close();
  });

  test('a QR code that is not a bin label is refused with what it says', { timeout: 90_000 }, async () => {
    const page = await yardPage(t.browser);
    await pickPhoto(page, '[data-photo-input]', { name: 'other.png', mimeType: 'image/png', buffer: await labelPng('https://example.org/menu') });
    await page.locator('#scan-error').waitFor();
    await expect(page.locator('#scan-error').textContent()).resolves.toMatch(/not a bin label/);
    expect(new URL(page.url()).pathname).toBe('/yard');
    await page.context().close();
  });
});

// QR decoding in the browser is CPU-bound: under the full two-lane run one of these once took over the default 30 s.
describe('the live camera', () => {
  let cameraBrowser: Browser;
  beforeAll(async () => {
    const clip = qrClip(`${t.app.url}/8003/${bins[2]!.grai}`, join(tmpdir(), `loopfold-qr-${process.pid}.y4m`));
    cameraBrowser = await chromium.launch({
      executablePath: '/usr/bin/chromium',
      headless: true,
      args: [
        '--disable-gpu',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--use-fake-device-for-media-stream',
        '--use-fake-ui-for-media-stream',
        `--use-file-for-fake-video-capture=${clip}`,
        // A second name for the app that is not localhost: a plain-http page there is not a secure context.
        '--host-resolver-rules=MAP yard-lan.test 127.0.0.1',
      ],
    });
  });
  afterAll(async () => {
    await cameraBrowser?.close();
  });

  test('scanning the label with the camera opens the bin (secure context: localhost)', { timeout: 90_000 }, async () => {
    const page = await yardPage(cameraBrowser);
    await page.click('[data-open-camera]');
    await page.locator('[data-camera-view="live"] video').waitFor({ timeout: 15_000 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'yard-camera-live-phone');
    await page.waitForURL((u) => u.pathname === `/bins/${bins[2]!.grai}`, { timeout: 20_000 });
    await page.context().close();
  });

  test('on plain http the camera explains itself and the photo route still works', { timeout: 90_000 }, async () => {
    const page = await yardPage(cameraBrowser, `http://yard-lan.test:${t.app.port}`);
    expect(await page.evaluate(() => window.isSecureContext)).toBe(false);
    await page.click('[data-open-camera]');
    await page.locator('[data-capture-notice]').waitFor();
    await expect(page.locator('[data-capture-notice]').textContent()).resolves.toMatch(/secure connection/);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'yard-camera-insecure-phone');
    await pickPhoto(page, '[data-photo-input]', {
      name: 'label.png',
      mimeType: 'image/png',
      buffer: await labelPng(`http://yard-lan.test:${t.app.port}/8003/${bins[1]!.grai}`),
    });
    await page.waitForURL((u) => u.pathname === `/bins/${bins[1]!.grai}`);
    await page.context().close();
  });
});
