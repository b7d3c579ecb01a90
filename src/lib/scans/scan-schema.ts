// The shape of a scan as clients send it (yard pages, offline queue, batch
// sync). One schema, used by the endpoint and by the offline queue's checks.
import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';
import { ACTIONS } from './lifecycle';
import { repeatedSeals } from '@/lib/trips/seal-check';

// Registration and inspections have their own forms and endpoints (they write a record beside the scan).
type Recordable = Exclude<(typeof ACTIONS)[number], 'register' | 'inspect'>;
const RECORDABLE = ACTIONS.filter((a) => a !== 'register' && a !== 'inspect') as [Recordable, ...Recordable[]];
const seal = text()
  .trim()
  .min(1)
  .max(32)
  .regex(/^[A-Za-z0-9\-/.]+$/, 'Seal numbers use letters, digits, - / and . only');
/** Up to six seal numbers, each once: a number written twice is a typing slip or two seals read as one. */
const sealList = z
  .array(seal)
  .max(6)
  .superRefine((list, ctx) => {
    for (const n of repeatedSeals(list)) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, message: `Seal number ${n} is listed twice; each seal has its own number, so enter every seal once.` });
    }
  });

/** A fill record (fill_seal): what went in, how much, how warm, and the tamper-evident seals fitted. */
export const fillSchema = z.object({
  product: text().trim().min(1).max(120),
  volumeL: z.number().positive().max(3000).nullable().optional(),
  massKg: z.number().positive().max(5000).nullable().optional(),
  temperatureC: z.number().min(-40).max(100).nullable().optional(),
  seals: sealList,
});

export const scanEventSchema = z
  .object({
    clientEventId: text().uuid('clientEventId must be a UUID made on the device'),
    grai: text().trim().min(1).max(300).optional(),
    assetId: z.number().int().positive().optional(),
    action: z.enum(RECORDABLE),
    occurredAt: text().datetime({ offset: true }).optional(),
    siteId: z.number().int().positive().nullable().optional(),
    expectedVersion: z.number().int().min(0).optional(),
    prepResult: z.enum(['pass', 'fail']).optional(),
    checklist: z.record(text().max(40), z.boolean()).optional(),
    faults: multilineText().trim().max(500).optional(),
    photoIds: z.array(z.number().int().positive()).max(10).optional(),
    linerLotId: z.number().int().positive().optional(),
    lotsAsOf: text().datetime({ offset: true }).optional(),
    purpose: z.enum(['hire', 'transfer']).optional(),
    hireOrderId: z.number().int().positive().optional(),
    loadId: z.number().int().positive().optional(),
    runId: z.number().int().positive().optional(),
    fill: fillSchema.optional(),
    sealsVerified: sealList.optional(),
    note: multilineText().trim().max(500).optional(),
    overrideReason: multilineText().trim().min(5, 'Say why the bin may go anyway (at least a few words).').max(500).optional(),
  })
  .strict()
  .refine((e) => e.grai !== undefined || e.assetId !== undefined, { message: 'Say which bin: grai or assetId', path: ['grai'] });

export type ScanEventBody = z.infer<typeof scanEventSchema>;

const batchSchema = z.object({ events: z.array(scanEventSchema).min(1).max(200) }).strict();

/**
 * One scan, or `{ events: [...] }` from an offline queue. Chosen by shape first
 * so a bad field is reported by its name, not as "no union member matched".
 */
export const scanRequestSchema = z.unknown().transform((value, ctx): ScanEventBody | z.infer<typeof batchSchema> => {
  const schema = value !== null && typeof value === 'object' && 'events' in value ? batchSchema : scanEventSchema;
  const result = schema.safeParse(value);
  if (!result.success) {
    for (const issue of result.error.issues) ctx.addIssue({ ...issue, code: z.ZodIssueCode.custom, message: issue.message });
    return z.NEVER;
  }
  return result.data;
});
