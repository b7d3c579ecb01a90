// Story 4 end to end: a forklift driver without an account scans the label of
// a bin waiting for collection at a customer's site. The public page says whose
// bin it is and how to return it — never whose site it stands at — and takes
// "empty and ready for collection" (6 bins) and a damage report with a photo,
// as plain form posts. The planner gets the mail and sees both on /requests;
// a flood from one address is refused.
import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { PNG } from 'pngjs';
import { newContext, screenshot, signIn, useApp } from '../support/app';
import { db, one, closeDb as closeDbReads } from '../support/db';
import { waitForMail, freshEmail, createStaff, closeDb as closeMailDb } from '../support/accounts';

const t = useApp();

afterAll(async () => {
  await closeDbReads();
  await closeMailDb();
});

const LONG = 180_000;

interface WaitingBin {
  id: number;
  grai: string;
  serial: string;
  site_id: number;
  site_name: string;
  customer_id: number;
  customer_name: string;
}

/** A photo-like PNG: stripes of the palette's kelp and ochre, so the thumbnail shows something. */
function stripedPng(width = 160, height = 120): Buffer {
  const image = new PNG({ width, height });
  for (let y = 0; y < height; y += 1) {
    for (let x = 0; x < width; x += 1) {
      const i = (y * width + x) * 4;
      const kelp = Math.floor((x + y) / 16) % 2 === 0;
      image.data.set(kelp ? [0x1f, 0x6f, 0x64, 255] : [0xc9, 0x83, 0x1a, 255], i);
    }
  }
  return PNG.sync.write(image);
}

async function fillCollection(page: Page, quantity: string) {
  await page.fill('#cr-quantity', quantity);
  await page.fill('#cr-locationNote', 'Gate 3, beside the weighbridge');
  await page.fill('#cr-contactName', 'Mila de Boer');
  await page.fill('#cr-contactPhone', '+31 6 1234 5678');
}

/** Submits a public form and returns the HTTP status of the page that answered the post. */
async function submitForm(page: Page, form: 'collection' | 'damage'): Promise<number> {
  const answer = page.waitForResponse((r) => r.request().method() === 'POST' && new URL(r.url()).pathname.startsWith('/8003/'));
  await page.click(`form[data-public-form="${form}"] button[type="submit"]`);
  const status = (await answer).status();
  await page.waitForLoadState('load');
  return status;
}

