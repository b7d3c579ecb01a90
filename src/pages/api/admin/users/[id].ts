import { endpoint } from '../../../../lib/server/endpoint';
import { idParamSchema, personPatchSchema } from '../../../../lib/people-schemas';
import { updatePerson } from '../../../../lib/server/people';
import { actorFrom } from '../../../../lib/server/audit';

/** Change role, home depot, inspector flag, or deactivate / reactivate. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'users.manage', body: personPatchSchema }, async ({ ctx, body }) => ({
  person: await updatePerson(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
