import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { supplierSchema } from '@/lib/liners/liner-schemas';
import { updateSupplier } from '@/lib/liners/liner-specs.server';

/** Save the supplier's terms; `version` must be the one the form was loaded with. */
export const PUT = endpoint({ capability: 'liners.manage', body: supplierSchema }, async ({ ctx, body }) => ({
  row: await updateSupplier(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
