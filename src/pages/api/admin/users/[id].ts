import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { personPatchSchema } from '@/lib/accounts/people-schemas';
import { updatePerson } from '@/lib/accounts/people.server';
import { actorFrom } from '@/lib/audit.server';

/** Change role, home depot, inspector flag, or deactivate / reactivate. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'users.manage', body: personPatchSchema, params: idParams('Person') }, async ({ ctx, body, params }) => ({
  person: await updatePerson(params.id, body, actorFrom(ctx.locals)),
}));
