import { publicEndpoint } from '@/lib/endpoint.server';
import { RESET_REQUEST_ANSWER, resetRequestSchema } from '@/lib/accounts/account-rules';
import { requestPasswordReset } from '@/lib/accounts/accounts.server';

/** "Forgotten password": the same answer whether or not the account exists; the mail goes out after the answer. */
export const POST = publicEndpoint({ body: resetRequestSchema, status: 202 }, async ({ ctx, body }) => {
  await requestPasswordReset(body.email, ctx.locals.clientAddress);
  return { message: RESET_REQUEST_ANSWER };
});
