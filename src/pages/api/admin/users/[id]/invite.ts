import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { resendInvitation } from '@/lib/accounts/accounts.server';
import { actorFrom } from '@/lib/audit.server';

/** Mail a fresh invitation link to someone who has not set a password; older links stop working. */
export const POST = endpoint({ capability: 'users.manage', params: idParams('Person') }, async ({ ctx, params }) => resendInvitation(params.id, actorFrom(ctx.locals)));