describe('the public bin page (story 4)', () => {
  test(
    'a report of 6 empties and a damage photo reach the planner; nothing about the customer shows; a flood is refused',
    async () => {
      const bin = await one<WaitingBin>(
        `SELECT a.id, a.grai, a.serial, a.site_id, s.name AS site_name, a.customer_id, o.name AS customer_name
         FROM assets a JOIN sites s ON s.id = a.site_id JOIN organisations o ON o.id = a.customer_id
        WHERE a.status = 'awaiting_collection' AND s.kind = 'customer' ORDER BY a.id LIMIT 1`,
      );
      expect(bin, 'the demo pool has a bin awaiting collection at a customer').toBeTruthy();
      const settings = await one<{ operator_name: string; return_instructions: string }>('SELECT operator_name, return_instructions FROM settings WHERE id = 1');
      const plannerEmail = freshEmail('planner');
      await createStaff(plannerEmail, 'Pia Planner', 'planner-password-1', 'planner');
      const since = new Date(Date.now() - 1000);
      // This test counts the hourly budget of one address from zero; other files (the isolation test) may have
      // sent public reports from the same loopback address within the hour.
      await db().query(`DELETE FROM rate_limits WHERE key LIKE 'public_form:report:%' OR key LIKE 'public_bin:%'`);
      // Nothing open yet at the bin's site, which this report would join (merged requests); other files may leave one.
      await db().query(`UPDATE collection_requests SET status = 'cancelled' WHERE site_id = $1 AND status IN ('open', 'scheduled')`, [bin.site_id]);
      const customerWords = [bin.customer_name, bin.site_name, bin.customer_name.split(' ')[0]!];

      // The HTML itself (not just what is visible) names the operator and never the customer or the site.
      const html = await (await fetch(`${t.app.url}/8003/${bin.grai}`)).text();
      expect(html).toContain(settings.operator_name);
      for (const word of customerWords) expect(html).not.toContain(word);

      // Not signed in, on a phone: the page a camera app opens.
      const phone = await newContext(t.browser, t.app, 'phone');
      phone.setDefaultTimeout(20_000);
      const page = await phone.newPage();
      await page.goto(`/8003/${bin.grai}`);
      await expect(page.locator('h1').textContent()).resolves.toBe(`This bin belongs to ${settings.operator_name}`);
      await expect(page.locator('[data-return-instructions]').textContent()).resolves.toBe(settings.return_instructions);
      await screenshot(page, 'public-bin-phone');

      await fillCollection(page, '6');
      expect(await submitForm(page, 'collection')).toBe(303);
      expect(new URL(page.url()).searchParams.get('thanks')).toBe('collection');
      await expect(page.locator('[data-thanks="collection"]').textContent()).resolves.toMatch(/planners have your message/);
      for (const word of customerWords) expect(await page.content()).not.toContain(word);
      await screenshot(page, 'public-bin-thanks-phone');

      const request = await one<{ id: number; quantity: number; site_id: number; customer_id: number; source: string; status: string }>(
        'SELECT id, quantity, site_id, customer_id, source, status FROM collection_requests WHERE asset_id = $1 ORDER BY id DESC LIMIT 1',
        [bin.id],
      );
      expect(request).toMatchObject({ quantity: 6, site_id: bin.site_id, customer_id: bin.customer_id, source: 'public', status: 'open' });

      // The planner's mail arrived in the local mailbox, with the link to the requests page.
      const mail = await waitForMail(plannerEmail, { since, subject: /Collection request: 6 folded bins/ });
      expect(mail.subject).toBe(`Collection request: 6 folded bins at ${bin.site_name}`);
      expect(mail.text).toContain(`${t.app.url}/requests`);
      expect(mail.text).toContain(`serial ${bin.serial}`);

      // A file that is not a photo is refused with the reason, the typed words stay, nothing is stored.
      const damageBefore = await one<{ n: number }>('SELECT count(*)::int AS n FROM damage_reports');
      await page.fill('#dr-description', 'Cracked floor panel beside the valve');
      await page.setInputFiles('#dr-photo', { name: 'photo.png', mimeType: 'image/png', buffer: Buffer.from('these bytes are no picture at all') });
      expect(await submitForm(page, 'damage')).toBe(415);
      await expect(page.locator('[data-form-error="damage"]').textContent()).resolves.toMatch(/not a photo/);
      await expect(page.locator('[data-problem-for="dr-photo"]').textContent()).resolves.toMatch(/not a photo/);
      await expect(page.inputValue('#dr-description')).resolves.toBe('Cracked floor panel beside the valve');
      expect((await one<{ n: number }>('SELECT count(*)::int AS n FROM damage_reports')).n).toBe(damageBefore.n);

      // With a real photo it goes through.
      await page.setInputFiles('#dr-photo', { name: 'damage.png', mimeType: 'image/png', buffer: stripedPng() });
      expect(await submitForm(page, 'damage')).toBe(303);
      await expect(page.locator('[data-thanks="damage"]').isVisible()).resolves.toBe(true);
      const report = await one<{ id: number; photo_id: number; content_type: string; customer_id: number }>(
        `SELECT d.id, d.photo_id, a.content_type, d.customer_id FROM damage_reports d JOIN attachments a ON a.id = d.photo_id
        WHERE d.asset_id = $1 ORDER BY d.id DESC LIMIT 1`,
        [bin.id],
      );
      expect(report).toMatchObject({ content_type: 'image/png', customer_id: bin.customer_id });
      await waitForMail(plannerEmail, { since, subject: new RegExp(`Damage reported on bin ${bin.serial}`) });

      // Three more reports from this phone are fine; the sixth within the hour is refused with 429 and stores nothing.
      for (const n of ['2', '3', '4']) {
        await page.goto(`/8003/${bin.grai}`);
        await fillCollection(page, n);
        expect(await submitForm(page, 'collection')).toBe(303);
      }
      const before = await one<{ n: number }>('SELECT count(*)::int AS n FROM collection_requests WHERE asset_id = $1', [bin.id]);
      await page.goto(`/8003/${bin.grai}`);
      await fillCollection(page, '5');
      expect(await submitForm(page, 'collection')).toBe(429);
      await expect(page.locator('[data-form-error="collection"]').textContent()).resolves.toMatch(/Too many reports from your connection within an hour\. Nothing was sent/);
      await expect(page.inputValue('#cr-quantity')).resolves.toBe('5');
      await screenshot(page, 'public-bin-flood-phone');
      expect((await one<{ n: number }>('SELECT count(*)::int AS n FROM collection_requests WHERE asset_id = $1', [bin.id])).n).toBe(before.n);
      await phone.close();

      // The same page on a desktop screen, not signed in.
      const desk = await newContext(t.browser, t.app, 'desktop');
      const deskPage = await desk.newPage();
      await deskPage.goto(`/8003/${bin.grai}`);
      await screenshot(deskPage, 'public-bin-desktop');
      await desk.close();

      // The planner signs in: both requests are on /requests with bin, site, customer, quantity, reports and photo.
      for (const kind of ['desktop', 'phone'] as const) {
        const ctx = await newContext(t.browser, t.app, kind);
        ctx.setDefaultTimeout(20_000);
        const p = await ctx.newPage();
        await signIn(p, plannerEmail, 'planner-password-1');
        await p.waitForURL('**/fleet');
        await p.goto('/requests');
        const row = p.locator(`li[data-request="collection"][data-id="${request.id}"]`);
        // The three later reports from the phone joined the first (merged): the latest quantity stated stands.
        await expect(row.locator('[data-quantity]').textContent()).resolves.toBe('4');
        await expect(row.locator('[data-reports]').getAttribute('data-reports')).resolves.toBe('4');
        await expect(row.locator('[data-bin-link]').getAttribute('href')).resolves.toBe(`/bins/${bin.grai}`);
        const rowText = await row.textContent();
        expect(rowText).toContain(bin.site_name);
        expect(rowText).toContain(bin.customer_name);
        expect(rowText).toContain('Mila de Boer');
        const damage = p.locator(`li[data-request="damage"][data-id="${report.id}"]`);
        await expect(damage.locator('[data-description]').textContent()).resolves.toBe('Cracked floor panel beside the valve');
        const photo = damage.locator('img[data-photo]');
        await expect(photo.getAttribute('src')).resolves.toBe(`/api/attachments/${report.photo_id}`);
        await photo.scrollIntoViewIfNeeded();
        await expect.poll(() => photo.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth), { timeout: 10_000 }).toBe(160);
        await screenshot(p, `requests-${kind}`);

        if (kind === 'desktop') {
          // The planner schedules the collection; the step is saved with its version and audited.
          const control = row.locator(`[data-status-control="collection-${request.id}"]`);
          await p.waitForSelector(`astro-island:not([ssr]) [data-status-control="collection-${request.id}"]`);
          // Each merged report moved the version on: the step saves on top of the version the page showed.
          const shown = await one<{ version: number }>('SELECT version FROM collection_requests WHERE id = $1', [request.id]);
          await control.locator('button[data-step="scheduled"]').click();
          await control.locator('[data-request-status="scheduled"]').waitFor();
          const saved = await one<{ status: string; version: number }>('SELECT status, version FROM collection_requests WHERE id = $1', [request.id]);
          expect(saved).toEqual({ status: 'scheduled', version: shown.version + 1 });
          const audit = await one<{ action: string; after: { status: string; plannedFor?: string } }>(
            `SELECT action, after FROM audit_entries WHERE entity_type = 'collection_request' AND entity_id = $1`,
            [String(request.id)],
          );
          // scheduling names the run day (the portal shows it to the customer)
          expect(audit).toEqual({ action: 'collection_request.status', after: { status: 'scheduled', plannedFor: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/) } });
          // cancelling asks first
          await control.locator('button[data-step="cancelled"]').click();
          await p.locator('dialog[open]').waitFor();
          await p.click('dialog[open] button:has-text("Keep it")');
          await expect(control.locator('[data-request-status]').getAttribute('data-request-status')).resolves.toBe('scheduled');
        }
        await ctx.close();
      }
    },
    LONG,
  );
});
