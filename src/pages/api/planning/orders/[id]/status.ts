import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { actorFrom } from '@/lib/audit.server';
import { orderCommandSchema, parseOrderId } from '@/lib/planning/order-forms';
import { commandOrder } from '@/lib/planning/orders.server';

/** Confirm, cancel or close an order: POST { command, version } (the version the planner saw). */
export const POST = endpoint({ capability: 'orders.edit', body: orderCommandSchema }, async ({ ctx, body }) => {
  const id = parseOrderId(ctx.params.id);
  if (id === null) throw new AppError('not_found', 'No such hire order.');
  return commandOrder(id, body, actorFrom(ctx.locals));
});
