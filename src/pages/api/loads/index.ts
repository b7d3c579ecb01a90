import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { startLoad } from '@/lib/loads/load-service.server';

const body = z
  .object({
    purpose: z.enum(['hire', 'transfer']),
    hireOrderId: z.number().int().positive().optional(),
    destinationSiteId: z.number().int().positive().optional(),
    depotSiteId: z.number().int().positive().optional(),
    targetCount: z.number().int().min(1).max(200).optional(),
  })
  .strict()
  .refine((b) => (b.purpose === 'hire' ? b.hireOrderId !== undefined : b.destinationSiteId !== undefined), {
    message: 'A hire load needs its hire order; a transfer needs the depot it goes to.',
  });

/** Start (or resume) a load at the user's depot. */
export const POST = endpoint({ capability: 'loads.manage', body, status: 201 }, async ({ user, body }) => {
  const load = await startLoad(user, body);
  return { reference: load.reference, id: load.id, targetCount: load.targetCount };
});
