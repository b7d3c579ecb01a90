import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { specSchema } from '@/lib/liners/liner-schemas';
import { updateSpec } from '@/lib/liners/liner-specs.server';

/** Save the whole spec (and the bin types it fits); `version` must be the one the form was loaded with. */
export const PUT = endpoint({ capability: 'liners.manage', body: specSchema, params: idParams('Liner spec') }, async ({ ctx, body, params }) => ({
  row: await updateSpec(params.id, body, actorFrom(ctx.locals)),
}));
