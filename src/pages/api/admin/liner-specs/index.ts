import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { specSchema } from '@/lib/liners/liner-schemas';
import { createSpec, listSpecs } from '@/lib/liners/liner-specs.server';

/** Every liner spec with the bin types it fits and the number of lots received against it. */
export const GET = endpoint({ capability: 'liners.manage' }, async () => ({ rows: await listSpecs() }));

export const POST = endpoint({ capability: 'liners.manage', body: specSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createSpec(body, actorFrom(ctx.locals)),
}));
