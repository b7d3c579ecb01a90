import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { customerCreateSchema } from '@/lib/pool-setup/setup-schemas';
import { createCustomer, listCustomers } from '@/lib/pool-setup/customers.server';

/** Every customer with the hire terms in force today. */
export const GET = endpoint({ capability: 'sites.manage' }, async () => ({ rows: await listCustomers() }));

/** A new customer and its first tariff (valid from today). */
export const POST = endpoint({ capability: 'sites.manage', body: customerCreateSchema, status: 201 }, async ({ ctx, body }) => ({
  row: await createCustomer(body, actorFrom(ctx.locals)),
}));
