import { endpoint } from '@/lib/endpoint.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { resendInvitation } from '@/lib/accounts/accounts.server';
import { actorFrom } from '@/lib/audit.server';

/** Mail a fresh invitation link to someone who has not set a password; older links stop working. */
export const POST = endpoint({ capability: 'users.manage' }, async ({ ctx }) =>
  resendInvitation(idParamSchema.parse(ctx.params.id), actorFrom(ctx.locals)),
);
