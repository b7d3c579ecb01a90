import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { multilineText } from '@/lib/text-input';
import { recordId } from '@/lib/route-params';
import { RESOLUTIONS } from '@/lib/portal/count-confirmation';
import { resolveLine } from '@/lib/portal/count-disputes.server';

const params = z.object({ id: recordId('Count'), line: recordId('Line') });

const body = z
  .object({
    resolution: z.enum(RESOLUTIONS, { errorMap: () => ({ message: 'A bin is found, moved or lost.' }) }),
    movedToSiteId: recordId('Site').nullish(),
    note: multilineText().trim().max(1000, 'Keep the note under 1000 characters.').nullish(),
    version: z.number().int().min(0),
  })
  .strict();

/**
 * A planner settles one bin of a count's dispute:
 *   PATCH /api/planning/counts/<id>/lines/<line>  { resolution: found|moved|lost, movedToSiteId?, note?, version }
 * "lost" marks the bin missing through the scan service; a resolution that does not fit the line is 422, a stale
 * version 409, a line already settled 409.
 */
export const PATCH = endpoint({ capability: 'counts.resolve', body, params }, async ({ ctx, user, body: input, params: { id, line } }) =>
  resolveLine(
    user,
    id,
    line,
    { resolution: input.resolution, movedToSiteId: input.movedToSiteId ?? null, note: input.note || null, version: input.version },
    actorFrom(ctx.locals),
  ),
);
