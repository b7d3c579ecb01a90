import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { purchaseOrderSchema } from '@/lib/liners/liner-schemas';
import { createPurchaseOrder } from '@/lib/liners/purchase-orders.server';

/** A suggested order becomes a purchase order: POST { depotSiteId, specId, quantity, note? }. */
export const POST = endpoint({ capability: 'liners.manage', body: purchaseOrderSchema, status: 201 }, async ({ ctx, body }) => ({
  order: await createPurchaseOrder(actorFrom(ctx.locals), body),
}));
