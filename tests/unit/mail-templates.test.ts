import { describe, test, expect } from 'vitest';
import { inviteMail, passwordResetMail } from '../../src/lib/mail-templates';

const invite = {
  recipientName: 'Ada Example',
  recipientEmail: 'ada@customer.example',
  roleLabel: 'Customer',
  organisationName: 'Example Syrups',
  operatorName: 'Example Pool',
  inviterName: 'Ines Admin',
  link: 'http://localhost:4321/account/invite?token=abc_DEF-123',
  expiresAt: new Date('2027-03-28T01:00:00Z'),
  timeZone: 'Europe/Amsterdam',
};

describe('invitation mail', () => {
  const mail = inviteMail(invite);
  test('subject names the operator', () => {
    expect(mail.subject).toBe('Your Loopfold account at Example Pool');
  });
  test('text greets, says who invited, the role and organisation, and carries the link on a line of its own', () => {
    expect(mail.text).toMatch(/^Hello Ada Example,\n\n/);
    expect(mail.text).toContain('Ines Admin has opened a Loopfold account for you: Customer, Example Syrups (with Example Pool).');
    expect(mail.text.split('\n')).toContain(invite.link);
    expect(mail.text).toContain('sign in with your e-mail address (ada@customer.example)');
  });
  test('expiry is written in the operator zone (EU summer time starts 28 Mar 2027 01:00 UTC → 03:00 local, Directive 2000/84/EC)', () => {
    expect(mail.text).toContain('until 28 Mar 2027, 03:00 (Europe/Amsterdam time)');
  });
  test('staff of the operator are not told "with" their own company', () => {
    const staff = inviteMail({ ...invite, organisationName: 'Example Pool', roleLabel: 'Yard' });
    expect(staff.text).toContain('account for you: Yard, Example Pool.');
  });
  test('no runs of blank lines, ends with one newline', () => {
    expect(mail.text).not.toMatch(/\n\n\n/);
    expect(mail.text.endsWith('.\n') || mail.text.endsWith('Loopfold\n')).toBe(true);
  });
  test('the HTML alternative has the link as an anchor and escapes names', () => {
    const html = inviteMail({ ...invite, recipientName: 'Ada <b>&</b>' }).html;
    expect(html).toContain(`<a href="${invite.link}">${invite.link}</a>`);
    expect(html).toContain('Hello Ada &lt;b&gt;&amp;&lt;/b&gt;,');
    expect(html).not.toContain('<b>');
  });
});

describe('password reset mail', () => {
  const base = { recipientName: 'Bo', recipientEmail: 'bo@pool.example', operatorName: 'Example Pool', link: 'https://pool.example/account/reset?token=xyz' };
  test('says the link is one-time and how long it lasts', () => {
    const mail = passwordResetMail({ ...base, validForMinutes: 60 });
    expect(mail.subject).toBe('Reset your Loopfold password');
    expect(mail.text).toContain('It works once, within 1 hour:');
    expect(mail.text.split('\n')).toContain(base.link);
    expect(mail.text).toContain('your password stays as it is');
  });
  test('other validities read naturally', () => {
    expect(passwordResetMail({ ...base, validForMinutes: 120 }).text).toContain('within 2 hours:');
    expect(passwordResetMail({ ...base, validForMinutes: 30 }).text).toContain('within 30 minutes:');
  });
});
