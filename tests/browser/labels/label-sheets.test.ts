import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, rmSync, writeFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { QueryTypes } from 'sequelize';
import type { BrowserContext, Page } from 'playwright-core';
import { PNG } from 'pngjs';
import jsQR from 'jsqr';
import { ARTIFACTS, newContext, screenshot, signIn, useApp } from '../support/app';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { sequelize } from '@/db/sequelize';

const t = useApp();

// QR label sheets, end to end: the built server renders a sheet, Chromium prints it to PDF at the sheet's
// own @page size, and the PDF is checked with tools that share no code with Loopfold:
// - page count and page size: poppler's `pdfinfo` (Debian poppler-utils);
// - text positions: poppler's `pdftotext -bbox` (word boxes in PostScript points, 1 pt = 1/72 in);
// - every QR: the page rasterised by poppler's `pdftoppm`, each label's region cut out by the stock's
//   geometry, decoded with jsQR (a general-purpose QR decoder; Loopfold makes its codes with `qrcode`).
// The expected Digital Links are built here by plain concatenation, `<base>/8003/<GRAI>` (GS1 Digital Link:
// the AI 8003 value is one path segment [published]; demo GRAIs are digits only, so nothing is escaped).
// Stock geometry, written out here from the stocks' published sizes (see tests/unit/label-stock.test.ts):
const MM = 72 / 25.4; // points per millimetre
const A4 = { widthPt: 595.28, heightPt: 841.89, cols: 3, rows: 8, left: 0, top: 0.5, pitchX: 70, pitchY: 37, w: 70, h: 37, qr: 32, padX: 3 };
const IN = 25.4;
const LETTER = { widthPt: 612, heightPt: 792, cols: 3, rows: 10, left: 0.1875 * IN, top: 0.5 * IN, pitchX: 2.75 * IN, pitchY: IN, w: 2.625 * IN, h: IN, qr: 23, padX: 1.5 };
type Stock = typeof A4;
const DPI = 300;

const OUT = join(ARTIFACTS, 'labels');
let ctx: BrowserContext;
let page: Page;
let base: string;

interface BinRow {
  id: number;
  grai: string;
  serial: string;
  label_printed_at: Date | null;
}

beforeAll(async () => {
  rmSync(OUT, { recursive: true, force: true });
  mkdirSync(OUT, { recursive: true });
  const [settings] = await sequelize.query<{ digital_link_base: string }>('SELECT digital_link_base FROM settings WHERE id = 1', { type: QueryTypes.SELECT });
  base = settings!.digital_link_base.replace(/\/+$/, '');
  ctx = await newContext(t.browser, t.app, 'desktop');
  page = await ctx.newPage();
  const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
  await signIn(page, planner.email, DEMO_PASSWORD);
  await page.waitForURL('**/fleet');
});
afterAll(async () => {
  await ctx?.close();
  await sequelize.close();
});

function slotRectMm(stock: Stock, position: number) {
  const col = (position - 1) % stock.cols;
  const row = Math.floor((position - 1) / stock.cols);
  return { x: stock.left + col * stock.pitchX, y: stock.top + row * stock.pitchY, w: stock.w, h: stock.h };
}

async function printToPdf(name: string): Promise<string> {
  const file = join(OUT, `${name}.pdf`);
  writeFileSync(file, await page.pdf({ preferCSSPageSize: true }));
  return file;
}

function pdfInfo(file: string) {
  const text = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
  const pages = Number(/^Pages:\s+(\d+)/m.exec(text)?.[1]);
  const size = /^Page size:\s+([\d.]+) x ([\d.]+) pts/m.exec(text);
  return { pages, widthPt: Number(size?.[1]), heightPt: Number(size?.[2]) };
}

