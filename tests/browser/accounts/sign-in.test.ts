import { describe, test, expect } from 'vitest';
import { useApp, newContext, signIn, screenshot } from '../support/app';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const t = useApp();

const HOMES: Record<string, { path: string; heading: RegExp }> = {
  admin: { path: '/fleet', heading: /Pool overview/ },
  planner: { path: '/fleet', heading: /Pool overview/ },
  yard: { path: '/yard', heading: /Scan a bin/ },
  customer: { path: '/portal', heading: /Bins on hire/ },
};

describe('signing in', () => {
  test('the sign-in page renders at desktop and phone width', async () => {
    for (const kind of ['desktop', 'phone'] as const) {
      const ctx = await newContext(t.browser, t.app, kind);
      const page = await ctx.newPage();
      await page.goto('/login');
      await expect(page.getByRole('heading', { name: 'Sign in' }).isVisible()).resolves.toBe(true);
      await screenshot(page, `login-${kind}`);
      await ctx.close();
    }
  });

  for (const login of DEMO_LOGINS) {
    test(`${login.role} signs in and lands on their home`, async () => {
      for (const kind of ['desktop', 'phone'] as const) {
        const ctx = await newContext(t.browser, t.app, kind);
        const page = await ctx.newPage();
        await signIn(page, login.email, DEMO_PASSWORD);
        await page.waitForURL((u) => u.pathname === HOMES[login.role]!.path);
        await expect(page.locator('h1').first().textContent()).resolves.toMatch(HOMES[login.role]!.heading);
        await screenshot(page, `home-${login.role}-${kind}`);
        await ctx.close();
      }
    });
  }

  test('a wrong password shows the error and does not sign in', async () => {
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    await signIn(page, 'planner@northmere.example', 'not-the-password');
    const alert = page.locator('#login-error');
    await alert.waitFor({ state: 'visible' });
    await expect(alert.textContent()).resolves.toMatch(/do not match an active account/);
    await page.goto('/fleet');
    expect(new URL(page.url()).pathname).toBe('/login');
    await ctx.close();
  });

  test('a customer opening a planner page is refused', async () => {
    const ctx = await newContext(t.browser, t.app);
    const page = await ctx.newPage();
    const customer = DEMO_LOGINS.find((l) => l.role === 'customer')!;
    await signIn(page, customer.email, DEMO_PASSWORD);
    await page.waitForURL('**/portal');
    const res = await page.goto('/fleet');
    expect(res?.status()).toBe(403);
    await expect(page.locator('h1').textContent()).resolves.toMatch(/not open to your role/);
    const api = await page.request.get('/api/health');
    expect(api.status()).toBe(200);
    await ctx.close();
  });
});
