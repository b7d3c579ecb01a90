import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { actorFrom } from '@/lib/audit.server';
import { endAllSessions } from '@/lib/session/session-ends.server';

/** Ends every session the person has, on every device (they sign in again). */
export const POST = endpoint({ capability: 'users.manage', params: idParams('Person') }, async ({ ctx, params }) => endAllSessions(params.id, actorFrom(ctx.locals)));
