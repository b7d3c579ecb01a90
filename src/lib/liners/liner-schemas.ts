// What an admin may enter for liner specs and suppliers, validated once (the admin API parses with these;
// the database's checks are the last line). Pure.
import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';
import { VALVE_TYPES, connectionSize } from './liner-specs';
import { LOT_STATUS_ACTIONS } from './liner-recall';

const size = (what: string) =>
  text()
    .trim()
    .transform((v, ctx) => {
      const s = connectionSize(v);
      if (!s) ctx.addIssue({ code: z.ZodIssueCode.custom, message: `Write the ${what} as a flange size (DN50, DN80) or a thread (S60x6).` });
      return s ?? v;
    });

const money = (what: string) =>
  z
    .number({ invalid_type_error: `Enter the ${what} as a number.` })
    .min(0, `The ${what} cannot be negative.`)
    .max(99_999_999);

export const specSchema = z
  .object({
    version: z.number().int().min(0).optional(),
    code: text()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9][A-Z0-9-]{1,23}$/, 'A code is 2 to 24 letters, digits or dashes.'),
    name: text().trim().min(1, 'Name the spec.').max(160),
    material: text().trim().min(1, 'Name the material (PE, PE/PA, PE/EVOH/PE …).').max(60),
    layers: z.number({ invalid_type_error: 'Enter the number of layers.' }).int().min(1, 'At least 1 layer.').max(9, 'At most 9 layers.'),
    nominalCapacityL: z.number({ invalid_type_error: 'Enter the capacity in litres.' }).int().min(50, 'At least 50 L.').max(5000, 'At most 5,000 L.'),
    valveType: z.enum(VALVE_TYPES, { errorMap: () => ({ message: 'Choose the valve type.' }) }),
    valveSize: size('valve size').nullable(),
    glandSize: size('gland size'),
    foodContact: z.boolean(),
    maxFillTempC: z.number({ invalid_type_error: 'Enter the temperature in °C.' }).int().min(-40).max(100, 'At most 100 °C.').nullable(),
    supplierId: z.number().int().positive().nullable(),
    articleNumber: text().trim().max(40).nullable(),
    binTypeIds: z.array(z.number().int().positive()).max(200),
    active: z.boolean().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.valveType === 'none' && v.valveSize)
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['valveSize'], message: 'A liner without a bottom valve has no valve size; clear it.' });
    if (v.valveType !== 'none' && !v.valveSize) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['valveSize'], message: 'Give the valve size (DN50, DN80, S60x6 …).' });
  });
export type SpecInput = z.infer<typeof specSchema>;

export const supplierSchema = z.object({
  version: z.number().int().min(0).optional(),
  name: text().trim().min(1, 'Name the supplier.').max(120),
  orderEmail: text().trim().email('Enter the address purchase orders go to.').max(254).nullable(),
  leadTimeDays: z.number({ invalid_type_error: 'Enter the lead time in days.' }).int().min(0).max(365, 'At most 365 days.'),
  orderCost: money('cost per order'),
  packSize: z.number({ invalid_type_error: 'Enter the liners per carton.' }).int().min(1, 'At least 1 a carton.').max(10_000),
  minOrderQty: z.number({ invalid_type_error: 'Enter the minimum order.' }).int().min(1, 'At least 1.').max(1_000_000),
  pricePerLiner: money('price per liner'),
  active: z.boolean().optional(),
});
export type SupplierInput = z.infer<typeof supplierSchema>;

/** Hold, recall or release a lot (`version` as the page showed it). */
export const lotStatusSchema = z
  .object({
    action: z.enum(LOT_STATUS_ACTIONS),
    reason: multilineText().trim().max(500),
    version: z.number().int().min(0),
  })
  .strict();

/** The words of a notice to the customers who received liners of a lot. */
export const lotNoticeSchema = z.object({ message: multilineText().trim().min(1, 'Write the notice.').max(4000) }).strict();

const id = (what: string) =>
  z
    .number({ invalid_type_error: `Choose the ${what}.` })
    .int()
    .positive()
    .max(2_147_483_647);

/** A suggested order made a purchase order (the quantity as the planner confirmed it). */
export const purchaseOrderSchema = z
  .object({
    depotSiteId: id('depot'),
    specId: id('liner spec'),
    quantity: z.number({ invalid_type_error: 'Enter the number of liners.' }).int('Order whole liners.').min(1, 'Order at least one liner.').max(1_000_000),
    note: multilineText().trim().max(1000).optional(),
  })
  .strict();

export const versionSchema = z.object({ version: z.number().int().min(0) }).strict();
