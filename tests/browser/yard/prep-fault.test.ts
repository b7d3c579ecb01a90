// Story 1, the third bin: the prep check finds a cracked floor panel; the yard
// hand marks the fault, adds a photo, and the bin goes to quarantine in the
// same step. The prep check shows the pinch-point caution.
import { describe, test, expect, afterAll } from 'vitest';
import QRCode from 'qrcode';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('a prep check that finds a fault', () => {
  test('fault + photo → quarantine, with the photo in the history', async () => {
    const bin = await one<{ grai: string; id: number }>(
      `SELECT a.grai, a.id FROM assets a JOIN users u ON u.home_site_id = a.site_id
        WHERE u.email = 'yard@northmere.example' AND a.status = 'available' ORDER BY a.id LIMIT 1 OFFSET 3`,
    );
    const ctx = await newContext(t.browser, t.app, 'phone');
    const page = await ctx.newPage();
    await signIn(page, 'yard@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/yard');
    await page.goto(`/bins/${bin.grai}`);
    await page.click('button[data-action="prep_check"]');
    const form = page.locator('form[data-form="prep_check"]');
    await expect(form.textContent()).resolves.toMatch(/Pinch points/);
    await form.locator('button[data-fault="floorAndWalls"]').click();
    await form.locator('#faults').fill('Cracked floor panel near the valve');
    const photo = await QRCode.toBuffer('stand-in photo of a cracked panel', { type: 'png', width: 300 });
    await form.locator('#fault-photos').setInputFiles({ name: 'panel.png', mimeType: 'image/png', buffer: photo });
    await screenshot(page, 'prep-check-fault-phone');
    const reloaded = page.waitForEvent('load'); // the page reloads itself after the confirmation
    await form.locator('button[type="submit"]').click();
    await page.waitForSelector('p[role="status"]:has-text("quarantine")');
    await reloaded;
    await expect(page.locator('header [data-status]').getAttribute('data-status')).resolves.toBe('quarantine');
    await page.waitForSelector('img[alt="Photo taken with this scan"]');
    const event = await one<{ payload: { photoIds?: number[]; faults?: string } }>(
      `SELECT payload FROM scan_events WHERE asset_id = $1 AND action = 'prep_check' ORDER BY id DESC LIMIT 1`,
      [bin.id],
    );
    expect(event.payload.photoIds).toHaveLength(1);
    expect(event.payload.faults).toMatch(/Cracked floor panel/);
    const att = await one<{ content_type: string }>('SELECT content_type FROM attachments WHERE id = $1', [event.payload.photoIds![0]]);
    expect(att.content_type).toBe('image/png');
    await ctx.close();
  });
});
