import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { statementView } from '@/lib/billing/statement-views.server';
import { customerStatementScope } from '@/lib/billing/statement-scope.server';
import { statementLinesCsv } from '@/lib/billing/statement-csv';
import { csvResponse } from '@/lib/http/csv-response';

/** A customer's own statement as CSV: GET /api/portal/statements/42.csv (another organisation's: 404). */
export const GET = endpoint({ capability: 'billing.own', params: idParams('Statement') }, async ({ ctx, params }) => {
  const s = await statementView(params.id, customerStatementScope(ctx.locals.user!));
  return csvResponse(statementLinesCsv(s), `statement-${s.id}-${s.period.from.slice(0, 7)}.csv`);
});
