import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { repairWorkBody } from '@/lib/inspections/repair-schema';
import { recordRepairWork } from '@/lib/inspections/repairs.server';

/** Work done on an open repair order (parts, labour hours, cost, photos): a new entry, never edited. */
export const POST = endpoint({ capability: 'repairs.work', params: idParams('Repair order'), body: repairWorkBody, status: 201 }, async ({ user, params, body }) =>
  recordRepairWork(user, params.id, body),
);
