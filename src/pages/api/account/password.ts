import { publicEndpoint } from '@/lib/endpoint.server';
import { setPasswordSchema } from '@/lib/accounts/account-rules';
import { setPasswordWithLink } from '@/lib/accounts/accounts.server';

/** Set a password with an invitation or reset link (public: the link is the credential). */
export const POST = publicEndpoint({ body: setPasswordSchema }, async ({ ctx, body }) => {
  const { purpose } = await setPasswordWithLink(body.token, body.password, ctx.locals.clientAddress);
  return { purpose, next: '/login?password_set=1' };
});
