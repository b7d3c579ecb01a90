// The customers' reminder jobs at a fixed clock against the real database: the overdue-return reminder (at most one
// per contact per week, listing all their bins past the operator's threshold, none for an opted-out contact nor for
// another customer's), and the monthly count due (once a month per contact, only the sites still to count).
import { describe, test, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { Op } from 'sequelize';
import { usePoolWorld, newBin, makeUser, addSecondCustomer } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan } from '@/lib/scans/scan-service.server';
import { runJobNow, JOBS } from '@/lib/jobs/registry.server';
import { overdueBins } from '@/lib/portal/customer-reminders.server';
import { submitCount } from '@/lib/portal/site-counts.server';
import { portalScope } from '@/lib/portal/portal-scope.server';
import { overdueBack } from '@/lib/fleet/overdue-return';
import { MailMessage, Site, User } from '@/models';

process.env.AUTH_SECRET ??= 'test-secret';
process.env.SMTP_HOST = '127.0.0.1';
process.env.SMTP_PORT = '1'; // nobody listens: the outbox still records each attempt
const w = usePoolWorld();
const bins: Array<{ id: number; grai: string; serial: string }> = [];
let optedOut: User;
let limited: User;
let admin: User;

/** A bin delivered to the customer's site at `at`. */
async function deliveredAt(at: string) {
  const bin = await newBin(w, { registeredAt: '2026-09-01T08:00:00Z' });
  let i = 0;
  for (const s of [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId: w.customerSite.id },
  ] as const) {
    await recordScan(
      w.yard,
      { clientEventId: randomUUID(), assetId: bin.id, occurredAt: new Date(Date.parse(at) + i++ * 60_000), ...s },
      { now: new Date('2026-12-01T00:00:00Z') },
    );
  }
  return bin;
}

const mailsTo = (email: string, kind: string) => MailMessage.findAll({ where: { toAddress: email, kind }, order: [['id', 'ASC']] });
const at = (iso: string) => ({ now: new Date(iso) });

beforeAll(async () => {
  await addSecondCustomer(w);
  bins.push(await deliveredAt('2026-10-20T09:00:00Z')); // long past the 14 free days
  bins.push(await deliveredAt('2026-11-01T09:00:00Z'));
  bins.push(await deliveredAt('2026-11-15T09:00:00Z')); // one or two days over on 1 Dec: under the threshold of 3
  admin = (await User.findByPk(w.customerUser.id!))!;
  optedOut = await makeUser('customer', w.customer.id, { email: 'no-reminders@test.example' });
  await sequelize.query('UPDATE users SET mail_opt_out = TRUE WHERE id = $1', { bind: [optedOut.id] });
  // A colleague limited to a second site of the customer, where no bin stands.
  const quiet = await Site.create({ organisationId: w.customer.id, code: 'CUS-T2', name: 'Quiet site', kind: 'customer', address: null, latitude: '51.7', longitude: '4.7' });
  limited = await makeUser('customer', w.customer.id, { email: 'limited@test.example' });
  await sequelize.query('INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)', { bind: [limited.id, quiet.id] });
});

