import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { getSettings } from '@/lib/settings/settings.server';
import { reuseData } from '@/lib/trips/reuse-data.server';
import { reuseCsv } from '@/lib/trips/reuse-report';
import { parseReportPeriod } from '@/lib/trips/report-period';
import { localDate } from '@/lib/calendar';
import { csvTable } from '@/lib/csv';
import { csvResponse } from '@/lib/http/csv-response';

const query = z
  .object({
    from: text().max(10).optional(),
    to: text().max(10).optional(),
    customer: z.union([z.literal(''), z.coerce.number().int().positive().max(2_147_483_647)]).optional(),
  })
  .strict();

/** The slug of a customer's name for the file name: letters and digits only. */
function slug(name: string): string {
  return (
    name
      .normalize('NFKD')
      .replace(/[^A-Za-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .toLowerCase() || 'customer'
  );
}

/**
 * The reuse report's per-bin rows as CSV, for customers' sustainability reporting:
 * GET /api/fleet/reuse.csv?from=2026-01-01&to=2026-11-30&customer=4. UTF-8 with a byte-order mark, so
 * spreadsheet programs read accented names right; comma-separated, '.' as the decimal point.
 */
export const GET = endpoint({ capability: 'fleet.view', query }, async ({ query }) => {
  const { timeZone } = await getSettings();
  const parsed = parseReportPeriod(query, localDate(new Date(), timeZone));
  if (!parsed.ok) throw new AppError('bad_request', parsed.issues.map((i) => i.message).join(' '), parsed.issues);
  const customerId = typeof query.customer === 'number' ? query.customer : null;
  const data = await reuseData(parsed.period, customerId);
  if (!data) throw new AppError('not_found', 'No customer with that id.');
  const table = reuseCsv(data.bins, parsed.period, data.today, data.scope);
  const who = data.scope.kind === 'customer' ? `-${slug(data.scope.name)}` : '';
  return csvResponse(csvTable(table.fields, table.rows), `reuse-${parsed.period.from}-to-${parsed.period.to}${who}.csv`);
});
