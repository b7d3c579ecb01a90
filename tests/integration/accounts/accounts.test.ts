import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { createHash } from 'node:crypto';
import type { APIContext } from 'astro';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld, makeUser } from '../support/fixtures';
import { startSmtpCapture } from '../support/smtp';
import { invitePerson, resendInvitation, setPasswordWithLink, requestPasswordReset } from '@/lib/accounts/accounts.server';
import { inspectToken } from '@/lib/accounts/user-tokens.server';
import { authorizeSignIn } from '@/lib/accounts/sign-in.server';
import { CLIENT_IP_HEADER } from '@/lib/client-ip.server';
import { AppError } from '@/lib/api-errors';
import { AuditEntry, MailMessage, User, UserToken } from '@/models';
import { POST as resetRoute } from '@/pages/api/account/reset';

let world: Awaited<ReturnType<typeof baseWorld>>;
let smtp: Awaited<ReturnType<typeof startSmtpCapture>>;
let inviter: { userId: number; name: string; ip: string };

beforeAll(async () => {
  await resetDatabase();
  world = await baseWorld();
  const admin = await makeUser('admin', world.operator.id, { email: 'boss@test.example' });
  inviter = { userId: admin.id, name: 'Boss Admin', ip: '203.0.113.7' };
  smtp = await startSmtpCapture();
  process.env.APP_URL = 'http://pool.test:4321/';
});
afterAll(async () => {
  await smtp?.stop();
  await sequelize.close();
});

function linkToken(text: string, path: string): string {
  const m = new RegExp(`^http://pool\\.test:4321${path}\\?token=([A-Za-z0-9_-]+)$`, 'm').exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return m[1]!;
}

function request(ip = '198.51.100.1') {
  return new Request('http://pool.test/api/auth/callback/credentials', { headers: { [CLIENT_IP_HEADER]: ip } });
}

/** The reason a link was refused, from the AppError's details. */
async function refusal(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return (e.details as { reason?: string })?.reason ?? e.code;
    throw e;
  }
  return 'accepted';
}

const invite = (email: string, extra: Partial<Parameters<typeof invitePerson>[0]> = {}) =>
  invitePerson({ name: 'New Person', email, role: 'planner', organisationId: world.operator.id, homeSiteId: null, qualifiedInspector: false, ...extra }, inviter);

