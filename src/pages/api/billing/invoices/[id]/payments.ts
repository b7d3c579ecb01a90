import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { paymentBody } from '@/lib/billing/billing-forms';
import { recordBankTransfer } from '@/lib/billing/invoices.server';

/** An admin records a bank transfer received: POST /api/billing/invoices/7/payments { amount: "250.00", paidOn }. */
export const POST = endpoint({ capability: 'billing.manage', params: idParams('Invoice'), body: paymentBody, status: 201 }, async ({ ctx, params, body }) =>
  recordBankTransfer(params.id, body, actorFrom(ctx.locals)),
);
