import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { sendKits } from '@/lib/liners/liner-ledger.server';
import { checkOrderHere, homeDepotOf } from '@/lib/liners/yard-stock.server';

const body = z
  .object({
    lotId: z.number().int().positive().max(2_147_483_647),
    hireOrderId: z.number({ invalid_type_error: 'Choose the hire order.' }).int().positive().max(2_147_483_647),
    quantity: z.number({ invalid_type_error: 'Enter the number of liners.' }).int().min(1, 'Send at least one liner.').max(10_000),
    foldedBins: z.number({ invalid_type_error: 'Enter the folded bins they go with.' }).int().min(1, 'Kits go with at least one folded bin.').max(1_000),
  })
  .strict();

/** Liner kits sent from the caller's home depot with folded bins on a hire order, for the customer to fit. */
export const POST = endpoint({ capability: 'liners.move', body, status: 201 }, async ({ user, body }) => {
  const siteId = homeDepotOf(user!);
  await checkOrderHere(body.hireOrderId, siteId);
  return { kits: { id: await sendKits({ id: user!.id }, { lotId: body.lotId, siteId, hireOrderId: body.hireOrderId, quantity: body.quantity, foldedBins: body.foldedBins }) } };
});
