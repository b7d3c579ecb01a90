import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { supplierSchema } from '@/lib/liners/liner-schemas';
import { createSupplier, listSuppliers } from '@/lib/liners/liner-specs.server';

/** Every liner supplier with its terms. */
export const GET = endpoint({ capability: 'liners.manage' }, async () => ({ rows: await listSuppliers() }));

export const POST = endpoint({ capability: 'liners.manage', body: supplierSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createSupplier(body, actorFrom(ctx.locals)),
}));
