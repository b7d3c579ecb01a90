import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { withdrawPlan } from '@/lib/planning/repositioning-orders.server';

/** Withdraw what is left of an approved plan: its open orders and the runs nothing was received against are cancelled. */
export const POST = endpoint({ capability: 'orders.edit', params: idParams('Plan') }, async ({ ctx, params }) => withdrawPlan(params.id, actorFrom(ctx.locals)));
