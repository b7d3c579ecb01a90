// A planner keeps the liner specs and suppliers: the seeded ones are listed, a new spec with a wrongly
// written gland size is refused with the field named, the corrected one is saved with the bin type it fits.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { one, closeDb } from '../support/db';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();
afterAll(closeDb);

describe('liner specs and suppliers', () => {
  test('a planner adds a spec and sees the suppliers’ terms', { timeout: 120_000 }, async () => {
    const desk = await newContext(t.browser, t.app, 'desktop');
    const page = await desk.newPage();
    await signIn(page, 'planner@northmere.example', DEMO_PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/admin/liner-specs');
    await page.waitForFunction(() => !document.querySelector('astro-island[ssr]'));
    await expect(page.locator('main').textContent()).resolves.toMatch(/PV-1250-DN50[\s\S]*1,250 L PE\/PA, 2 layers, DN50 butterfly valve, gland DN150, food contact to 60 °C/);
    await page.click('button:has-text("New liner spec")');
    await page.fill('#lr-code', 'te-1000-dn80');
    await page.fill('#lr-name', 'Test bag 1,000 L DN80');
    await page.fill('#lr-material', 'PE');
    await page.fill('#lr-layers', '1');
    await page.fill('#lr-nominalCapacityL', '1000');
    await page.selectOption('#lr-valveType', 'ball');
    await page.fill('#lr-valveSize', 'dn80');
    await page.fill('#lr-glandSize', '150 mm');
    await page.check('label:has-text("Foldaway 1000") input');
    await page.click('dialog button[type="submit"]');
    await expect(page.locator('#lr-glandSize-problem').textContent()).resolves.toMatch(/flange size \(DN50, DN80\) or a thread \(S60x6\)/);
    await page.fill('#lr-glandSize', 'DN150');
    await screenshot(page, 'liner-spec-form-desktop');
    await page.click('dialog button[type="submit"]');
    await page.waitForSelector('p[role="status"]:has-text("Added liner spec TE-1000-DN80")');
    const stored = await one<{ valve_size: string; types: number }>(
      `SELECT s.valve_size, (SELECT count(*)::int FROM bin_type_liner_specs b WHERE b.liner_spec_id = s.id) AS types FROM liner_specs s WHERE s.code = 'TE-1000-DN80'`,
    );
    expect(stored).toEqual({ valve_size: 'DN80', types: 1 });
    await screenshot(page, 'liner-specs-desktop');
    await page.setViewportSize({ width: 1920, height: 1000 });
    await screenshot(page, 'liner-specs-1920');
    await page.setViewportSize({ width: 390, height: 844 });
    await screenshot(page, 'liner-specs-390');
    await page.setViewportSize({ width: 1280, height: 860 });

    await page.goto('/admin/liner-suppliers');
    await expect(page.locator('main').textContent()).resolves.toMatch(/Polyvale Liners[\s\S]*10 days[\s\S]*85\.00/);
    await screenshot(page, 'liner-suppliers-desktop');
    await desk.close();
  });
});
