import { endpoint } from '@/lib/endpoint.server';
import { undoOwnScan } from '@/lib/scans/scan-corrections.server';
import { idParams } from '@/lib/route-params';

/**
 * The person who recorded a scan takes it back, within the operator's undo window and while nothing later
 * is recorded on the bin. Kept as a void with the reason "undone by the person who scanned it".
 */
export const POST = endpoint({ capability: 'scan.record', params: idParams('Scan') }, async ({ ctx, user, params }) => {
  const state = await undoOwnScan(user, params.id, ctx.locals.clientAddress);
  return { undone: params.id, status: state.status };
});
