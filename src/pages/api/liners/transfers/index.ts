import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { sendTransfer } from '@/lib/liners/liner-ledger.server';
import { homeDepotOf } from '@/lib/liners/yard-stock.server';

const body = z
  .object({
    lotId: z.number().int().positive().max(2_147_483_647),
    toSiteId: z.number({ invalid_type_error: 'Choose the depot they go to.' }).int().positive().max(2_147_483_647),
    quantity: z.number({ invalid_type_error: 'Enter the number of liners.' }).int().min(1, 'Send at least one liner.').max(100_000),
  })
  .strict();

/** Liners sent from the caller's home depot to another; in transit until that depot books them in. */
export const POST = endpoint({ capability: 'liners.move', body, status: 201 }, async ({ user, body }) => ({
  transfer: { id: await sendTransfer({ id: user!.id }, { lotId: body.lotId, fromSiteId: homeDepotOf(user!), toSiteId: body.toSiteId, quantity: body.quantity }) },
}));
