import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { repairChangeBody } from '@/lib/inspections/repair-schema';
import { updateRepairOrder } from '@/lib/inspections/repairs.server';

/** A planner sets the estimate or where the repair happens. Needs `version`. */
export const PATCH = endpoint({ capability: 'repairs.manage', params: idParams('Repair order'), body: repairChangeBody }, async ({ ctx, params, body }) =>
  updateRepairOrder(actorFrom(ctx.locals), params.id, body),
);
