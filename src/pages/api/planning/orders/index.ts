import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { actorFrom } from '@/lib/audit.server';
import { orderInputSchema, parseOrderListQuery } from '@/lib/planning/order-forms';
import { createOrder, listOrders } from '@/lib/planning/orders.server';

/** One page of hire orders: GET /api/planning/orders?status=demand&customer=4&sort=wanted&page=2. */
export const GET = endpoint({ capability: 'orders.view' }, async ({ ctx }) => {
  const parsed = parseOrderListQuery(ctx.url.searchParams);
  if (!parsed.ok) throw new AppError('bad_request', parsed.issues.map((i) => i.message).join(' '), parsed.issues);
  return listOrders(parsed.query);
});

/** Enter a hire order, as a draft or confirmed at once. */
export const POST = endpoint({ capability: 'orders.edit', body: orderInputSchema, status: 201 }, async ({ ctx, body }) => {
  return createOrder(body, actorFrom(ctx.locals));
});
