import { describe, test, expect, afterAll } from 'vitest';
import type { Page } from 'playwright-core';
import { newContext, screenshot, signIn, useApp, expectNoPageOverflow } from '../support/app';
import { waitForMail, linkIn, freshEmail, createStaff, closeDb } from '../support/accounts';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';
import { hydrated } from '../support/yard';

const t = useApp();

const admin = DEMO_LOGINS.find((l) => l.role === 'admin')!;

afterAll(async () => {
  await closeDb();
});

// Several pages, mail and bcrypt per test: slow on a busy 2-core machine. Each
// step still fails on its own (with the locator named) well before the test does.
const LONG = 120_000;
async function context(kind: 'desktop' | 'phone' = 'desktop') {
  const ctx = await newContext(t.browser, t.app, kind);
  ctx.setDefaultTimeout(20_000);
  return ctx;
}

async function adminPage(kind: 'desktop' | 'phone' = 'desktop'): Promise<Page> {
  const ctx = await context(kind);
  const page = await ctx.newPage();
  await signIn(page, admin.email, DEMO_PASSWORD);
  await page.waitForURL('**/fleet');
  return page;
}

async function choosePassword(page: Page, password: string) {
  await page.fill('#password', password);
  await page.fill('#confirm', password);
  await page.click('#set-password-submit');
  await page.waitForURL((u) => u.pathname === '/login' && u.searchParams.has('password_set'));
}

describe('invitations', () => {
  test(
    'an admin invites someone; the mail arrives in the local mailbox; its link sets a password; they sign in',
    async () => {
      const email = freshEmail('invited');
      const since = new Date(Date.now() - 1000);
      const page = await adminPage();
      await page.goto('/admin/users');
      await hydrated(page); // the people list is an island: act once it handles clicks
      await page.click('#invite-open');
      await page.fill('#invite-name', 'Maren Invitee');
      await page.fill('#invite-email', email);
      await page.selectOption('#invite-role', 'planner');
      await page.click('#invite-submit');
      await expect.poll(() => page.locator('#people-flash').textContent(), { timeout: 20_000 }).toMatch(new RegExp(`Invitation sent to ${email}`));
      const row = page.locator(`#people-table tr[data-person="${email}"]`);
      await expect(row.locator('[data-status]').getAttribute('data-status')).resolves.toBe('invited');

      const mail = await waitForMail(email, { since, subject: /Your Loopfold account/ });
      const link = linkIn(mail.text, '/account/invite');
      expect(link.startsWith(`${t.app.url}/account/invite?token=`)).toBe(true);

      // the invitee opens the link on a phone
      const phone = await (await context('phone')).newPage();
      await phone.goto(link);
      await expect.poll(() => phone.locator('h1').textContent(), { timeout: 20_000 }).toBe('Choose your password');
      await screenshot(phone, 'account-invite-phone');
      // a mismatch is caught by the server and shown beside the field
      await phone.fill('#password', 'unfold-check-line');
      await phone.fill('#confirm', 'unfold-check-lime');
      await phone.click('#set-password-submit');
      await expect.poll(() => phone.locator('#confirm-problem').textContent(), { timeout: 20_000 }).toMatch(/not the same/);
      await choosePassword(phone, 'unfold-check-line');
      await expect.poll(() => phone.locator('[role=status]').first().textContent(), { timeout: 20_000 }).toMatch(/password is set/);
      await signIn(phone, email, 'unfold-check-line');
      await phone.waitForURL('**/fleet');

      // a used link says so
      await phone.goto(link);
      await expect.poll(() => phone.locator('#link-problem').textContent(), { timeout: 20_000 }).toMatch(/already been used/);

      // the admin sees the person active and the mail in the outbox
      await page.goto('/admin/users');
      await hydrated(page); // the people list is an island: act once it handles clicks
      await expect(page.locator(`#people-table tr[data-person="${email}"] [data-status]`).getAttribute('data-status')).resolves.toBe('active');
      await page.goto('/admin/mail');
      const sent = page.locator(`#outbox li[data-mail-to="${email}"]`).first();
      await expect.poll(() => sent.textContent(), { timeout: 20_000 }).toMatch(/Invitation.*Sent/s);
      await sent.locator('summary').click();
      // the outbox keeps the text but not the one-time token
      const kept = (await sent.locator('pre').textContent()) ?? '';
      expect(kept).toContain('/account/invite?token=•••');
      expect(kept).not.toContain(link);
      await page.context().close();
      await phone.context().close();
    },
    LONG,
  );

  test(
    'the local mailbox tab shows the received message with a working link',
    async () => {
      const email = freshEmail('mailbox');
      const page = await adminPage();
      const res = await page.request.post('/api/admin/users', {
        data: { name: 'Ola Mailbox', email, role: 'planner', organisationId: await operatorId(page) },
      });
      expect(res.status()).toBe(201);
      await waitForMail(email);
      await page.goto('/admin/mail?tab=local');
      const item = page.locator(`#local-mailbox li[data-mail-to="${email}"]`).first();
      await item.locator('summary').click();
      await item.locator('a[href*="/account/invite?token="]').click();
      await page.waitForURL('**/account/invite?token=*');
      await expect.poll(() => page.locator('h1').textContent(), { timeout: 20_000 }).toBe('Choose your password');
      await page.context().close();
    },
    LONG,
  );
});

