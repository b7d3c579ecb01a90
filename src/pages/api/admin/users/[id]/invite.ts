import { endpoint } from '../../../../../lib/server/endpoint';
import { idParamSchema } from '../../../../../lib/people-schemas';
import { resendInvitation } from '../../../../../lib/server/accounts';
import { actorFrom } from '../../../../../lib/server/audit';

/** Mail a fresh invitation link to someone who has not set a password; older links stop working. */
export const POST = endpoint({ capability: 'users.manage' }, async ({ ctx }) =>
  resendInvitation(idParamSchema.parse(ctx.params.id), actorFrom(ctx.locals)),
);
