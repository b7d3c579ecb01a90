import { endpoint } from '@/lib/endpoint.server';
import { markReviewed } from '@/lib/scans/scan-review.server';
import { AppError } from '@/lib/api-errors';

/** A planner confirms a flagged scan as right (the alternative is voiding it on the bin page). */
export const POST = endpoint({ capability: 'scan.correct' }, async ({ ctx, user }) => {
  const id = Number(ctx.params.id);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('bad_request', 'Scan ids are positive whole numbers.');
  return markReviewed(user, id, ctx.locals.clientAddress);
});
