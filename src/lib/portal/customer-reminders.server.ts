// The customers' reminder mails, run as scheduled jobs at a clock (src/lib/jobs/registry.server.ts):
//   overdue-return reminders — who gets one and which bins it lists is the pure rule remindersDue() of
//     overdue-reminders.ts (at most one per contact per rolling week, all their overdue bins, site limits, opt-outs),
//     fed with the bins the one overdue rule (overdueBack() of lib/fleet) finds past the operator's threshold;
//   the monthly count due — once a month per contact, the sites of theirs whose count is not in (countStanding()).
// Both are non-essential: a contact who opted out on /account gets neither. Each mail sent is logged in
// customer_reminders, claimed before sending so two workers never send the same one.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { appUrl } from '@/lib/app-url.server';
import { addDays, formatLongDate, localDate } from '@/lib/calendar';
import { overdueBack, overdueBackSql, tripTermsOf, tripTermsSelectSql, type TripTermsRow } from '@/lib/fleet/overdue-return';
import { countDueMail, overdueReminderMail } from '@/lib/mail/mail-templates';
import { sendMail } from '@/lib/mail/mailer.server';
import { getSettings } from '@/lib/settings/settings.server';
import { countMonthFor, countStanding, DEFAULT_COUNT_GRACE_DAYS } from './count-confirmation';
import { monthName } from './count-look';
import { remindersDue, type ReminderBin, type ReminderContact } from './overdue-reminders';

const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

interface Contact {
  id: number;
  email: string;
  name: string;
  organisation_id: number;
  site_ids: number[] | null;
  opted_out: boolean;
  last_at: Date | null;
}

/** Active customer users of active organisations, with their site limits, opt-out and last reminder of a kind. */
async function contacts(kind: 'overdue_reminder' | 'count_due'): Promise<Contact[]> {
  return q<Contact>(
    `SELECT u.id, u.email, u.name, u.organisation_id, u.mail_opt_out AS opted_out,
            (SELECT array_agg(us.site_id ORDER BY us.site_id) FROM user_sites us WHERE us.user_id = u.id) AS site_ids,
            (SELECT max(r.sent_at) FROM customer_reminders r WHERE r.user_id = u.id AND r.kind = $1) AS last_at
       FROM users u JOIN organisations o ON o.id = u.organisation_id
      WHERE u.role = 'customer' AND u.active AND o.active ORDER BY u.id`,
    [kind],
  );
}

/** Claims the reminder (one per contact, kind and `about`); false when it was claimed already. */
async function claim(userId: number, kind: 'overdue_reminder' | 'count_due', about: string, bins: number, now: Date): Promise<number | null> {
  const [row] = await q<{ id: number }>(
    `INSERT INTO customer_reminders (user_id, kind, about, bins, sent_at) VALUES ($1, $2, $3, $4, $5) ON CONFLICT (user_id, kind, about) DO NOTHING RETURNING id`,
    [userId, kind, about, bins, now],
  );
  return row?.id ?? null;
}

async function logMail(reminderId: number, mailId: number) {
  await sequelize.query('UPDATE customer_reminders SET mail_id = $2 WHERE id = $1', { bind: [reminderId, mailId] });
}

/** The bins overdue back now, with the days over their free days by the one overdue rule. */
export async function overdueBins(now: Date): Promise<ReminderBin[]> {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const rows = await q<
    {
      grai: string;
      serial: string;
      status: 'on_hire' | 'awaiting_collection';
      customer_id: number;
      site_id: number | null;
      site_name: string | null;
      delivered_on: string | null;
      dispatched_on: string | null;
    } & TripTermsRow
  >(
    `SELECT a.grai, a.serial, a.status, a.customer_id, cs.id AS site_id, cs.name AS site_name,
            to_char((t.delivered_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS delivered_on,
            to_char((t.dispatched_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS dispatched_on,
            ${tripTermsSelectSql('$2::text')}
       FROM assets a JOIN trips t ON t.id = a.current_trip_id JOIN organisations o ON o.id = a.customer_id
       LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN sites cs ON cs.id = CASE WHEN s.kind = 'customer' THEN a.site_id ELSE t.customer_site_id END
      WHERE ${overdueBackSql('$1::date', '$2::text')}`,
    [today, settings.timeZone],
  );
  return rows.map((r) => ({
    grai: r.grai,
    serial: r.serial,
    organisationId: r.customer_id,
    siteId: r.site_id,
    siteName: r.site_name,
    daysOver: overdueBack({ status: r.status, deliveredOn: r.delivered_on, dispatchedOn: r.dispatched_on, today, ...tripTermsOf(r) }).daysOver,
  }));
}

