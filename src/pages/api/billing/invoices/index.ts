import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { issueInvoiceBody } from '@/lib/billing/billing-forms';
import { issueInvoice } from '@/lib/billing/invoices.server';

/** Invoice an issued statement (once; mailed to the customer): POST /api/billing/invoices { statementId }. */
export const POST = endpoint({ capability: 'billing.manage', body: issueInvoiceBody, status: 201 }, async ({ ctx, body }) => issueInvoice(body.statementId, actorFrom(ctx.locals)));
