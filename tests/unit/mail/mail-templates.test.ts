import { describe, test, expect } from 'vitest';
import { inviteMail, passwordResetMail, collectionRequestMail, damageReportMail, overdueReminderMail, countDueMail, MAIL_KIND_LABELS } from '@/lib/mail/mail-templates';

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

describe('mail to planners about requests', () => {
  const common = {
    operatorName: 'Example Pool',
    source: 'public' as const,
    bin: { serial: '000417', grai: '0 9520123 45678 8 · 000417' },
    siteName: 'Example Syrups — bottling',
    customerName: 'Example Syrups',
    receivedAt: new Date('2027-03-28T01:30:00Z'),
    timeZone: 'Europe/Amsterdam',
    link: 'http://localhost:4321/requests',
  };
  const collection = { ...common, quantity: 6, locationNote: 'Gate 3', contactName: 'Ada', contactPhone: '+31 6 1234 5678', contactEmail: null, note: null };

  test('a collection request names count, site and customer, bin, contact, and links to the requests page', () => {
    const mail = collectionRequestMail(collection);
    expect(mail.subject).toBe('Collection request: 6 folded bins at Example Syrups — bottling');
    expect(mail.text).toMatch(/^6 folded bins are empty and ready for collection\.\n\n/);
    expect(mail.text).toContain('Where: Example Syrups — bottling (Example Syrups)');
    expect(mail.text).toContain('Exact spot: Gate 3');
    expect(mail.text).toContain('Bin scanned: serial 000417, GRAI 0 9520123 45678 8 · 000417');
    expect(mail.text).toContain('Contact: Ada · +31 6 1234 5678');
    expect(mail.text.split('\n')).toContain(common.link);
    expect(mail.html).toContain(`<a href="${common.link}">`);
  });
  test('time in the operator zone (EU summer time begins 28 Mar 2027 01:00 UTC, Directive 2000/84/EC: 01:30 UTC is 03:30 local)', () => {
    expect(collectionRequestMail(collection).text).toContain('Received 28 Mar 2027, 03:30 (Europe/Amsterdam time) through the public bin page');
  });
  test('one bin reads in the singular; no site and no bin say so; a note is quoted', () => {
    const mail = collectionRequestMail({ ...collection, quantity: 1, bin: null, siteName: null, customerName: null, note: 'Behind the silo' });
    expect(mail.subject).toBe('Collection request: 1 folded bin at an unknown site');
    expect(mail.text).toMatch(/^1 folded bin is empty/);
    expect(mail.text).toContain('Where: not known from the bin');
    expect(mail.text).toContain('Bin scanned: none');
    expect(mail.text).toContain('Note from the sender:\nBehind the silo');
  });
  test('a damage report carries the description, whether a photo came, and the link', () => {
    const mail = damageReportMail({ ...common, description: 'Cracked floor panel', hasPhoto: true, contactName: null, contactEmail: null });
    expect(mail.subject).toBe('Damage reported on bin 000417 at Example Syrups — bottling');
    expect(mail.text).toContain('Someone reported damage on bin 000417:\n\nCracked floor panel\n');
    expect(mail.text).toContain('A photo came with the report');
    expect(mail.text).toContain('Contact: none given');
    expect(mail.text.split('\n')).toContain(common.link);
    expect(damageReportMail({ ...common, description: 'x <b>', hasPhoto: false, contactName: null, contactEmail: null }).html).toContain('x &lt;b&gt;');
  });
  test('the sent-mail page has words for both kinds', () => {
    expect(MAIL_KIND_LABELS.collection_request).toBe('Collection request');
    expect(MAIL_KIND_LABELS.damage_report).toBe('Damage report');
  });
});

describe('customer reminders (text and HTML)', () => {
  const overdue = overdueReminderMail({
    recipientName: 'Ada Example',
    operatorName: 'Example Pool',
    freeDays: 14,
    bins: [
      { serial: '100528', siteName: 'Dock 2', daysOver: 12 },
      { serial: '100529', siteName: null, daysOver: 1 },
    ],
    link: 'http://localhost:4321/portal/collections',
    accountLink: 'http://localhost:4321/account',
  });
  test('the overdue reminder lists every bin with its days over, and says how to stop reminders', () => {
    expect(overdue.subject).toBe('2 bins past their free days — please send them back');
    expect(overdue.text).toContain('• 100528 at Dock 2: 12 days over');
    expect(overdue.text).toContain('• 100529: 1 day over');
    expect(overdue.text).toContain('turn them off here: http://localhost:4321/account');
    expect(overdue.html).toContain('<a href="http://localhost:4321/portal/collections">');
    expect(overdue.html).toContain('<a href="http://localhost:4321/account">');
  });
  test('the count-due mail names the month, the last day and each site with its link', () => {
    const due = countDueMail({
      recipientName: 'Ada Example',
      operatorName: 'Example Pool',
      monthName: 'January 2027',
      dueBy: '7 Jan 2027',
      sites: [{ name: 'Dock 2', bins: 1, link: 'http://localhost:4321/portal/counts/4' }],
      accountLink: 'http://localhost:4321/account',
    });
    expect(due.subject).toBe('Monthly count for January 2027: 1 site to confirm');
    expect(due.text).toContain('• Dock 2 (1 bin on our list): http://localhost:4321/portal/counts/4');
    expect(due.html).toContain('<a href="http://localhost:4321/portal/counts/4">');
    expect(MAIL_KIND_LABELS.overdue_reminder).toBe('Overdue-return reminder');
  });
});
