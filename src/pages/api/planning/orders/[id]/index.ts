import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { parseOrderId } from '@/lib/planning/order-forms';
import { orderView } from '@/lib/planning/orders.server';

/** One order with its progress, loads and the tariff in force at its wanted date. */
export const GET = endpoint({ capability: 'orders.view' }, async ({ ctx }) => {
  const id = parseOrderId(ctx.params.id);
  const view = id === null ? null : await orderView(id);
  if (!view) throw new AppError('not_found', 'No such hire order.');
  return view;
});