/** Word boxes per page from `pdftotext -bbox`, in points from the page's top-left corner. */
function wordsByPage(file: string) {
  const html = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8', maxBuffer: 64 << 20 });
  return html
    .split('<page ')
    .slice(1)
    .map((chunk) =>
      [...chunk.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)].map((m) => ({
        xMin: Number(m[1]),
        yMin: Number(m[2]),
        xMax: Number(m[3]),
        yMax: Number(m[4]),
        text: m[5]!,
      })),
    );
}

/** Rasterises every page, cuts out each label position and decodes it; null where no QR is found. */
function decodeLabels(file: string, stock: Stock, name: string): Array<Array<string | null>> {
  const prefix = join(OUT, name);
  execFileSync('pdftoppm', ['-r', String(DPI), '-png', file, prefix]);
  const pngs = readdirSync(OUT)
    .filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'))
    .sort((a, b) => Number(/-(\d+)\.png$/.exec(a)![1]) - Number(/-(\d+)\.png$/.exec(b)![1]));
  const px = (mm: number) => Math.round((mm / 25.4) * DPI);
  return pngs.map((f) => {
    const png = PNG.sync.read(readFileSync(join(OUT, f)));
    const out: Array<string | null> = [];
    for (let position = 1; position <= stock.cols * stock.rows; position++) {
      const r = slotRectMm(stock, position);
      const x0 = px(r.x);
      const y0 = px(r.y);
      const w = Math.min(px(r.w), png.width - x0);
      const h = Math.min(px(r.h), png.height - y0);
      const crop = new Uint8ClampedArray(w * h * 4);
      for (let y = 0; y < h; y++) {
        const from = ((y0 + y) * png.width + x0) * 4;
        crop.set(png.data.subarray(from, from + w * 4), y * w * 4);
      }
      out.push(jsQR(crop, w, h)?.data ?? null);
    }
    return out;
  });
}

/** Checks that each bin's serial is printed inside its own label, right of the QR. */
function expectTextInLabels(file: string, stock: Stock, bins: BinRow[], startAt: number) {
  const pages = wordsByPage(file);
  const perSheet = stock.cols * stock.rows;
  bins.forEach((bin, i) => {
    const n = startAt - 1 + i;
    const words = pages[Math.floor(n / perSheet)]!;
    const r = slotRectMm(stock, (n % perSheet) + 1);
    const hits = words.filter((w) => w.text === bin.serial);
    // The serial stands twice: large on its own, and at the end of the grouped GRAI.
    const inside = hits.filter(
      (w) => w.xMin >= (r.x + stock.padX + stock.qr) * MM - 0.5 && w.xMax <= (r.x + r.w) * MM + 0.5 && w.yMin >= r.y * MM - 0.5 && w.yMax <= (r.y + r.h) * MM + 0.5,
    );
    expect(inside.length, `serial ${bin.serial} inside label ${n + 1}`).toBe(2);
  });
}

const linkOf = (grai: string) => `${base}/8003/${grai}`;

