import { endpoint } from '@/lib/endpoint.server';
import { undoOwnScan } from '@/lib/scans/scan-corrections.server';
import { AppError } from '@/lib/api-errors';

/**
 * The person who recorded a scan takes it back, within the operator's undo window and while nothing later
 * is recorded on the bin. Kept as a void with the reason "undone by the person who scanned it".
 */
export const POST = endpoint({ capability: 'scan.record' }, async ({ ctx, user }) => {
  const id = Number(ctx.params.id);
  if (!Number.isInteger(id) || id <= 0 || id > Number.MAX_SAFE_INTEGER) throw new AppError('bad_request', 'Scan ids are positive whole numbers.');
  const state = await undoOwnScan(user, id, ctx.locals.clientAddress);
  return { undone: id, status: state.status };
});
