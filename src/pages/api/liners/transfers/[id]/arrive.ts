import { endpoint } from '@/lib/endpoint.server';
import { idParams } from '@/lib/route-params';
import { receiveTransfer } from '@/lib/liners/liner-ledger.server';
import { checkArrivalHere, homeDepotOf } from '@/lib/liners/yard-stock.server';

/** The caller's depot books a transfer's arrival ([id] = the sent move). */
export const POST = endpoint({ capability: 'liners.move', params: idParams('Transfer') }, async ({ user, params }) => {
  await checkArrivalHere(params.id, homeDepotOf(user!));
  return { arrival: { id: await receiveTransfer({ id: user!.id }, params.id) } };
});
