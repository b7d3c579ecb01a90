import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { customerPatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateCustomer } from '@/lib/pool-setup/customers.server';

/** Rename, change the contact, deactivate or reactivate. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: customerPatchSchema, params: idParams('Customer') }, async ({ ctx, body, params }) => ({
  row: await updateCustomer(params.id, body, actorFrom(ctx.locals)),
}));
