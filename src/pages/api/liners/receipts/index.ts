import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { text, inDateRange, DATE_RANGE_MESSAGE } from '@/lib/text-input';
import { receiveAtDepot } from '@/lib/liners/liner-receiving.server';

const wholeNumber = (what: string, max: number) =>
  text()
    .trim()
    .regex(/^\d{1,9}$/, `Enter the ${what} as a whole number.`)
    .transform(Number)
    .pipe(z.number().int().min(1, `Enter the ${what}.`).max(max));
const day = (what: string) => text().trim().refine(inDateRange, `The ${what} ${DATE_RANGE_MESSAGE}.`);

const form = z
  .object({
    supplierId: wholeNumber('supplier', 2_147_483_647),
    linerSpecId: wholeNumber('liner spec', 2_147_483_647),
    lotNumber: text()
      .trim()
      .min(1, 'Scan the carton or type the lot number.')
      .max(40)
      .regex(/^[A-Za-z0-9][A-Za-z0-9\-/.]*$/, 'Lot numbers use letters, digits, - / and . only.'),
    quantity: wholeNumber('number of liners', 100_000),
    manufacturedOn: day('manufacture date')
      .optional()
      .or(z.literal('').transform(() => undefined)),
    expiryDate: day('expiry date'),
    purchaseOrderId: wholeNumber('purchase order', 2_147_483_647)
      .optional()
      .or(z.literal('').transform(() => undefined)),
  })
  .strict();

/** A lot received at the caller's home depot (multipart: the fields, and the certificate as "certificate"). */
export const POST = endpoint({ capability: 'liners.move', form, files: ['certificate'], status: 201 }, async ({ user, form, files }) => ({
  lot: await receiveAtDepot(user!, form, files.certificate ?? null),
}));
