import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { monthQuery } from '@/lib/billing/billing-forms';
import { billingMonth, lastClosedMonth } from '@/lib/billing/statement-input';
import { accountingCsv } from '@/lib/billing/statement-csv';
import { listStatements } from '@/lib/billing/statement-views.server';
import { csvResponse } from '@/lib/http/csv-response';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';

/** The month's issued statements for the bookkeeping, one row each: GET /api/billing/accounting.csv?month=2027-03. */
export const GET = endpoint({ capability: 'billing.manage', query: monthQuery }, async ({ query }) => {
  const { timeZone } = await getSettings();
  const month = query.month ?? lastClosedMonth(localDate(new Date(), timeZone));
  const period = billingMonth(month);
  if (!period) throw new AppError('validation_failed', 'Give the month as YYYY-MM, e.g. 2027-03.');
  const rows = (await listStatements({ kind: 'operator' })).filter((s) => s.period.from === period.from);
  return csvResponse(accountingCsv(rows.map((s) => ({ ...s, issuedOn: localDate(s.issuedAt, timeZone) }))), `statements-${month}.csv`);
});
