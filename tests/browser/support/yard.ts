// Helpers for the yard phone tests: the e2e database (to pick bins and to
// check what was recorded), QR label images made with the `qrcode` package,
// and a camera feed for Chromium's fake capture device.
import pg from 'pg';
import QRCode from 'qrcode';
import { writeFileSync, readFileSync, existsSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { ROOT } from './app';

/** Waits until every island on the page has hydrated (Astro drops the `ssr` attribute then). */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
}

export async function query<T extends Record<string, unknown>>(sql: string, params: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  try {
    return (await client.query<T>(sql, params)).rows;
  } finally {
    await client.end();
  }
}

export interface PickedBin {
  id: number;
  grai: string;
  serial: string;
  version: number;
}

/**
 * Folded, unchecked bins at the yard user's home depot, inside their test interval: a prep check and a
 * quarantine are both allowed on them. Oldest ids first, skipping `exclude`.
 */
export async function availableBinsAtHome(email: string, n: number, exclude: number[] = []): Promise<PickedBin[]> {
  return query<PickedBin & Record<string, unknown>>(
    `SELECT a.id, a.grai, a.serial, a.version FROM assets a JOIN users u ON u.home_site_id = a.site_id
      WHERE u.email = $1 AND a.status = 'available' AND NOT a.prep_checked AND (a.next_due IS NULL OR a.next_due > current_date + 7)
        AND NOT (a.id = ANY($3::int[]))
      ORDER BY a.id LIMIT $2`,
    [email, n, exclude],
  );
}

/** The QR a label carries: a GS1 Digital Link URI (…/8003/<GRAI>), as a PNG. */
/**
 * Picks a photo in a QR reader once it is live: the input is disabled until React has hydrated it, so a photo picked
 * earlier is not silently lost (on a slow phone as under a loaded test machine).
 */
export async function pickPhoto(page: Page, input: string, file: { name: string; mimeType: string; buffer: Buffer }): Promise<void> {
  await page.locator(`${input}[data-ready]:not([disabled])`).waitFor({ state: 'attached' });
  await page.setInputFiles(input, file);
}

export function labelPng(text: string): Promise<Buffer> {
  return QRCode.toBuffer(text, { type: 'png', errorCorrectionLevel: 'M', margin: 4, width: 480 });
}

/**
 * A Y4M clip for Chromium's --use-file-for-fake-video-capture: `blankFrames` of plain white (time for a
 * screenshot of the live view), then the QR code, black on white. Chromium loops the clip.
 */
export function qrClip(text: string, path: string, { width = 640, height = 480, blankFrames = 20, codeFrames = 10 } = {}): string {
  const qr = QRCode.create(text, { errorCorrectionLevel: 'M' });
  const size = qr.modules.size;
  // The code takes under half the frame, as a label held at arm's length does: inside the scan box, with its quiet zone.
  const scale = Math.max(3, Math.floor((Math.min(width, height) * 0.45) / size));
  const x0 = Math.floor((width - size * scale) / 2);
  const y0 = Math.floor((height - size * scale) / 2);
  const luma = Buffer.alloc(width * height, 235); // video white
  for (let r = 0; r < size; r++) {
    for (let c = 0; c < size; c++) {
      if (!qr.modules.get(r, c)) continue;
      for (let dy = 0; dy < scale; dy++) luma.fill(16, (y0 + r * scale + dy) * width + x0 + c * scale, (y0 + r * scale + dy) * width + x0 + (c + 1) * scale);
    }
  }
  const chroma = Buffer.alloc((width / 2) * (height / 2) * 2, 128);
  const white = Buffer.concat([Buffer.alloc(width * height, 235), chroma]);
  const code = Buffer.concat([luma, chroma]);
  const frame = Buffer.from('FRAME\n');
  const parts = [Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`)];
  for (let i = 0; i < blankFrames; i++) parts.push(frame, white);
  for (let i = 0; i < codeFrames; i++) parts.push(frame, code);
  writeFileSync(path, Buffer.concat(parts));
  return path;
}

/** Gzip size (zlib default level) of a built client file, by its URL path (/_astro/…). */
export function gzipSizeOf(urlPath: string): number {
  const file = join(ROOT, 'dist', 'client', urlPath.replace(/^\//, ''));
  if (!existsSync(file)) throw new Error(`${urlPath} is not in the client build`);
  return gzipSync(readFileSync(file)).length;
}

/**
 * Records an action on the bin page the way a person does (open its form, fill it, send it) and waits for the
 * page's own reload after the confirmation, so the next step sees the new state. No fixed sleep: the reload comes
 * 600 ms after the confirmation shows, and the wait starts before the form is sent.
 */
export async function recordAction(page: Page, action: string, fill?: (p: Page) => Promise<void>): Promise<void> {
  await page.click(`button[data-action="${action}"]`);
  await page.waitForSelector(`form[data-form="${action}"]`);
  if (fill) await fill(page);
  const reloaded = page.waitForEvent('load');
  await page.click(`form[data-form="${action}"] button[type="submit"]`);
  await page.waitForSelector('p[role="status"]:has-text("Recorded")');
  await reloaded;
}