describe('label sheets print to PDF with every QR readable', () => {
  let a4Bins: BinRow[];

  test('A4, 26 bins by serial range: 2 pages, text in place, all 26 QRs decode to their Digital Links in label order', async () => {
    a4Bins = await sequelize.query<BinRow>(
      `SELECT id, grai, serial, label_printed_at FROM assets WHERE serial ~ '^[0-9]+$' AND serial::bigint BETWEEN 100001 AND 100026 ORDER BY serial::bigint, grai`,
      { type: QueryTypes.SELECT },
    );
    expect(a4Bins).toHaveLength(26);
    const res = await page.goto('/labels/sheet?by=range&from=100001&to=100026&stock=a4-3x8&start=1');
    expect(res?.status()).toBe(200);
    await expect(page.locator('#label-count').textContent()).resolves.toBe('26');
    await expect(page.locator('#sheet-count').textContent()).resolves.toBe('2');
    await screenshot(page, 'labels-sheet-a4-desktop');

    const file = await printToPdf('a4-range');
    const info = pdfInfo(file);
    expect(info.pages).toBe(2);
    expect(info.widthPt).toBeCloseTo(A4.widthPt, 0);
    expect(info.heightPt).toBeCloseTo(A4.heightPt, 0);
    expectTextInLabels(file, A4, a4Bins, 1);

    const decoded = decodeLabels(file, A4, 'a4-range');
    expect(decoded).toHaveLength(2);
    const found = decoded.flat().filter((d): d is string => d !== null);
    const expected = a4Bins.map((b) => linkOf(b.grai));
    expect(new Set(found)).toEqual(new Set(expected));
    expect(found).toEqual(expected); // row by row, sheet by sheet
    expect(decoded[1]!.slice(2).every((d) => d === null)).toBe(true); // the rest of sheet 2 stays blank
  });

  test('viewing a sheet records nothing; "Record as printed" stamps exactly those bins', async () => {
    const ids = a4Bins.map((b) => b.id);
    const before = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE id = ANY($1::int[]) AND label_printed_at IS NOT NULL', {
      bind: [ids],
      type: QueryTypes.SELECT,
    });
    expect(before[0]!.n).toBe(0);
    const othersBefore = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE label_printed_at IS NOT NULL', { type: QueryTypes.SELECT });
    await page.click('#mark-printed');
    await page.locator('#mark-result.notice-good').waitFor();
    await expect(page.locator('#mark-result').textContent()).resolves.toMatch(/Recorded: 26 labels printed/);
    const after = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE id = ANY($1::int[]) AND label_printed_at IS NOT NULL', {
      bind: [ids],
      type: QueryTypes.SELECT,
    });
    expect(after[0]!.n).toBe(26);
    const othersAfter = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE label_printed_at IS NOT NULL', { type: QueryTypes.SELECT });
    expect(othersAfter[0]!.n - othersBefore[0]!.n).toBe(26);
  });

  test('US Letter, 30 bins by id in a scrambled order from label 5: 2 pages, QRs in the order given, used positions blank', async () => {
    const bins = await sequelize.query<BinRow>(`SELECT id, grai, serial, label_printed_at FROM assets WHERE status <> 'retired' ORDER BY md5(id::text) LIMIT 30`, {
      type: QueryTypes.SELECT,
    });
    expect(bins).toHaveLength(30);
    await page.goto(`/labels/sheet?ids=${bins.map((b) => b.id).join(',')}&stock=letter-3x10&start=5`);
    await expect(page.locator('#label-count').textContent()).resolves.toBe('30');
    await expect(page.locator('#sheet-count').textContent()).resolves.toBe('2');
    const file = await printToPdf('letter-ids');
    const info = pdfInfo(file);
    expect(info.pages).toBe(2);
    expect(info.widthPt).toBeCloseTo(LETTER.widthPt, 0);
    expect(info.heightPt).toBeCloseTo(LETTER.heightPt, 0);
    expectTextInLabels(file, LETTER, bins, 5);

    const decoded = decodeLabels(file, LETTER, 'letter-ids');
    expect(decoded).toHaveLength(2);
    expect(decoded[0]!.slice(0, 4)).toEqual([null, null, null, null]); // part-used: positions 1–4 skipped
    expect(decoded[1]!.slice(4).every((d) => d === null)).toBe(true);
    const found = decoded.flat().filter((d): d is string => d !== null);
    const expected = bins.map((b) => linkOf(b.grai));
    expect(new Set(found)).toEqual(new Set(expected));
    expect(found).toEqual(expected);
  });
});

