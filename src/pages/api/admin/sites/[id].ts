import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParamSchema } from '@/lib/accounts/people-schemas';
import { sitePatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateSite } from '@/lib/pool-setup/sites.server';

/** Change a site's code, name, kind, address, coordinates or active flag. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: sitePatchSchema }, async ({ ctx, body }) => ({
  row: await updateSite(idParamSchema.parse(ctx.params.id), body, actorFrom(ctx.locals)),
}));
