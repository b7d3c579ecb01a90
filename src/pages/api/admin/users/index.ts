import { endpoint } from '@/lib/endpoint.server';
import { inviteSchema } from '@/lib/accounts/people-schemas';
import { listPeople } from '@/lib/accounts/people.server';
import { invitePerson } from '@/lib/accounts/accounts.server';
import { actorFrom } from '@/lib/audit.server';

/** Everyone who signs in. */
export const GET = endpoint({ capability: 'users.manage' }, async () => ({ people: await listPeople() }));

/** Invite someone: the account is created without a password and a one-time link is mailed. */
export const POST = endpoint({ capability: 'users.manage', body: inviteSchema, status: 201 }, async ({ ctx, body }) => invitePerson(body, actorFrom(ctx.locals)));
