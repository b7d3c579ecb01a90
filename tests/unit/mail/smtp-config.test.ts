import { describe, test, expect } from 'vitest';
import { smtpConfigFromEnv } from '@/lib/mail/smtp-config';

describe('SMTP settings from the environment', () => {
  test('no host: mail is reported as not set up (and nothing is attempted)', () => {
    const c = smtpConfigFromEnv({});
    expect(c.ok).toBe(false);
    if (!c.ok) expect(c.problem).toMatch(/SMTP_HOST/);
  });
  test('the local mailbox: plain SMTP, STARTTLS ignored, no credentials', () => {
    const c = smtpConfigFromEnv({ SMTP_HOST: '127.0.0.1', SMTP_PORT: '2526', MAIL_DEV_INBOX: '1', SMTP_USER: 'u' });
    expect(c).toMatchObject({ ok: true, options: { host: '127.0.0.1', port: 2526, secure: false, ignoreTLS: true } });
    expect(c.ok && c.options.auth).toBeUndefined();
  });
  test('a real server: submission port 587 by default, implicit TLS on 465 when SMTP_SECURE (RFC 8314)', () => {
    expect(smtpConfigFromEnv({ SMTP_HOST: 'smtp.example' })).toMatchObject({ ok: true, options: { port: 587, secure: false } });
    expect(smtpConfigFromEnv({ SMTP_HOST: 'smtp.example', SMTP_SECURE: 'true' })).toMatchObject({ ok: true, options: { port: 465, secure: true } });
  });
  test('credentials are passed when a user is given', () => {
    const c = smtpConfigFromEnv({ SMTP_HOST: 'smtp.example', SMTP_PORT: '2525', SMTP_USER: 'pool', SMTP_PASSWORD: 's3cret' });
    expect(c.ok && c.options.auth).toEqual({ user: 'pool', pass: 's3cret' });
  });
  test('a bad port is refused with the value named', () => {
    const c = smtpConfigFromEnv({ SMTP_HOST: 'smtp.example', SMTP_PORT: 'abc' });
    expect(c.ok).toBe(false);
    if (!c.ok) expect(c.problem).toContain('abc');
  });
  test('every connection is bounded in time', () => {
    const c = smtpConfigFromEnv({ SMTP_HOST: 'h' });
    expect(c.ok && c.options.connectionTimeout).toBeLessThanOrEqual(10_000);
  });
});
