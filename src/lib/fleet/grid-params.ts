// Query-string shapes of the fleet grid's endpoints. The grid's models travel as JSON in the query
// string (a GET stays a GET: cacheable by nobody, bookmarkable, easy to replay when measuring);
// their content is checked afterwards against the column whitelist (src/lib/fleet/grid-query.ts).
import { z } from 'zod';
import { text } from '@/lib/text-input';

const MAX_MODEL_CHARS = 20_000;

function jsonParam(name: string) {
  return text()
    .max(MAX_MODEL_CHARS, `${name} is too long`)
    .optional()
    .transform((text, ctx) => {
      if (text === undefined || text.trim() === '') return undefined;
      try {
        return JSON.parse(text) as unknown;
      } catch {
        ctx.addIssue({ code: z.ZodIssueCode.custom, message: `${name} is not valid JSON` });
        return z.NEVER;
      }
    });
}

export const gridModelsQuery = z.object({ sortModel: jsonParam('sortModel'), filterModel: jsonParam('filterModel') }).strict();

export const binsPageQuerySchema = gridModelsQuery
  .extend({
    startRow: z.coerce.number().int().min(0).optional(),
    endRow: z.coerce.number().int().min(1).optional(),
  })
  .strict();

export const binsExportQuerySchema = gridModelsQuery.extend({ columns: text().max(1000).optional() }).strict();