describe('overdue-return reminders', () => {
  test('both jobs are scheduled', () => {
    expect(JOBS.map((j) => j.name)).toEqual(expect.arrayContaining(['overdue-return-reminders', 'count-due-reminders']));
  });

  test('the days over come from the one overdue rule', async () => {
    const listed = await overdueBins(new Date('2026-12-01T08:30:00Z'));
    for (const b of listed) {
      // hand-worked: delivered 20 Oct, 1 Nov and 15 Nov with 14 free days; on 1 Dec the rule gives these counts
      const delivered = { [bins[0]!.grai]: '2026-10-20', [bins[1]!.grai]: '2026-11-01', [bins[2]!.grai]: '2026-11-15' }[b.grai]!;
      expect(b.daysOver).toBe(overdueBack({ status: 'on_hire', deliveredOn: delivered, dispatchedOn: null, freeDays: 14, today: '2026-12-01' }).daysOver);
    }
    expect(listed.find((b) => b.grai === bins[0]!.grai)!.daysOver).toBeGreaterThan(20);
  });

  test('one mail per contact, all their bins over the threshold; none to the opted-out, none twice in a week', async () => {
    const first = await runJobNow('overdue-return-reminders', at('2026-12-01T08:30:00Z'));
    expect(first).toMatchObject({ reminders: 1 });
    const [mail] = await mailsTo(admin.email, 'overdue_reminder');
    expect(mail).toBeDefined();
    expect(mail!.subject).toBe('2 bins past their free days — please send them back');
    expect(mail!.textBody).toContain(`• ${bins[0]!.serial} at Customer site:`);
    expect(mail!.textBody).toContain(`• ${bins[1]!.serial} at Customer site:`);
    expect(mail!.textBody).not.toContain(bins[2]!.serial);
    expect(mail!.textBody.indexOf(bins[0]!.serial)).toBeLessThan(mail!.textBody.indexOf(bins[1]!.serial)); // worst first
    expect(mail!.textBody).toMatch(/\/account/);
    expect(await mailsTo(optedOut.email, 'overdue_reminder')).toEqual([]);
    expect(await mailsTo(limited.email, 'overdue_reminder')).toEqual([]); // nothing overdue at their site
    expect(await MailMessage.count({ where: { kind: 'overdue_reminder', toAddress: { [Op.like]: '%other%' } } })).toBe(0);

    // the same day again, and six days later: nothing; a week later: one more, now with the third bin too
    expect(await runJobNow('overdue-return-reminders', at('2026-12-01T10:00:00Z'))).toMatchObject({ reminders: 0 });
    expect(await runJobNow('overdue-return-reminders', at('2026-12-07T08:30:00Z'))).toMatchObject({ reminders: 0 });
    expect(await runJobNow('overdue-return-reminders', at('2026-12-08T08:30:00Z'))).toMatchObject({ reminders: 1 });
    const all = await mailsTo(admin.email, 'overdue_reminder');
    expect(all).toHaveLength(2);
    expect(all[1]!.subject).toMatch(/^3 bins/);
  });
});

describe('the monthly count due', () => {
  test('once a month per contact, the sites still to count; none to the opted-out or to a site with no bins', async () => {
    const out = await runJobNow('count-due-reminders', at('2026-12-01T07:00:00Z'));
    expect(out).toMatchObject({ mails: 1 });
    const [mail] = await mailsTo(admin.email, 'count_due');
    expect(mail!.subject).toBe('Monthly count for Dec 2026: 1 site to confirm');
    expect(mail!.textBody).toContain('by 7 Dec 2026');
    expect(mail!.textBody).toContain(`• Customer site (3 bins on our list): `);
    expect(mail!.textBody).toContain(`/portal/counts/${w.customerSite.id}`);
    expect(await mailsTo(optedOut.email, 'count_due')).toEqual([]);
    expect(await mailsTo(limited.email, 'count_due')).toEqual([]);
    expect(await runJobNow('count-due-reminders', at('2026-12-02T07:00:00Z'))).toMatchObject({ mails: 0 });
  });

  test('a site counted for the month is not asked for; next month it is again', async () => {
    await submitCount(await portalScope(admin), w.customerSite.id, { counted: bins.map((b) => b.grai), method: 'ticked' }, new Date('2027-01-02T09:00:00Z'));
    expect(await runJobNow('count-due-reminders', at('2027-01-03T07:00:00Z'))).toMatchObject({ mails: 0 });
    expect(await runJobNow('count-due-reminders', at('2027-02-01T07:00:00Z'))).toMatchObject({ mails: 1 });
  });
});

describe("a person's own choice on /account", () => {
  test('turning reminders off is saved and audited, and the next reminder skips them', async () => {
    const { setMailOptOut, mailOptOut } = await import('@/lib/accounts/mail-preferences.server');
    expect(await setMailOptOut(admin.id, true, { userId: admin.id, ip: null })).toEqual({ optOut: true });
    expect(await mailOptOut(admin.id)).toBe(true);
    const [entry] = await sequelize.query<{ after: { mailOptOut: boolean } }>(`SELECT after FROM audit_entries WHERE action = 'user.mail_preference' ORDER BY id DESC LIMIT 1`, {
      type: (await import('sequelize')).QueryTypes.SELECT,
    });
    expect(entry!.after).toEqual({ mailOptOut: true });
    expect(await runJobNow('overdue-return-reminders', at('2026-12-20T08:30:00Z'))).toMatchObject({ reminders: 0 });
    expect(await runJobNow('count-due-reminders', at('2027-03-01T07:00:00Z'))).toMatchObject({ mails: 0 });
  });
});