async function operatorId(page: Page): Promise<number> {
  // the operator organisation of the seeded scenario, read through the API an admin uses
  const res = await page.request.get('/api/admin/users');
  const { data } = (await res.json()) as { data: { people: Array<{ organisationId: number; organisationKind: string }> } };
  return data.people.find((p) => p.organisationKind === 'operator')!.organisationId;
}

describe('deactivation', () => {
  test(
    "a deactivated user's open session stops working at the next request",
    async () => {
      const email = freshEmail('leaver');
      await createStaff(email, 'Lena Leaver', 'leaving-soon-1');
      const userCtx = await context();
      const userPage = await userCtx.newPage();
      await signIn(userPage, email, 'leaving-soon-1');
      await userPage.waitForURL('**/fleet');

      const page = await adminPage();
      await page.goto('/admin/users');
      await hydrated(page); // the people list is an island: act once it handles clicks
      await page.fill('#people-search', email);
      await page.getByRole('button', { name: 'Change Lena Leaver' }).click();
      await page.click('#deactivate');
      await expect.poll(() => page.locator('#deactivate-question').textContent(), { timeout: 20_000 }).toBe('Deactivate Lena Leaver?');
      await page.click('#deactivate-confirm');
      await expect.poll(() => page.locator('#people-flash').textContent(), { timeout: 20_000 }).toMatch(/deactivated and signed out/);

      await userPage.goto('/fleet');
      expect(new URL(userPage.url()).pathname).toBe('/login');
      // and the API refuses the old cookie too
      const api = await userPage.request.get('/api/admin/users');
      expect(api.status()).toBe(401);
      await userCtx.close();
      await page.context().close();
    },
    LONG,
  );

  test(
    'an admin cannot deactivate themselves (the page offers no button; the API refuses)',
    async () => {
      const email = freshEmail('selfadmin');
      const id = await createStaff(email, 'Sol Selfadmin', 'self-admin-pass', 'admin');
      const ctx = await context();
      const page = await ctx.newPage();
      await signIn(page, email, 'self-admin-pass');
      await page.waitForURL('**/fleet');
      await page.goto('/admin/users');
      await hydrated(page); // the people list is an island: act once it handles clicks
      await page.fill('#people-search', email);
      await page.getByRole('button', { name: 'Change Sol Selfadmin' }).click();
      await page.getByText('You cannot deactivate your own account.').waitFor();
      await expect(page.locator('#deactivate').count()).resolves.toBe(0);
      const res = await page.request.patch(`/api/admin/users/${id}`, { data: { version: 0, active: false } });
      expect(res.status()).toBe(422);
      await ctx.close();
    },
    LONG,
  );
});

describe('forgotten password', () => {
  test(
    'the answer is the same for any address; a real account gets a link that sets a new password',
    async () => {
      const email = freshEmail('forgot');
      await createStaff(email, 'Fenna Forgetful', 'old-password-1');
      const ctx = await context('phone');
      const page = await ctx.newPage();
      const answers: string[] = [];
      for (const address of [email, freshEmail('nobody')]) {
        await page.goto('/login');
        await page.click('text=Forgotten your password?');
        await page.fill('#email', address);
        await page.click('#reset-submit');
        await page.locator('#reset-answer').filter({ hasText: /\S/ }).waitFor();
        answers.push((await page.locator('#reset-answer').textContent()) ?? '');
      }
      expect(answers[0]).toMatch(/If an account exists/);
      expect(answers[1]).toBe(answers[0]);
      await screenshot(page, 'account-reset-phone');

      const mail = await waitForMail(email, { subject: /Reset your Loopfold password/ });
      await page.goto(linkIn(mail.text, '/account/reset'));
      await expect.poll(() => page.locator('h1').textContent(), { timeout: 20_000 }).toBe('Choose a new password');
      await choosePassword(page, 'new-password-22');
      await signIn(page, email, 'new-password-22');
      await page.waitForURL('**/fleet');
      await ctx.close();
    },
    LONG,
  );
});

