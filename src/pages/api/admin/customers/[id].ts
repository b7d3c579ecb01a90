import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { customerPatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateCustomer } from '@/lib/pool-setup/customers.server';

/** Rename, change the contact, deactivate or reactivate. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: customerPatchSchema }, async ({ ctx, body }) => ({
  row: await updateCustomer(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
