import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { lotNoticeSchema } from '@/lib/liners/liner-schemas';
import { sendLotNotice } from '@/lib/liners/liner-recall.server';

/** Mail a notice about the lot to every customer who received its liners, and record who received it. */
export const POST = endpoint({ capability: 'liners.manage', body: lotNoticeSchema, params: idParams('Liner lot') }, async ({ ctx, body, params }) => ({
  notice: await sendLotNotice(actorFrom(ctx.locals), params.id, body),
}));
