// The shapes the repair pages send (one schema each, used by the endpoints).
import { z } from 'zod';
import { inDateRange, multilineText, text, DATE_RANGE_MESSAGE } from '@/lib/text-input';

const amount = text()
  .trim()
  .max(16)
  .regex(/^(\d{1,10}(\.\d{1,3})?)?$/, 'An amount such as 250 or 250.00.');

export const openRepairBody = z
  .object({
    damageReportId: z.number().int().positive().max(2_147_483_647).optional(),
    assetId: z.number().int().positive().max(2_147_483_647).optional(),
    fault: multilineText().trim().max(2000).nullable().optional(),
    estimatedCost: amount.nullable().optional(),
  })
  .refine((v) => (v.damageReportId === undefined) !== (v.assetId === undefined), { message: 'Name either the damage report or the bin.', path: ['assetId'] });

export const repairWorkBody = z.object({
  performedOn: text()
    .regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter the day as YYYY-MM-DD')
    .refine(inDateRange, `The day ${DATE_RANGE_MESSAGE}`),
  description: multilineText().trim().min(1, 'Say what was done.').max(2000),
  parts: multilineText().trim().max(2000).nullable(),
  labourHours: z.number({ invalid_type_error: 'Labour in hours.' }).min(0, 'Labour in hours, from 0 to 999.').max(999, 'Labour in hours, from 0 to 999.'),
  cost: amount.min(1, 'Enter the cost (0 when nothing was spent).'),
  photoIds: z.array(z.number().int().positive().max(2_147_483_647)).max(10).optional(),
});

export const repairChangeBody = z.object({
  version: z.number().int().min(0),
  estimatedCost: amount.nullable().optional(),
  place: z.enum(['in_house', 'shop']).optional(),
  repairSiteId: z.number().int().positive().max(2_147_483_647).nullable().optional(),
});

export const retireBody = z.object({
  version: z.number().int().min(0),
  note: multilineText().trim().min(5, 'Say why the bin is retired (at least a few words).').max(500),
});
