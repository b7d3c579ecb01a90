import { z } from 'zod';
import { text, inDateRange, DATE_RANGE_MESSAGE } from '@/lib/text-input';
import { isLocalDate } from '@/lib/calendar';
import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { actorFrom } from '@/lib/audit.server';
import { changeRequestStatus } from '@/lib/requests/requests.server';
import { isStatusOf } from '@/lib/requests/request-status';
import { recordId } from '@/lib/route-params';

const params = z.object({
  kind: z.enum(['collection', 'damage'], { errorMap: () => ({ message: 'Requests are either "collection" or "damage".' }) }),
  id: recordId('Request'),
});

const body = z.object({
  status: text().min(1).max(20),
  version: z.number().int().min(0),
  /** Scheduling a collection: the day of the run. */
  plannedFor: text().refine(isLocalDate, 'must be a date like 2027-01-14').refine(inDateRange, DATE_RANGE_MESSAGE).nullish(),
});

/**
 * A planner moves a collection request or damage report on:
 *   PATCH /api/requests/collection/<id>  { status, version }
 *   PATCH /api/requests/damage/<id>      { status, version }
 * A stale version gets 409 changed_meanwhile; a step the status table does not
 * allow gets 422 transition_refused with the reason.
 */
export const PATCH = endpoint({ capability: 'requests.view', body, params }, async ({ ctx, body: change, params: { kind, id } }) => {
  if (!isStatusOf(kind, change.status)) {
    throw new AppError('validation_failed', `"${change.status}" is not a status of a ${kind === 'collection' ? 'collection request' : 'damage report'}.`, [
      { path: 'status', message: 'Unknown status.' },
    ]);
  }
  return changeRequestStatus(
    kind,
    id,
    { status: change.status, version: change.version, ...(change.plannedFor !== undefined ? { plannedFor: change.plannedFor } : {}) },
    actorFrom(ctx.locals),
  );
});
