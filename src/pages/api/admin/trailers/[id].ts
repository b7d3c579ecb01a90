import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { trailerPatchSchema } from '@/lib/pool-setup/setup-schemas';
import { updateTrailer } from '@/lib/pool-setup/trailers.server';

/** Change a trailer's name, inside size, payload or active flag. Needs the row's current `version`. */
export const PATCH = endpoint({ capability: 'sites.manage', body: trailerPatchSchema, params: idParams('Trailer') }, async ({ ctx, body, params }) => ({
  row: await updateTrailer(params.id, body, actorFrom(ctx.locals)),
}));
