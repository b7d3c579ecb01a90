import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { mailPurchaseOrder } from '@/lib/liners/purchase-orders.server';

/** Mail the purchase order to the supplier's order address (through the outbox). */
export const POST = endpoint({ capability: 'liners.manage', params: idParams('Purchase order') }, async ({ ctx, params }) => ({
  order: await mailPurchaseOrder(actorFrom(ctx.locals), params.id),
}));
