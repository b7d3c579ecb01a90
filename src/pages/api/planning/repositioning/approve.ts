import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { PLAN_MIP_REL_GAP, PLAN_TIME_LIMIT_SECONDS, planSettingsSchema } from '@/lib/planning/repositioning-settings';
import { approveRepositioning } from '@/lib/planning/repositioning-orders.server';

/**
 * Approve the plan for these settings: POST { horizonDays, costPerKm, roadFactor }. The plan is solved again here and
 * every lane becomes work — repositioning orders (depot → depot) and truck runs (customer site → depot).
 */
export const POST = endpoint({ capability: 'orders.edit', body: planSettingsSchema.strict(), status: 201 }, async ({ ctx, body }) =>
  approveRepositioning({ ...body, timeLimitSeconds: PLAN_TIME_LIMIT_SECONDS, mipRelGap: PLAN_MIP_REL_GAP }, actorFrom(ctx.locals)),
);
