import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { markLabelsPrinted } from '@/lib/labels/label-run.server';
import { MAX_LABELS_PER_RUN } from '@/lib/labels/label-selection';

const body = z
  .object({
    ids: z
      .array(z.number().int().positive().max(2_147_483_647), { required_error: 'Say which bins were printed (ids).' })
      .min(1, 'Say which bins were printed (ids).')
      .max(MAX_LABELS_PER_RUN, `A sheet run holds at most ${MAX_LABELS_PER_RUN.toLocaleString('en-GB')} labels.`),
  })
  .strict();

/**
 * Records that a sheet run came out of the printer: sets each bin's
 * label-printed time. Called when the user confirms the printout, never when
 * a sheet is merely viewed.
 */
export const POST = endpoint({ capability: 'labels.print', body }, async ({ body }) => {
  const result = await markLabelsPrinted(body.ids);
  return { marked: result.marked, missing: result.missing, printedAt: result.printedAt.toISOString() };
});
