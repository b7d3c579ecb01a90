import { endpoint } from '@/lib/endpoint.server';
import { bulkReview } from '@/lib/scans/flag-review';
import { reviewFlaggedScans } from '@/lib/scans/scan-review.server';

/**
 * A planner decides on many flagged scans at once: POST /api/fleet/flags/review { ids, decision: confirm|void,
 * reason } — each scan is confirmed or voided on its own record; the answer says how each went.
 */
export const POST = endpoint({ capability: 'scan.correct', body: bulkReview }, async ({ ctx, user, body }) => reviewFlaggedScans(user, body, ctx.locals.clientAddress));
