import { endpoint } from '@/lib/endpoint.server';
import { idParamSchema, personPatchSchema } from '@/lib/accounts/people-schemas';
import { updatePerson } from '@/lib/accounts/people.server';
import { actorFrom } from '@/lib/audit.server';

/** Change role, home depot, inspector flag, or deactivate / reactivate. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'users.manage', body: personPatchSchema }, async ({ ctx, body }) => ({
  person: await updatePerson(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