describe('choosing bins and bad input', () => {
  test('the form: a range shows counts and opens the sheet; screenshots at 1280 and 390 px', async () => {
    for (const kind of ['desktop', 'phone'] as const) {
      const c = await newContext(t.browser, t.app, kind);
      const p = await c.newPage();
      await signIn(p, 'planner@northmere.example', DEMO_PASSWORD);
      await p.waitForURL('**/fleet');
      await p.goto('/labels');
      await screenshot(p, `labels-form-${kind}`);
      await p.check('#by-range');
      await p.fill('#range-from', '100001');
      await p.fill('#range-to', '100048');
      await p.click('#show-selection');
      await p.locator('#selection-summary').waitFor();
      await expect(p.locator('#label-count').textContent()).resolves.toBe('48');
      await expect(p.locator('#sheet-count').textContent()).resolves.toBe('2');
      await screenshot(p, `labels-selection-${kind}`);
      await p.click('#open-sheet');
      await p.waitForURL('**/labels/sheet?**');
      await expect(p.locator('#sheet-count').textContent()).resolves.toBe('2');
      await p.locator('.slot-label').first().waitFor();
      await expect(p.locator('.slot-label').count()).resolves.toBe(48);
      await screenshot(p, `labels-sheet-${kind}`);
      await c.close();
    }
  });

  test('a pasted list reports the GRAI that names no bin and prints the rest', async () => {
    const [one, two] = await sequelize.query<{ grai: string }>('SELECT grai FROM assets ORDER BY id LIMIT 2', { type: QueryTypes.SELECT });
    // Same prefix and asset type as a real bin, a serial no bin has: a valid GRAI that is not registered.
    const unknown = `${one!.grai.slice(0, 14)}ZZ999`;
    await page.goto('/labels');
    await page.check('#by-list');
    await page.fill('#list-grais', [one!.grai, linkOf(two!.grai), unknown].join('\n'));
    await page.click('#show-selection');
    await page.locator('#unknown-entries').waitFor();
    await expect(page.locator('#unknown-entries').textContent()).resolves.toContain(`No bin with GRAI ${unknown} is registered`);
    await expect(page.locator('#label-count').textContent()).resolves.toBe('2');
    await page.click('#open-sheet');
    await page.waitForURL('**/labels/sheet?**');
    await expect(page.locator('.slot-label').evaluateAll((els) => els.map((e) => e.getAttribute('data-grai')))).resolves.toEqual([one!.grai, two!.grai]);
  });

  test('bad query input answers with a clear message, never a 500', async () => {
    const cases: Array<[string, number, RegExp]> = [
      ['/labels/sheet?by=range&from=not%20a%20serial&to=', 400, /neither a bin serial nor a GRAI|last serial/],
      ['/labels/sheet?ids=1-1300', 400, /at most 1,200 labels/],
      ['/labels/sheet?ids=3,x', 400, /not a bin id/],
      ['/labels/sheet?by=filter&stock=a4-3x8&start=99', 400, /labels 1 to 24/],
      ['/labels/sheet?by=filter&site=abc', 400, /site from the list/],
      ['/labels/sheet?by=teleport', 400, /how to pick bins/],
      ['/labels/sheet', 400, /names no bins/],
      ['/labels?by=range&from=09521234100107100001&to=5', 400, /check digit/],
    ];
    for (const [url, status, message] of cases) {
      const res = await page.goto(url);
      expect(res?.status(), url).toBe(status);
      await expect(page.locator('[role=alert]').first().textContent(), url).resolves.toMatch(message);
    }
  });

  test('the printed endpoint checks its input and its callers', async () => {
    const bad = await page.request.post('/api/labels/printed', { data: { ids: [] } });
    expect(bad.status()).toBe(400);
    expect((await bad.json()).error.code).toBe('validation_failed');
    const c = await newContext(t.browser, t.app);
    const p = await c.newPage();
    const yard = DEMO_LOGINS.find((l) => l.role === 'yard')!;
    await signIn(p, yard.email, DEMO_PASSWORD);
    await p.waitForURL('**/yard');
    const refused = await p.request.post('/api/labels/printed', { data: { ids: [1] } });
    expect(refused.status()).toBe(403);
    expect((await p.goto('/labels'))?.status()).toBe(403);
    await c.close();
  });
});
