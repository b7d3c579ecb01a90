import { z } from 'zod';
import { multilineText } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { idParams } from '@/lib/route-params';

const body = z.object({ reason: multilineText().trim().min(5, 'Say why this scan is wrong (at least 5 characters).').max(300) }).strict();

/** Planners and admins void a wrong scan with a reason; the bin's state is rebuilt from the rest of its log. */
export const POST = endpoint({ capability: 'scan.correct', body, params: idParams('Scan') }, async ({ ctx, user, body, params }) => {
  const state = await voidScan(user, params.id, body.reason, ctx.locals.clientAddress);
  return { voided: params.id, status: state.status };
});
