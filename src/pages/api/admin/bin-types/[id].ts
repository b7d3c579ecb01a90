import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { binTypePatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateBinType } from '@/lib/pool-setup/bin-types.server';

/** Change a bin type; the asset type and inspection policy are fixed once bins of the type exist. Needs `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: binTypePatchSchema, params: idParams('Bin type') }, async ({ ctx, body, params }) => ({
  row: await updateBinType(params.id, body, actorFrom(ctx.locals)),
}));
