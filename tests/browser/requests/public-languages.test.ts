// The finder's language on the public bin page: a driver whose phone is set to Polish reads the page in Polish,
// with the operator's own Polish return instructions (set by an admin on the settings page) and the GRAI in text to
// read out on the phone; the switch changes the language without changing the /8003/<GRAI> path; a refused form
// answers in the chosen language; a language we do not have gets English; answers carry Vary: Accept-Language.
import { afterAll, describe, expect, test } from 'vitest';
import { expectNoPageOverflow, newContext, screenshot, signIn, useApp, PHONE } from '../support/app';
import { closeDb, db, one } from '../support/db';
import { createStaff, freshEmail, closeDb as closeMailDb } from '../support/accounts';
import { PUBLIC_LANGUAGES, PUBLIC_WORDS } from '@/lib/requests/public-words';

const t = useApp();
const LONG = 120_000;

afterAll(async () => {
  await db().query(`UPDATE settings SET return_instructions_by_language = '{}'::jsonb WHERE id = 1`);
  await closeDb();
  await closeMailDb();
});

describe("the public bin page in the finder's language", () => {
  test(
    'Polish from the phone, the operator’s Polish wording, the switch to German, German notes on a refused form',
    async () => {
      const bin = await one<{ grai: string; serial: string }>(`SELECT grai, serial FROM assets WHERE status = 'awaiting_collection' ORDER BY id LIMIT 1`);
      const email = freshEmail('admin-languages');
      // Other files of the lane may have used up this address's hourly allowance of reports: the refusal this test
      // reads is the form's own, not the rate limit's.
      await db().query(`DELETE FROM rate_limits WHERE key LIKE 'public_form:report:%' OR key LIKE 'public_bin:%'`);
      await createStaff(email, 'Ada Admin', 'admin-password-1', 'admin');

      // The admin writes the Polish return instructions.
      const desk = await t.browser.newContext({ baseURL: t.app.url, viewport: { width: 1280, height: 900 } });
      const admin = await desk.newPage();
      await signIn(admin, email, 'admin-password-1');
      await admin.waitForURL((u) => !u.pathname.startsWith('/login'));
      await admin.goto('/admin/settings');
      await admin.locator('#settings-form').waitFor();
      await admin.click('[data-wording-by-language] summary');
      const polish = 'Złóż pojemnik i zadzwoń pod 0100 przed południem.';
      await admin.fill('#s-returnInstructions-pl', polish);
      await admin.click('#settings-form button[type="submit"]');
      await expect(admin.locator('#settings-notice').textContent()).resolves.toMatch(/Settings saved/);
      await desk.close();

      const phone = await t.browser.newContext({ ...PHONE, baseURL: t.app.url, locale: 'pl-PL' });
      const page = await phone.newPage();
      const answer = await page.goto(`/8003/${bin.grai}`);
      expect(answer!.headers()['vary']).toMatch(/Accept-Language/i);
      expect(answer!.headers()['content-language']).toBe('pl');
      expect(await page.getAttribute('html', 'lang')).toBe('pl');
      await expect(page.locator('#collect-title').textContent()).resolves.toBe(PUBLIC_WORDS.pl.collectTitle);
      await expect(page.locator('[data-return-instructions]').textContent()).resolves.toBe(polish);
      // The GRAI in text, grouped for reading aloud.
      const spoken = (await page.locator('[data-grai-text]').textContent())!.replace(/[\s·]/g, '');
      expect(spoken).toBe(bin.grai);
      await expectNoPageOverflow(page, 'public bin page (pl) at 390 px');
      await screenshot(page, 'public-bin-pl-390');

      // The switch: German, same path, the choice carried through the form post.
      await page.click('[data-language-switch] a[hreflang="de"]');
      expect(new URL(page.url()).pathname).toBe(`/8003/${bin.grai}`);
      expect(new URL(page.url()).searchParams.get('lang')).toBe('de');
      expect(await page.getAttribute('html', 'lang')).toBe('de');
      // No Polish wording in German: the main instructions (or our general sentence) show instead.
      await expect(page.locator('[data-return-instructions]').textContent()).resolves.not.toBe(polish);
      await page.fill('#cr-quantity', '0');
      await page.fill('#cr-contactName', 'Kai Fahrer');
      await page.fill('#cr-contactPhone', '12');
      await page.evaluate(() =>
        document.querySelectorAll('form[data-public-form] [required], form[data-public-form] [min]').forEach((el) => {
          el.removeAttribute('required');
          el.removeAttribute('min');
        }),
      );
      await page.click('form[data-public-form="collection"] button[type="submit"]');
      await page.waitForLoadState('load');
      expect(new URL(page.url()).searchParams.get('lang')).toBe('de');
      await expect(page.locator('[data-form-error="collection"]').textContent()).resolves.toBe(PUBLIC_WORDS.de.needsAnotherLook);
      await expect(page.locator('[data-problem-for="cr-quantity"]').textContent()).resolves.toBe(PUBLIC_WORDS.de.quantityMin);
      await expect(page.locator('[data-problem-for="cr-contactPhone"]').textContent()).resolves.toBe(PUBLIC_WORDS.de.phoneTooShort);
      await screenshot(page, 'public-bin-de-refused-390');
      const stored = await one<{ n: string }>(`SELECT count(*) AS n FROM collection_requests WHERE contact_name = 'Kai Fahrer'`);
      expect(Number(stored.n), 'a refused form stores nothing').toBe(0);
      await phone.close();
    },
    LONG,
  );

  test('every language renders its own words and links to the others on the same path; an unknown one gets English', async () => {
    // A bin out with a customer, so the page offers the collection form (a bin in a depot offers only the damage form).
    const bin = await one<{ grai: string }>(`SELECT grai FROM assets WHERE status = 'on_hire' ORDER BY id LIMIT 1`);
    for (const language of PUBLIC_LANGUAGES) {
      const res = await fetch(`${t.app.url}/8003/${bin.grai}`, { headers: { 'accept-language': `${language};q=0.9` } });
      expect(res.status).toBe(200);
      expect(res.headers.get('vary')).toMatch(/Accept-Language/i);
      const html = await res.text();
      expect(html).toContain(`<html lang="${language}"`);
      expect(html, `${language}: its own damage heading`).toContain(PUBLIC_WORDS[language].damageTitle);
      for (const other of PUBLIC_LANGUAGES) expect(html).toContain(`href="/8003/${bin.grai}?lang=${other}"`);
    }
    const unknown = await fetch(`${t.app.url}/8003/${bin.grai}`, { headers: { 'accept-language': 'ja-JP,ja;q=0.9' } });
    const html = await unknown.text();
    expect(html).toContain('<html lang="en"');
    expect(html).toContain(PUBLIC_WORDS.en.collectTitle);
    // A bin in our own depot: the page says there is nothing to collect, in the finder's language, and no form for it.
    const home = await one<{ grai: string }>(`SELECT grai FROM assets WHERE status = 'available' ORDER BY id LIMIT 1`);
    const depot = await (await fetch(`${t.app.url}/8003/${home.grai}`, { headers: { 'accept-language': 'nl' } })).text();
    expect(depot).toContain(PUBLIC_WORDS.nl.atOurSite);
    expect(depot).not.toContain(PUBLIC_WORDS.nl.collectTitle);
    expect(depot).toContain(PUBLIC_WORDS.nl.damageTitle);
  });

  test('at 1280 and 1920 px the Dutch page fits its screen', async () => {
    const bin = await one<{ grai: string }>(`SELECT grai FROM assets ORDER BY id LIMIT 1`);
    for (const width of [1280, 1920]) {
      const ctx = await newContext(t.browser, t.app, 'desktop');
      const page = await ctx.newPage();
      await page.setViewportSize({ width, height: 900 });
      await page.goto(`/8003/${bin.grai}?lang=nl`);
      await expectNoPageOverflow(page, `public bin page (nl) at ${width} px`);
      await screenshot(page, `public-bin-nl-${width}`);
      await ctx.close();
    }
  });
});
