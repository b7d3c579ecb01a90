import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { retireBody } from '@/lib/inspections/repair-schema';
import { retireFromRepair } from '@/lib/inspections/repairs.server';

/** A planner retires the order's bin (the retire scan); the order ends as retired. Needs `version`. */
export const POST = endpoint({ capability: 'repairs.manage', params: idParams('Repair order'), body: retireBody }, async ({ user, params, body }) =>
  retireFromRepair(user, params.id, body),
);
