import type { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { RESET_REQUEST_ANSWER, resetRequestSchema } from '@/lib/accounts/account-rules';
import { requestPasswordReset } from '@/lib/accounts/accounts.server';

/** "Forgotten password": the same answer whether or not the account exists; the mail goes out after the answer. */
// Public routes name all three type arguments: `Pub = true` admits capability 'public'.
export const POST = endpoint<typeof resetRequestSchema, z.ZodUndefined, true>({ capability: 'public', body: resetRequestSchema, status: 202 }, async ({ ctx, body }) => {
  await requestPasswordReset(body.email, ctx.locals.clientAddress);
  return { message: RESET_REQUEST_ANSWER };
});
