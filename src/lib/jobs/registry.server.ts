// Scheduled work, run on a PostgreSQL-backed queue (pg-boss) so it fires once
// however many app servers or workers run. Each job is a plain async function
// of a clock, so tests (and the admin "run now") call it directly at a fixed time.
import { runMissingBinRule } from './missing-bins.server';
import { runPlannerDigest } from './planner-digest.server';
import { deleteExpiredSessionEnds } from '@/lib/session/session-ends.server';
import { runCountDueReminders, runOverdueReminders } from '@/lib/portal/customer-reminders.server';
import { runReorderAlerts } from '@/lib/liners/reorder-alerts.server';
import { runPaymentReminders } from '@/lib/billing/payment-reminders.server';
import { runTariffTermsSync } from '@/lib/planning/tariffs.server';

export interface JobContext {
  now: Date;
}

export interface JobDefinition {
  name: string;
  /** Cron in the operator's time zone. */
  cron: string;
  description: string;
  run: (ctx: JobContext) => Promise<Record<string, unknown>>;
}

export const JOBS: readonly JobDefinition[] = [
  { name: 'missing-bin-rule', cron: '15 2 * * *', description: 'Marks missing the bins out of the depots that nobody scanned for 120 days.', run: runMissingBinRule },
  { name: 'planner-digest', cron: '0 7 * * 1-5', description: 'Mails planners what needs a decision today.', run: runPlannerDigest },
  {
    name: 'overdue-return-reminders',
    cron: '30 8 * * 1-5',
    description: 'Mails each customer contact, at most once a week, every bin of theirs past its free days by the set number of days.',
    run: runOverdueReminders,
  },
  {
    name: 'count-due-reminders',
    cron: '0 8 * * *',
    description: 'Mails each customer contact, once a month, the sites whose monthly count is still to confirm.',
    run: runCountDueReminders,
  },
  {
    name: 'liner-reorder-alerts',
    cron: '20 6-18 * * 1-6',
    description: 'Mails planners once when a depot’s liner stock of a spec falls below its reorder point (again only after it recovered).',
    run: runReorderAlerts,
  },
  {
    name: 'payment-reminders',
    cron: '45 8 * * 1-5',
    description: 'Mails each customer, then weekly, its invoices still open the set number of days after their due date.',
    run: runPaymentReminders,
  },
  {
    name: 'tariff-terms',
    cron: '5 0 * * *',
    description: 'Copies the hire terms of tariffs that take effect today onto their customers (free days for the overdue rule).',
    run: runTariffTermsSync,
  },
  { name: 'ended-sessions-cleanup', cron: '40 3 * * *', description: 'Forgets signed-out sessions whose cookies have all expired.', run: deleteExpiredSessionEnds },
];

function jobByName(name: string): JobDefinition | undefined {
  return JOBS.find((j) => j.name === name);
}

/** Runs a job now, at the given clock (tests, and the admin's "run now"). */
export async function runJobNow(name: string, ctx: JobContext = { now: new Date() }) {
  const job = jobByName(name);
  if (!job) throw new Error(`No job named ${name}`);
  return job.run(ctx);
}
