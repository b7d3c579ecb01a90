import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { binTypeCreateSchema } from '@/lib/pool-setup/setup-schemas';
import { createBinType, listBinTypes } from '@/lib/pool-setup/bin-types.server';

/** Every bin type with the number of bins registered under it. */
export const GET = endpoint({ capability: 'sites.manage' }, async () => ({ rows: await listBinTypes() }));

export const POST = endpoint({ capability: 'sites.manage', body: binTypeCreateSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createBinType(body, actorFrom(ctx.locals)),
}));
