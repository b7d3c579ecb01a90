import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { trailerCreateSchema } from '@/lib/pool-setup/setup-schemas';
import { createTrailer, listTrailers } from '@/lib/pool-setup/trailers.server';

/** Every trailer, in use first. */
export const GET = endpoint({ capability: 'sites.manage' }, async () => ({ rows: await listTrailers() }));

export const POST = endpoint({ capability: 'sites.manage', body: trailerCreateSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createTrailer(body, actorFrom(ctx.locals)),
}));
