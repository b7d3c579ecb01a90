import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { issueStatementBody } from '@/lib/billing/billing-forms';
import { issueStatement } from '@/lib/billing/statements.server';

/** Issue a customer's statement for a month that is over: POST /api/billing/statements { customerId, month }. */
export const POST = endpoint({ capability: 'billing.manage', body: issueStatementBody, status: 201 }, async ({ ctx, body }) => {
  return issueStatement(body.customerId, body.month, actorFrom(ctx.locals));
});