describe('admin pages at desktop and phone width', () => {
  test(
    'people, sent mail and settings',
    async () => {
      for (const kind of ['desktop', 'phone'] as const) {
        const page = await adminPage(kind);
        await page.goto('/admin/users');
        await hydrated(page); // the people list is an island: act once it handles clicks
        await page.locator('[data-person]:visible').first().waitFor();
        await expect(page.locator('[data-person]:visible').count()).resolves.toBeGreaterThanOrEqual(4); // the demo's four logins at least
        await screenshot(page, `admin-users-${kind}`);
        await page.getByRole('button', { name: `Change ${admin.name}` }).click();
        await page.getByText('You cannot change your own role; ask another administrator.').waitFor();
        await screenshot(page, `admin-users-edit-${kind}`);
        await page.keyboard.press('Escape');
        await page.click('#invite-open');
        await page.selectOption('#invite-role', 'yard');
        await screenshot(page, `admin-users-invite-${kind}`);
        await page.keyboard.press('Escape');

        await page.goto('/admin/mail');
        const sent = page.locator('#outbox li').first();
        await sent.locator('summary').click();
        await expect(sent.locator('details').getAttribute('open')).resolves.toBe(''); // opened: the message itself shows
        await expect(sent.locator('details > div').isVisible()).resolves.toBe(true);
        await screenshot(page, `admin-mail-${kind}`);
        await page.goto('/admin/mail?tab=local');
        await expect(page.locator('#local-mailbox').isVisible()).resolves.toBe(true);
        await screenshot(page, `admin-mail-local-${kind}`);

        await page.goto('/admin/settings');
        await page.locator('#settings-form').waitFor();
        await expect(page.locator('#settings-form input, #settings-form select').count()).resolves.toBeGreaterThan(3);
        await expectNoPageOverflow(page, `settings at ${kind} width`);
        await screenshot(page, `admin-settings-${kind}`);
        await page.context().close();
      }
    },
    LONG,
  );

  test(
    'settings: a save goes through; a stale form gets the "changed meanwhile" message',
    async () => {
      const a = await adminPage();
      const b = await adminPage();
      await a.goto('/admin/settings');
      await b.goto('/admin/settings');
      await a.click('#settings-save');
      await expect.poll(() => a.locator('#settings-notice').textContent(), { timeout: 20_000 }).toBe('Settings saved.');
      // b's form is now stale only if a changed something: change the return text in a, then save b
      const original = await a.inputValue('#s-returnInstructions');
      await a.fill('#s-returnInstructions', `${original} (${Date.now()})`);
      await a.click('#settings-save');
      await a.locator('#settings-notice').filter({ hasText: 'Settings saved.' }).waitFor();
      await b.fill('#s-operatorName', 'Someone Else Pool');
      await b.click('#settings-save');
      await expect.poll(() => b.locator('#settings-notice').textContent(), { timeout: 20_000 }).toMatch(/changed the settings while you were editing/);
      await screenshot(b, 'admin-settings-conflict-desktop');
      // put the seeded wording back: other tests may show it
      await a.fill('#s-returnInstructions', original);
      await a.click('#settings-save');
      await a.locator('#settings-notice').filter({ hasText: 'Settings saved.' }).waitFor();
      await a.context().close();
      await b.context().close();
    },
    LONG,
  );

  test(
    'customers and planners cannot open any of it',
    async () => {
      for (const role of ['customer', 'planner'] as const) {
        const login = DEMO_LOGINS.find((l) => l.role === role)!;
        const ctx = await context();
        const page = await ctx.newPage();
        await signIn(page, login.email, DEMO_PASSWORD);
        await page.waitForURL((u) => u.pathname !== '/login');
        for (const path of ['/admin/users', '/admin/mail', '/admin/settings']) {
          expect((await page.goto(path))?.status()).toBe(403);
        }
        expect((await page.request.get('/api/admin/users')).status()).toBe(403);
        expect((await page.request.get('/api/admin/settings')).status()).toBe(403);
        await ctx.close();
      }
    },
    LONG,
  );
});
