import { endpoint } from '@/lib/endpoint.server';
import { markReviewed } from '@/lib/scans/scan-review.server';
import { idParams } from '@/lib/route-params';

/** A planner confirms a flagged scan as right (the alternative is voiding it on the bin page). */
export const POST = endpoint({ capability: 'scan.correct', params: idParams('Scan') }, async ({ ctx, user, params }) => markReviewed(user, params.id, ctx.locals.clientAddress));
