import { endpoint } from '../../../../lib/server/endpoint';
import { inviteSchema } from '../../../../lib/people-schemas';
import { listPeople } from '../../../../lib/server/people';
import { invitePerson } from '../../../../lib/server/accounts';
import { actorFrom } from '../../../../lib/server/audit';

/** Everyone who signs in. */
export const GET = endpoint({ capability: 'users.manage' }, async () => ({ people: await listPeople() }));

/** Invite someone: the account is created without a password and a one-time link is mailed. */
export const POST = endpoint({ capability: 'users.manage', body: inviteSchema, status: 201 }, async ({ ctx, body }) =>
  invitePerson(body, actorFrom(ctx.locals)),
);
