import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { setMailOptOut } from '@/lib/accounts/mail-preferences.server';

const body = z.object({ optOut: z.boolean({ invalid_type_error: 'optOut is true or false.', required_error: 'optOut is true or false.' }) }).strict();

/** The signed-in person turns non-essential mail (reminders) off or on: PUT /api/account/mail { optOut }. */
export const PUT = endpoint({ capability: 'account.own', body }, async ({ ctx, user, body: input }) => setMailOptOut(user.id, input.optOut, actorFrom(ctx.locals)));