describe('invitation → set password → sign in', () => {
  test('the whole path, through the services', async () => {
    const { person, mail } = await invite('newbie@test.example');
    expect(mail.status).toBe('sent');
    expect(person).toMatchObject({ email: 'newbie@test.example', role: 'planner', hasPassword: false, active: true });

    // the account exists without a password and cannot sign in yet
    await expect(authorizeSignIn({ email: 'newbie@test.example', password: 'anything-at-all' }, request())).rejects.toThrow();

    const message = smtp.lastTo('newbie@test.example')!;
    expect(message.parsed.subject).toBe('Your Loopfold account at Test Pool');
    const token = linkToken(message.parsed.text!, '/account/invite');
    expect(token).toHaveLength(43); // 32 random bytes, base64url without padding

    // only the SHA-256 of the token is stored, never the token
    const stored = await UserToken.findAll({ where: { userId: person.id } });
    expect(stored).toHaveLength(1);
    expect(stored[0]!.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(await sequelize.query('SELECT * FROM user_tokens'))).not.toContain(token);
    // …nor in the app's copy of the mail
    const outbox = await MailMessage.findByPk(mail.id);
    expect(outbox!.textBody).not.toContain(token);
    expect(outbox!.textBody).toContain('/account/invite?token=•••');
    // valid for 7 days
    const days = (stored[0]!.expiresAt.getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);

    expect(await inspectToken(token)).toMatchObject({ status: 'valid', purpose: 'invite', email: 'newbie@test.example' });
    await expect(setPasswordWithLink(token, 'lined-and-folded-42', '192.0.2.9')).resolves.toEqual({ email: 'newbie@test.example', purpose: 'invite' });

    const signedIn = await authorizeSignIn({ email: 'newbie@test.example', password: 'lined-and-folded-42' }, request());
    expect(signedIn).toMatchObject({ id: String(person.id), role: 'planner' });

    const trail = await AuditEntry.findAll({ where: { entityType: 'user', entityId: String(person.id) }, order: [['id', 'ASC']] });
    expect(trail.map((a) => a.action)).toEqual(['user.invite', 'user.invite_accepted']);
    expect(trail[0]).toMatchObject({ userId: inviter.userId, ip: '203.0.113.7', before: null });
    expect(trail[0]!.after).toMatchObject({ email: 'newbie@test.example', role: 'planner', active: true });
    expect(trail[1]).toMatchObject({ userId: person.id, ip: '192.0.2.9' });
    expect(JSON.stringify(trail.map((a) => a.after))).not.toContain('lined-and-folded-42');
  });

  test('a link works once', async () => {
    await invite('once@test.example');
    const token = linkToken(smtp.lastTo('once@test.example')!.parsed.text!, '/account/invite');
    await setPasswordWithLink(token, 'first-password-1', null);
    expect(await refusal(setPasswordWithLink(token, 'second-password-2', null))).toBe('used');
    expect(await inspectToken(token)).toEqual({ status: 'used', purpose: 'invite' });
    await expect(authorizeSignIn({ email: 'once@test.example', password: 'first-password-1' }, request())).resolves.toBeTruthy();
  });

  test('an expired link is refused and says so', async () => {
    const { person } = await invite('late@test.example');
    const token = linkToken(smtp.lastTo('late@test.example')!.parsed.text!, '/account/invite');
    await UserToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: person.id } });
    expect(await inspectToken(token)).toEqual({ status: 'expired', purpose: 'invite' });
    expect(await refusal(setPasswordWithLink(token, 'too-late-password', null))).toBe('expired');
    expect((await User.findByPk(person.id))!.passwordHash).toBeNull();
  });

  test('a made-up or mangled token is unknown', async () => {
    expect(await inspectToken('x'.repeat(43))).toEqual({ status: 'unknown' });
    expect(await inspectToken('not a token')).toEqual({ status: 'unknown' });
    expect(await refusal(setPasswordWithLink('y'.repeat(43), 'whatever-password', null))).toBe('unknown');
  });

  test('re-inviting replaces the older unused link', async () => {
    const { person } = await invite('again@test.example');
    const first = linkToken(smtp.lastTo('again@test.example')!.parsed.text!, '/account/invite');
    const { mail } = await resendInvitation(person.id, inviter);
    expect(mail.status).toBe('sent');
    const second = linkToken(smtp.lastTo('again@test.example')!.parsed.text!, '/account/invite');
    expect(second).not.toBe(first);
    expect(await inspectToken(first)).toEqual({ status: 'unknown' });
    expect(await UserToken.count({ where: { userId: person.id } })).toBe(1);
    await expect(setPasswordWithLink(second, 'the-newer-link-1', null)).resolves.toMatchObject({ purpose: 'invite' });
    // once a password is set there is nothing to resend
    await expect(resendInvitation(person.id, inviter)).rejects.toMatchObject({ code: 'conflict' });
    expect((await AuditEntry.findAll({ where: { entityId: String(person.id) } })).map((a) => a.action)).toContain('user.reinvite');
  });

  test('a password that breaks the rules leaves the link usable', async () => {
    await invite('rules@test.example');
    const token = linkToken(smtp.lastTo('rules@test.example')!.parsed.text!, '/account/invite');
    await expect(setPasswordWithLink(token, 'rules@test.example', null)).rejects.toMatchObject({ code: 'validation_failed' });
    expect((await inspectToken(token)).status).toBe('valid');
  });

  test('the same e-mail cannot be invited twice; bad combinations are refused with the field named', async () => {
    await expect(invite('newbie@test.example')).rejects.toMatchObject({ code: 'duplicate' });
    await expect(invite('cust@test.example', { role: 'customer' })).rejects.toMatchObject({
      code: 'validation_failed',
      details: [expect.objectContaining({ path: 'organisationId' })],
    });
    await expect(invite('yard@test.example', { role: 'yard' })).rejects.toMatchObject({
      code: 'validation_failed',
      details: [expect.objectContaining({ path: 'homeSiteId' })],
    });
    await expect(invite('yard@test.example', { role: 'yard', homeSiteId: world.customerSite.id })).rejects.toMatchObject({ code: 'validation_failed' });
    expect(await User.count({ where: { email: ['cust@test.example', 'yard@test.example'] } })).toBe(0);
    const ok = await invite('yard@test.example', { role: 'yard', homeSiteId: world.depot.id, qualifiedInspector: true });
    expect(ok.person).toMatchObject({ homeSiteName: 'Test depot', qualifiedInspector: true });
    const cust = await invite('cust@test.example', { role: 'customer', organisationId: world.customer.id });
    expect(cust.person).toMatchObject({ organisationName: 'Test Customer', organisationKind: 'customer' });
  });

  test('when the mail server is down the invitation is kept and the failure reported', async () => {
    const saved = process.env.SMTP_PORT;
    process.env.SMTP_PORT = '1'; // nothing listens on port 1
    try {
      const { person, mail } = await invite('offline@test.example');
      expect(mail.status).toBe('failed');
      expect(person.inviteExpiresAt).not.toBeNull();
      expect((await MailMessage.findByPk(mail.id))!.status).toBe('failed');
    } finally {
      process.env.SMTP_PORT = saved;
    }
  });

  test('a deactivated account cannot use its link', async () => {
    const { person } = await invite('gone@test.example');
    const token = linkToken(smtp.lastTo('gone@test.example')!.parsed.text!, '/account/invite');
    await User.update({ active: false }, { where: { id: person.id } });
    expect(await inspectToken(token)).toEqual({ status: 'inactive', purpose: 'invite' });
    expect(await refusal(setPasswordWithLink(token, 'gone-password-1', null))).toBe('inactive');
  });
});