/** The overdue-return reminder job: one mail per contact the rule picks, listing all their overdue bins. */
export async function runOverdueReminders({ now }: { now: Date }) {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const people = await contacts('overdue_reminder');
  const asContacts: ReminderContact[] = people.map((c) => ({
    userId: c.id,
    email: c.email,
    name: c.name,
    organisationId: c.organisation_id,
    siteIds: c.site_ids,
    optedOut: c.opted_out,
    lastRemindedAt: c.last_at ? new Date(c.last_at) : null,
  }));
  const due = remindersDue(asContacts, await overdueBins(now), now, settings.reminderDaysOver);
  const freeDays = new Map((await q<{ id: number; free_days: number }>(`SELECT id, free_days FROM organisations`)).map((o) => [o.id, o.free_days]));
  let sent = 0;
  for (const r of due) {
    const claimed = await claim(r.contact.userId, 'overdue_reminder', today, r.bins.length, now);
    if (claimed === null) continue;
    const mail = overdueReminderMail({
      recipientName: r.contact.name,
      operatorName: settings.operatorName,
      freeDays: freeDays.get(r.contact.organisationId) ?? 0,
      bins: r.bins.map((b) => ({ serial: b.serial, siteName: b.siteName, daysOver: b.daysOver })),
      link: `${appUrl()}/portal/collections`,
      accountLink: `${appUrl()}/account`,
    });
    const out = await sendMail({ to: r.contact.email, ...mail, kind: 'overdue_reminder' });
    await logMail(claimed, out.id);
    if (out.status === 'sent') sent += 1;
  }
  return { contacts: people.length, reminders: due.length, sent };
}

/** The monthly-count job: once a month per contact (not opted out), the sites of theirs still to count. */
export async function runCountDueReminders({ now }: { now: Date }) {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const month = countMonthFor(today);
  const people = (await contacts('count_due')).filter((c) => !c.opted_out);
  const sites = await q<{ id: number; name: string; organisation_id: number; bins: number; last_month: string | null }>(
    `SELECT s.id, s.name, s.organisation_id,
            (SELECT count(*)::int FROM assets a WHERE a.site_id = s.id AND a.customer_id = s.organisation_id AND a.status IN ('on_hire', 'awaiting_collection')) AS bins,
            (SELECT max(c.month) FROM site_counts c WHERE c.site_id = s.id) AS last_month
       FROM sites s WHERE s.kind = 'customer' AND s.active ORDER BY s.name`,
  );
  let mails = 0;
  let sent = 0;
  for (const c of people) {
    const theirs = sites.filter(
      (s) => s.organisation_id === c.organisation_id && (c.site_ids === null || c.site_ids.includes(s.id)) && s.bins > 0 && countStanding(today, s.last_month) !== 'counted',
    );
    if (theirs.length === 0) continue;
    const claimed = await claim(
      c.id,
      'count_due',
      month,
      theirs.reduce((n, s) => n + s.bins, 0),
      now,
    );
    if (claimed === null) continue;
    mails += 1;
    const mail = countDueMail({
      recipientName: c.name,
      operatorName: settings.operatorName,
      monthName: monthName(month),
      dueBy: formatLongDate(addDays(`${month}-01`, DEFAULT_COUNT_GRACE_DAYS - 1)),
      sites: theirs.map((s) => ({ name: s.name, bins: s.bins, link: `${appUrl()}/portal/counts/${s.id}` })),
      accountLink: `${appUrl()}/account`,
    });
    const out = await sendMail({ to: c.email, ...mail, kind: 'count_due' });
    await logMail(claimed, out.id);
    if (out.status === 'sent') sent += 1;
  }
  return { contacts: people.length, mails, sent };
}
