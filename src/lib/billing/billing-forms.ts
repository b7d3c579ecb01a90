// What the billing routes accept, checked once (zod) before any service runs.
import { z } from 'zod';
import { isLocalDate } from '@/lib/calendar';

const month = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Give the month as YYYY-MM, e.g. 2027-03.');

export const issueStatementBody = z.object({ customerId: z.number().int().positive().max(2_147_483_647), month }).strict();
export type IssueStatementBody = z.infer<typeof issueStatementBody>;

/** ?month=2027-03 on the billing overview and the accounting export (left out: the last month that has ended). */
export const monthQuery = z.object({ month: month.optional() }).strict();

const id = z.number().int().positive().max(2_147_483_647);
/** An amount as typed: whole units and at most two decimals ("1,234.50" is refused: no grouping). */
const amount = z
  .string()
  .trim()
  .regex(/^\d{1,9}(\.\d{1,2})?$/, 'Give the amount as a number like 1234.50 (no thousands separator).');
const day = z.string().refine(isLocalDate, 'Give the date like 2026-12-04.');

export const issueInvoiceBody = z.object({ statementId: id }).strict();

export const paymentBody = z.object({ amount, paidOn: day, note: z.string().trim().max(500).optional() }).strict();
export type PaymentBody = z.infer<typeof paymentBody>;

export const creditNoteBody = z.object({ amount, reason: z.string().trim().min(3, 'Say why the invoice is corrected.').max(500) }).strict();
export type CreditNoteBody = z.infer<typeof creditNoteBody>;

/** A customer's online payment: the amount to pay now (all that is outstanding, or part of it). */
export const checkoutBody = z.object({ amount }).strict();
