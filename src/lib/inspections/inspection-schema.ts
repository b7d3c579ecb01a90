// The shape of an inspection record as the test-bench form sends it (one schema, used by the endpoint).
import { z } from 'zod';
import { inDateRange, multilineText, text, DATE_RANGE_MESSAGE } from '@/lib/text-input';
import { PERIODIC_KINDS } from './inspection-form';

const leakTest = z.object({
  pressureKpa: z.number().min(0).max(1000),
  minutes: z.number().min(0).max(1440),
  passed: z.boolean(),
});

export const inspectionBody = z.object({
  clientEventId: text().uuid('clientEventId must be a UUID made on the device'),
  assetId: z.number().int().positive(),
  siteId: z.number().int().positive().nullable().optional(),
  expectedVersion: z.number().int().min(0).optional(),
  kind: z.enum(PERIODIC_KINDS as [(typeof PERIODIC_KINDS)[number], ...(typeof PERIODIC_KINDS)[number][]]),
  performedOn: text()
    .regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter the day as YYYY-MM-DD')
    .refine(inDateRange, `The day ${DATE_RANGE_MESSAGE}`),
  checklist: z.record(text().max(40), z.boolean()),
  leakTest: leakTest.nullable(),
  outcome: z.enum(['pass', 'repair', 'fail']),
  inspectorId: z.number().int().positive().nullable(),
  inspectionBody: text().trim().max(160).nullable(),
  remarks: multilineText().trim().max(2000).nullable(),
  photoIds: z.array(z.number().int().positive()).max(10).optional(),
});

export const amendBody = z.object({
  reason: multilineText().trim().min(5, 'Say why the record is corrected (at least a few words).').max(500),
  checklist: z.record(text().max(40), z.boolean()).optional(),
  leakTest: leakTest.nullable().optional(),
  inspectorId: z.number().int().positive().nullable().optional(),
  inspectionBody: text().trim().max(160).nullable().optional(),
  remarks: multilineText().trim().max(2000).nullable().optional(),
});
