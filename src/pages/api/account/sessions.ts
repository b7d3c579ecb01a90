import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { endAllSessions } from '@/lib/session/session-ends.server';

/** The signed-in person ends all their own sessions, this one included (a lost phone, a shared desk). */
export const POST = endpoint({ capability: 'account.own' }, async ({ ctx, user }) => endAllSessions(user.id, actorFrom(ctx.locals)));
