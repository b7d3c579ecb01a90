import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { supplierSchema } from '@/lib/liners/liner-schemas';
import { updateSupplier } from '@/lib/liners/liner-specs.server';

/** Save the supplier's terms; `version` must be the one the form was loaded with. */
export const PUT = endpoint({ capability: 'liners.manage', body: supplierSchema, params: idParams('Supplier') }, async ({ ctx, body, params }) => ({
  row: await updateSupplier(params.id, body, actorFrom(ctx.locals)),
}));