describe('password reset', () => {
  function ctx(body: unknown, ip: string): APIContext {
    const request = new Request('http://pool.test/api/account/reset', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(body),
    });
    return { request, url: new URL(request.url), params: {}, locals: { user: null, clientAddress: ip } } as unknown as APIContext;
  }

  test('the answer is the same for an account and for no account; only the account gets mail', async () => {
    const user = await makeUser('yard', world.operator.id, { email: 'forgetful@test.example', homeSiteId: world.depot.id });
    const before = smtp.received.length;
    const a = await resetRoute(ctx({ email: 'Forgetful@Test.example ' }, '198.51.100.20'));
    const b = await resetRoute(ctx({ email: 'nobody-here@test.example' }, '198.51.100.20'));
    expect(a.status).toBe(202);
    expect(b.status).toBe(a.status);
    expect(await b.text()).toBe(await a.text());
    expect([...a.headers.entries()]).toEqual([...b.headers.entries()]);

    // the mail goes out after the answer
    await expect.poll(() => smtp.received.length, { timeout: 5000 }).toBe(before + 1);
    const message = smtp.lastTo('forgetful@test.example')!;
    const token = linkToken(message.parsed.text!, '/account/reset');
    const stored = await UserToken.findOne({ where: { userId: user.id, purpose: 'reset' } });
    const minutes = (stored!.expiresAt.getTime() - Date.now()) / 60_000;
    expect(minutes).toBeGreaterThan(59);
    expect(minutes).toBeLessThanOrEqual(60);

    await setPasswordWithLink(token, 'a-fresh-password', null);
    await expect(authorizeSignIn({ email: 'forgetful@test.example', password: 'test-password' }, request('198.51.100.21'))).rejects.toThrow();
    await expect(authorizeSignIn({ email: 'forgetful@test.example', password: 'a-fresh-password' }, request('198.51.100.21'))).resolves.toBeTruthy();
    const trail = await AuditEntry.findAll({ where: { entityId: String(user.id) } });
    expect(trail.map((t) => t.action)).toEqual(['user.password_reset']);
  });

  test('the service tells the cases apart internally (never to the caller)', async () => {
    await makeUser('planner', world.operator.id, { email: 'dormant@test.example', active: false });
    expect(await (await requestPasswordReset('nobody2@test.example', '198.51.100.30')).delivery).toBe('no_account');
    expect(await (await requestPasswordReset('dormant@test.example', '198.51.100.30')).delivery).toBe('no_account');
  });

  test('a newer reset link replaces the older one', async () => {
    await makeUser('planner', world.operator.id, { email: 'twice@test.example' });
    await (await requestPasswordReset('twice@test.example', '198.51.100.40')).delivery;
    const first = linkToken(smtp.lastTo('twice@test.example')!.parsed.text!, '/account/reset');
    await (await requestPasswordReset('twice@test.example', '198.51.100.40')).delivery;
    const second = linkToken(smtp.lastTo('twice@test.example')!.parsed.text!, '/account/reset');
    expect(await inspectToken(first)).toEqual({ status: 'unknown' });
    expect((await inspectToken(second)).status).toBe('valid');
  });

  test('at most 3 links an hour per address, then silence; 10 requests per network in 15 minutes, then 429', async () => {
    await makeUser('planner', world.operator.id, { email: 'flooded@test.example' });
    const results = [];
    for (let i = 0; i < 4; i++) results.push(await (await requestPasswordReset('flooded@test.example', `198.51.100.${50 + i}`)).delivery);
    expect(results).toEqual(['sent', 'sent', 'sent', 'throttled']);

    for (let i = 0; i < 10; i++) await requestPasswordReset(`someone${i}@test.example`, '198.51.100.99');
    await expect(requestPasswordReset('someone-else@test.example', '198.51.100.99')).rejects.toMatchObject({ code: 'rate_limited' });
    const res = await resetRoute(ctx({ email: 'x@test.example' }, '198.51.100.99'));
    expect(res.status).toBe(429);
  });
});
