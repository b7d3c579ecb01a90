import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { versionSchema } from '@/lib/liners/liner-schemas';
import { closePurchaseOrder } from '@/lib/liners/purchase-orders.server';

/** Close an order short, or cancel one nothing was received on: POST { version }. */
export const POST = endpoint({ capability: 'liners.manage', body: versionSchema, params: idParams('Purchase order') }, async ({ ctx, body, params }) => ({
  order: await closePurchaseOrder(actorFrom(ctx.locals), params.id, body),
}));
