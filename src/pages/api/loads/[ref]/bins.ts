import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { addBinToLoad, loadIdByReference } from '@/lib/loads/load-service.server';
import { findBin } from '@/lib/bins/bin-lookup.server';
import { AppError } from '@/lib/api-errors';

const body = z
  .object({
    clientEventId: text().uuid(),
    grai: text().trim().min(1).max(300).optional(),
    assetId: z.number().int().positive().optional(),
    occurredAt: text().datetime({ offset: true }).optional(),
    /** A planner's reason to send a bin whose test would run out while it is likely still out (recorded). */
    overrideReason: multilineText().trim().min(5).max(500).optional(),
  })
  .strict()
  .refine((b) => b.grai !== undefined || b.assetId !== undefined, { message: 'Say which bin: grai or assetId' });

/** One bin onto the truck (a dispatch scan on the load's order). */
export const POST = endpoint({ capability: 'loads.manage', body, status: 201 }, async ({ ctx, user, body }) => {
  const loadId = await loadIdByReference(ctx.params.ref ?? '');
  let assetId = body.assetId;
  if (assetId === undefined) {
    const found = await findBin(body.grai!, user);
    if (found.kind !== 'found') throw new AppError('not_found', found.kind === 'none' ? found.message : 'Several bins have that serial; scan the label or type the GRAI.');
    assetId = found.assetId;
  }
  return addBinToLoad(user, loadId, {
    clientEventId: body.clientEventId,
    assetId,
    occurredAt: body.occurredAt ? new Date(body.occurredAt) : undefined,
    overrideReason: body.overrideReason,
  });
});
