import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { creditNoteBody } from '@/lib/billing/billing-forms';
import { creditInvoice } from '@/lib/billing/invoices.server';

/** A credit note against an invoice, with its reason: POST /api/billing/invoices/7/credit-notes { amount: "12.00", reason }. */
export const POST = endpoint({ capability: 'billing.manage', params: idParams('Invoice'), body: creditNoteBody, status: 201 }, async ({ ctx, params, body }) =>
  creditInvoice(params.id, body, actorFrom(ctx.locals)),
);
