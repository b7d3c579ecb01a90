import { endpoint } from '@/lib/endpoint.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { actorFrom } from '@/lib/audit.server';
import { endAllSessions } from '@/lib/session/session-ends.server';

/** Ends every session the person has, on every device (they sign in again). */
export const POST = endpoint({ capability: 'users.manage' }, async ({ ctx }) =>
  endAllSessions(idParamSchema.parse(ctx.params.id), actorFrom(ctx.locals)),
);
