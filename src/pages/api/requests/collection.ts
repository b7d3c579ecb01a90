import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { plannerCollectionRequest } from '@/lib/requests/report-forms';
import { recordPlannerCollection } from '@/lib/requests/requests.server';

/** A planner records a collection request for a customer site (taken on the phone): POST /api/requests/collection. */
export const POST = endpoint({ capability: 'requests.view', body: plannerCollectionRequest, status: 201 }, async ({ ctx, body }) => {
  const created = await recordPlannerCollection(body, actorFrom(ctx.locals));
  return { id: created.id };
});
