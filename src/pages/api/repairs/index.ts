import { endpoint } from '@/lib/endpoint.server';
import { openRepairBody } from '@/lib/inspections/repair-schema';
import { openRepair } from '@/lib/inspections/repairs.server';

/** A planner opens a repair order: from a damage report, or on a bin with the fault described. */
export const POST = endpoint({ capability: 'repairs.manage', body: openRepairBody, status: 201 }, async ({ user, body }) => openRepair(user, body));
