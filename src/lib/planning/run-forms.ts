// What the truck-run pages send: the suggestion's query, a new run, an edit and a command. Pure zod, parsed once by
// the endpoints (and the suggest form's query by the page).
import { z } from 'zod';
import { DATE_RANGE_MESSAGE, inDateRange, text } from '@/lib/text-input';
import { isLocalDate } from '@/lib/calendar';
import { DEFAULT_ROAD_FACTOR } from './lane-costs';

const id = z.number().int().positive();
const day = text().refine(isLocalDate, 'A date as YYYY-MM-DD.').refine(inDateRange, `The day ${DATE_RANGE_MESSAGE}.`);
const carrier = text().trim().min(1, 'Name the carrier.').max(120, 'At most 120 characters.');

export const RUN_SUGGEST_DEFAULTS = { windowDays: 2, maxDetourKm: 60, roadFactor: DEFAULT_ROAD_FACTOR } as const;

/** ?depot=&trailer=&type=&window=&detour=&road= (all but the depot optional). */
export const runSuggestQuery = z
  .object({
    depot: z.coerce.number().int().positive(),
    trailer: z.coerce.number().int().positive().optional(),
    type: z.coerce.number().int().positive().optional(),
    window: z.coerce.number().int().min(0, 'At least 0 days.').max(14, 'At most 14 days.').default(RUN_SUGGEST_DEFAULTS.windowDays),
    detour: z.coerce.number().min(0, 'At least 0 km.').max(500, 'At most 500 km.').default(RUN_SUGGEST_DEFAULTS.maxDetourKm),
    road: z.coerce.number().min(1, 'At least 1.').max(3, 'At most 3.').default(RUN_SUGGEST_DEFAULTS.roadFactor),
  })
  .strict();
export type RunSuggestQuery = z.infer<typeof runSuggestQuery>;

const stop = z.object({ siteId: id, expectedBins: z.number().int().min(1, 'At least 1 bin.').max(500, 'At most 500 bins.') }).strict();
const stops = z
  .array(stop)
  .max(30, 'At most 30 stops on one run.')
  .superRefine((list, ctx) => {
    const seen = new Set<number>();
    list.forEach((s, i) => {
      if (seen.has(s.siteId)) ctx.addIssue({ code: z.ZodIssueCode.custom, path: [i, 'siteId'], message: 'A site is one stop; it is listed twice.' });
      seen.add(s.siteId);
    });
  });

export const runCreateSchema = z
  .object({
    depotId: id,
    plannedOn: day,
    trailerId: id.nullable().optional(),
    binTypeId: id.nullable().optional(),
    carrier: carrier.nullable().optional(),
    stops: stops.refine((l) => l.length > 0, 'A run has at least one stop.'),
  })
  .strict();
export type RunCreate = z.infer<typeof runCreateSchema>;

export const runPatchSchema = z
  .object({
    version: z.number().int().min(0),
    plannedOn: day.optional(),
    trailerId: id.nullable().optional(),
    binTypeId: id.nullable().optional(),
    carrier: carrier.nullable().optional(),
    stops: stops.optional(),
    /** Put the stops in driving order (nearest first, then 2-opt) instead of the order given. */
    reorder: z.boolean().optional(),
  })
  .strict();
export type RunPatch = z.infer<typeof runPatchSchema>;

export const runCommandSchema = z.object({ command: z.enum(['confirm', 'cancel', 'close']), version: z.number().int().min(0) }).strict();
export type RunCommandBody = z.infer<typeof runCommandSchema>;
