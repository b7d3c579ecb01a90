import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { lotStatusSchema } from '@/lib/liners/liner-schemas';
import { setLotStatus } from '@/lib/liners/liner-recall.server';

/** Hold, recall or release a liner lot: POST { action, reason, version }. Fits from it stop at once. */
export const POST = endpoint({ capability: 'liners.manage', body: lotStatusSchema, params: idParams('Liner lot') }, async ({ ctx, body, params }) => ({
  lot: await setLotStatus(actorFrom(ctx.locals), params.id, body),
}));
