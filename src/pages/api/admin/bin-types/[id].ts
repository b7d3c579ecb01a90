import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { binTypePatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateBinType } from '@/lib/pool-setup/bin-types.server';

/** Change a bin type; the asset type and inspection policy are fixed once bins of the type exist. Needs `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: binTypePatchSchema }, async ({ ctx, body }) => ({
  row: await updateBinType(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
