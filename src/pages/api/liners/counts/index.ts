import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { multilineText } from '@/lib/text-input';
import { recordCount } from '@/lib/liners/liner-ledger.server';
import { homeDepotOf } from '@/lib/liners/yard-stock.server';

const body = z
  .object({
    lotId: z.number().int().positive().max(2_147_483_647),
    counted: z.number({ invalid_type_error: 'Enter the liners you counted.' }).int('Count whole liners.').min(0, 'A count is 0 or more.').max(100_000),
    note: multilineText().trim().max(500).optional(),
  })
  .strict();

/** A stock count of one lot at the caller's home depot: the difference to the ledger becomes an adjustment. */
export const POST = endpoint({ capability: 'liners.move', body, status: 201 }, async ({ user, body }) => ({
  count: await recordCount({ id: user!.id }, { lotId: body.lotId, siteId: homeDepotOf(user!), counted: body.counted, note: body.note ?? null }),
}));
