import { z } from 'zod';
import { multilineText } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { AppError } from '@/lib/api-errors';

const body = z.object({ reason: multilineText().trim().min(5, 'Say why this scan is wrong (at least 5 characters).').max(300) }).strict();

/** Planners and admins void a wrong scan with a reason; the bin's state is rebuilt from the rest of its log. */
export const POST = endpoint({ capability: 'scan.correct', body }, async ({ ctx, user, body }) => {
  const id = Number(ctx.params.id);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('bad_request', 'Scan ids are positive whole numbers.');
  const state = await voidScan(user, id, body.reason, ctx.locals.clientAddress);
  return { voided: id, status: state.status };
});
