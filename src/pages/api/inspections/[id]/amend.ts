import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { amendBody } from '@/lib/inspections/inspection-schema';
import { amendInspection } from '@/lib/inspections/inspection-records.server';

/** Correct a record: a new amendment with its reason; the original stays as it was. */
export const POST = endpoint({ capability: 'inspections.record', params: idParams('Inspection'), body: amendBody, status: 201 }, async ({ user, params, body }) =>
  amendInspection(user, params.id, body),
);
