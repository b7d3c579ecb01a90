import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { plannerDigestMail } from '@/lib/mail/mail-templates';
import { formatLongDate, localDate } from '@/lib/calendar';
import { overdueBackSql } from '@/lib/fleet/overdue-return';
import { testDueSoonSql } from '@/lib/inspections/inspection-due';
import { sendMail } from '@/lib/mail/mailer.server';
import { getSettings } from '@/lib/settings/settings.server';
import type { JobContext } from './registry.server';
import { hireDaysThroughSql } from '@/lib/billing/hire-days';

// Days with the customer so far, counted from delivery (or dispatch when never confirmed): the day count of
// src/lib/billing/hire-days.ts, which the overdue rule (src/lib/fleet/overdue-return.ts) uses too.
const DAYS_WITH_CUSTOMER_SQL = hireDaysThroughSql('(COALESCE(t.delivered_at, t.dispatched_at) AT TIME ZONE $2)::date', '$1::date');

const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

/** What the planners' morning digest reports, read at the job's clock. */
export async function digestFigures(now: Date) {
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const [overdue, flags, requests, tests, missing] = await Promise.all([
    // On hire longer than the customer's free days, counted from delivery (or dispatch when never confirmed).
    q<{ customer: string; bins: number; oldestDays: number }>(
      `SELECT o.name AS customer, count(*)::int AS bins,
              max(${DAYS_WITH_CUSTOMER_SQL})::int AS "oldestDays"
         FROM assets a JOIN trips t ON t.id = a.current_trip_id JOIN organisations o ON o.id = a.customer_id
        WHERE ${overdueBackSql('$1::date', '$2::text')}
        GROUP BY o.name ORDER BY bins DESC`,
      [today, settings.timeZone],
    ),
    q<{ flagged: number; seals: number }>(
      `SELECT count(*) FILTER (WHERE flagged AND NOT inferred)::int AS flagged,
              count(*) FILTER (WHERE payload->'flags' ? 'seal_mismatch')::int AS seals
         FROM scan_events WHERE recorded_at > $1::timestamptz - interval '24 hours' AND voided_at IS NULL`,
      [now],
    ),
    q<{ n: number }>(`SELECT count(*)::int AS n FROM collection_requests WHERE status = 'open'`),
    q<{ soon: number; lapsed: number }>(
      `SELECT count(*) FILTER (WHERE ${testDueSoonSql('next_due', '$1::date')})::int AS soon, count(*) FILTER (WHERE next_due < $1::date)::int AS lapsed
         FROM assets WHERE status NOT IN ('retired', 'missing')`,
      [today],
    ),
    q<{ n: number }>(`SELECT count(*)::int AS n FROM scan_events WHERE action = 'mark_missing' AND user_id IS NULL AND recorded_at > $1::timestamptz - interval '24 hours'`, [now]),
  ]);
  return {
    today,
    overdueByCustomer: overdue,
    flaggedScans: flags[0]?.flagged ?? 0,
    sealMismatches: flags[0]?.seals ?? 0,
    openCollectionRequests: requests[0]?.n ?? 0,
    testsDueSoon: tests[0]?.soon ?? 0,
    testsLapsed: tests[0]?.lapsed ?? 0,
    markedMissing: missing[0]?.n ?? 0,
  };
}

/** Mails every active planner the morning digest. */
export async function runPlannerDigest({ now }: JobContext) {
  const settings = await getSettings();
  const figures = await digestFigures(now);
  const planners = await q<{ name: string; email: string }>(`SELECT name, email FROM users WHERE role = 'planner' AND active ORDER BY id`);
  let sent = 0;
  for (const p of planners) {
    const mail = plannerDigestMail({
      ...figures,
      recipientName: p.name,
      operatorName: settings.operatorName,
      day: formatLongDate(figures.today),
      appUrl: process.env.APP_URL ?? settings.digitalLinkBase,
    });
    const out = await sendMail({ to: p.email, ...mail, kind: 'planner_digest' });
    if (out.status === 'sent') sent += 1;
  }
  return { planners: planners.length, sent };
}
