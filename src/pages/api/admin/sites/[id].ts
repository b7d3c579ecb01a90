import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { sitePatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateSite } from '@/lib/pool-setup/sites.server';

/** Change a site's code, name, kind, address, coordinates or active flag. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: sitePatchSchema, params: idParams('Site') }, async ({ ctx, body, params }) => ({
  row: await updateSite(params.id, body, actorFrom(ctx.locals)),
}));
