import { describe, test, expect } from 'vitest';
import { accountLinkUrl, linkLifetimeMs, linkProblemMessage, passwordProblem, setPasswordSchema, resetRequestSchema, TOKEN_PATTERN } from '@/lib/accounts/account-rules';

const TOKEN = `${'A'.repeat(21)}-_${'z'.repeat(20)}`; // 43 base64url characters

describe('one-time links', () => {
  test('invite links last 7 days, reset links 1 hour', () => {
    expect(linkLifetimeMs('invite')).toBe(7 * 24 * 60 * 60 * 1000);
    expect(linkLifetimeMs('reset')).toBe(60 * 60 * 1000);
  });
  test('the link is built on the configured base, trailing slashes or not', () => {
    expect(accountLinkUrl('https://pool.example/', 'invite', TOKEN)).toBe(`https://pool.example/account/invite?token=${TOKEN}`);
    expect(accountLinkUrl('http://localhost:4321', 'reset', TOKEN)).toBe(`http://localhost:4321/account/reset?token=${TOKEN}`);
  });
  test('32 bytes in base64url without padding are 43 characters (RFC 4648 §5: ceil(256/6) = 43)', () => {
    expect(TOKEN_PATTERN.test(Buffer.alloc(32, 0xff).toString('base64url'))).toBe(true);
    expect(TOKEN_PATTERN.test(Buffer.alloc(32).toString('base64'))).toBe(false); // padded standard base64
    expect(TOKEN_PATTERN.test(TOKEN.slice(1))).toBe(false);
  });
  test('problem messages name the way forward for each purpose', () => {
    expect(linkProblemMessage({ status: 'used', purpose: 'invite' })).toMatch(/already been used.*administrator/);
    expect(linkProblemMessage({ status: 'expired', purpose: 'reset' })).toMatch(/expired.*Forgotten your password/);
    expect(linkProblemMessage({ status: 'unknown' })).toMatch(/not valid/);
    expect(linkProblemMessage({ status: 'inactive', purpose: 'invite' })).toMatch(/deactivated/);
  });
});

describe('passwords', () => {
  test.each([
    ['nine-char', /at least 10/],
    ['x'.repeat(65), /at most 64/],
    ['€'.repeat(25), /too long/], // 25 × 3 UTF-8 bytes = 75 > bcrypt's 72
    [' '.repeat(12), /spaces only/],
  ])('%s is refused', (pw, why) => {
    expect(passwordProblem(pw)).toMatch(why);
  });
  test('ten characters, and 64, are fine; the e-mail address is not', () => {
    expect(passwordProblem('ten-chars!')).toBeNull();
    expect(passwordProblem('y'.repeat(64))).toBeNull();
    expect(passwordProblem('Me@Pool.example', { email: 'me@pool.example' })).toMatch(/e-mail/);
  });
  test('the form schema checks the confirmation only when the password itself is acceptable', () => {
    const bad = setPasswordSchema.safeParse({ token: TOKEN, password: 'short', confirm: 'other' });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join('.'))).toEqual(['password']);
    const mismatch = setPasswordSchema.safeParse({ token: TOKEN, password: 'long-enough-1', confirm: 'long-enough-2' });
    expect(mismatch.error!.issues.map((i) => i.path.join('.'))).toEqual(['confirm']);
    expect(setPasswordSchema.safeParse({ token: TOKEN, password: 'long-enough-1', confirm: 'long-enough-1' }).success).toBe(true);
    expect(setPasswordSchema.safeParse({ token: 'short', password: 'long-enough-1', confirm: 'long-enough-1' }).success).toBe(false);
  });
  test('reset requests normalise the address', () => {
    expect(resetRequestSchema.parse({ email: '  Someone@Pool.Example ' })).toEqual({ email: 'someone@pool.example' });
  });
});
