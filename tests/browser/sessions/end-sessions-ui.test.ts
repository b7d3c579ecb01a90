// The two buttons that end all of a person's sessions, clicked in Chromium.
import { describe, test, expect, afterAll } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { createStaff, freshEmail, closeDb } from '../support/accounts';
import { hydrated } from '../support/yard';

const t = useApp();
const PASSWORD = 'end-sessions-ui-password';
afterAll(async () => {
  await closeDb();
});

describe('sign out everywhere', () => {
  test('from the account page: this browser and the other one are both signed out', async () => {
    const email = freshEmail('end-ui');
    await createStaff(email, 'End Everywhere', PASSWORD);
    const other = await newContext(t.browser, t.app);
    const otherPage = await other.newPage();
    await signIn(otherPage, email, PASSWORD);
    await otherPage.waitForURL('**/fleet');

    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, email, PASSWORD);
    await page.waitForURL('**/fleet');
    await page.getByRole('link', { name: 'End Everywhere' }).first().click();
    await page.waitForURL('**/account');
    await screenshot(page, 'account-page');
    await page.click('#end-all-sessions');
    await page.waitForURL('**/login?signed_out=1');
    await page.goto('/fleet');
    expect(new URL(page.url()).pathname).toBe('/login');
    await otherPage.goto('/fleet');
    expect(new URL(otherPage.url()).pathname).toBe('/login');
    await ctx.close();
    await other.close();
  });

  test('from the people page: an admin signs someone out everywhere', async () => {
    const adminEmail = freshEmail('end-ui-admin');
    await createStaff(adminEmail, 'End Admin', PASSWORD, 'admin');
    const email = freshEmail('end-ui-person');
    await createStaff(email, 'End Person', PASSWORD);
    const theirs = await newContext(t.browser, t.app);
    const theirPage = await theirs.newPage();
    await signIn(theirPage, email, PASSWORD);
    await theirPage.waitForURL('**/fleet');

    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, adminEmail, PASSWORD);
    await page.waitForURL('**/fleet');
    await page.goto('/admin/users');
    // Typed or clicked before the island hydrates, the search and the row's button do nothing (seen under load).
    await hydrated(page);
    await page.fill('#people-search', email);
    await page.locator(`tr[data-person="${email}"] button`).first().click();
    await page.click('#end-sessions');
    await expect(page.locator('#people-flash').textContent()).resolves.toMatch(/signed out on every device/);
    await theirPage.goto('/fleet');
    expect(new URL(theirPage.url()).pathname).toBe('/login');
    await page.goto('/fleet');
    expect(new URL(page.url()).pathname).toBe('/fleet');
    await ctx.close();
    await theirs.close();
  });
});
