import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { amendBody } from '@/lib/inspections/inspection-schema';
import { amendInspection } from '@/lib/inspections/inspection-records.server';

/** Correct a record: a new amendment with its reason; the original stays as it was. */
export const POST = endpoint({ capability: 'inspections.record', body: amendBody, status: 201 }, async ({ ctx, user, body }) => {
  const id = Number(ctx.params.id);
  if (!Number.isInteger(id) || id <= 0 || id > 2_147_483_647) throw new AppError('not_found', 'No such inspection record.');
  return amendInspection(user, id, body);
});
