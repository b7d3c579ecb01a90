import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { siteCreateSchema } from '@/lib/pool-setup/setup-schemas';
import { createSite, listSites } from '@/lib/pool-setup/sites.server';

/** Every site: depots, repair shops, recycling points, customers' sites. */
export const GET = endpoint({ capability: 'sites.manage' }, async () => ({ rows: await listSites() }));

export const POST = endpoint({ capability: 'sites.manage', body: siteCreateSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createSite(body, actorFrom(ctx.locals)),
}));
