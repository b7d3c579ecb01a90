// The payment reminder job: invoices still open the set number of days after their due date (then weekly), one
// mail per customer to its contact address, each reminder kept so the next run knows.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { formatLongDate, localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { appUrl } from '@/lib/app-url.server';
import { sendMail } from '@/lib/mail/mailer.server';
import { paymentReminderMail } from '@/lib/mail/mail-templates';
import { customerContact, listInvoices } from './invoices.server';
import { paymentRemindersDue } from './invoice-rules';
import { formatMoney } from './money';

export async function runPaymentReminders({ now }: { now: Date }) {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const open = (await listInvoices({ kind: 'operator' })).filter((v) => v.series === 'invoice' && v.dueOn && v.balance.outstandingMinor > 0);
  const last = new Map(
    (
      await sequelize.query<{ invoice_id: number; sent_on: LocalDate }>(
        `SELECT invoice_id, to_char(max(sent_on), 'YYYY-MM-DD') AS sent_on FROM invoice_reminders GROUP BY invoice_id`,
        {
          type: QueryTypes.SELECT,
        },
      )
    ).map((r) => [r.invoice_id, r.sent_on]),
  );
  const byId = new Map(open.map((v) => [v.id, v]));
  const due = paymentRemindersDue(
    open.map((v) => ({ invoiceId: v.id, customerId: v.customerId, dueOn: v.dueOn!, outstandingMinor: v.balance.outstandingMinor, lastRemindedOn: last.get(v.id) ?? null })),
    today,
    settings.paymentReminderDays,
  );
  let sent = 0;
  for (const [customerId, invoices] of due) {
    const to = await customerContact(customerId);
    if (!to.email) continue;
    // Claim first (one row per invoice and day): a second worker running the same job sends nothing twice.
    const claimed: number[] = [];
    for (const i of invoices) {
      const [row] = await sequelize.query<{ id: number }>(`INSERT INTO invoice_reminders (invoice_id, sent_on) VALUES ($1, $2) ON CONFLICT DO NOTHING RETURNING id`, {
        bind: [i.invoiceId, today],
        type: QueryTypes.SELECT,
      });
      if (row) claimed.push(i.invoiceId);
    }
    if (claimed.length === 0) continue;
    const mail = paymentReminderMail({
      customer: to.name,
      operatorName: settings.operatorName,
      invoices: claimed.map((id) => {
        const v = byId.get(id)!;
        return { number: v.number, outstanding: formatMoney(v.balance.outstandingMinor, v.currency), dueOn: formatLongDate(v.dueOn!), link: `${appUrl()}/portal/invoices/${v.id}` };
      }),
    });
    const out = await sendMail({ to: to.email, kind: 'payment_reminder', ...mail });
    await sequelize.query(`UPDATE invoice_reminders SET mail_id = $3 WHERE sent_on = $2 AND invoice_id = ANY($1::int[])`, { bind: [claimed, today, out.id] });
    if (out.status === 'sent') sent += 1;
  }
  return { open: open.length, customers: due.size, sent };
}
