import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { checkoutBody } from '@/lib/billing/billing-forms';
import { startCheckout } from '@/lib/billing/payments.server';
import { customerStatementScope } from '@/lib/billing/statement-scope.server';

/** A customer pays (part of) their invoice online: POST /api/portal/invoices/7/checkout { amount } → { url } of the pay page. */
export const POST = endpoint({ capability: 'billing.own', params: idParams('Invoice'), body: checkoutBody, status: 201 }, async ({ user, params, body }) =>
  startCheckout(params.id, customerStatementScope(user), body.amount, user.id),
);
