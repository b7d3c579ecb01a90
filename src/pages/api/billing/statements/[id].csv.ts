import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { statementView } from '@/lib/billing/statement-views.server';
import { statementLinesCsv } from '@/lib/billing/statement-csv';
import { csvResponse } from '@/lib/http/csv-response';

/** One statement's lines as CSV (amounts as numbers): GET /api/billing/statements/42.csv. */
export const GET = endpoint({ capability: 'billing.manage', params: idParams('Statement') }, async ({ params }) => {
  const s = await statementView(params.id, { kind: 'operator' });
  return csvResponse(statementLinesCsv(s), `statement-${s.id}-${s.period.from.slice(0, 7)}.csv`);
});
