// What the billing routes accept, checked once (zod) before any service runs.
import { z } from 'zod';

const month = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Give the month as YYYY-MM, e.g. 2027-03.');

export const issueStatementBody = z.object({ customerId: z.number().int().positive().max(2_147_483_647), month }).strict();
export type IssueStatementBody = z.infer<typeof issueStatementBody>;

/** ?month=2027-03 on the billing overview and the accounting export (left out: the last month that has ended). */
export const monthQuery = z.object({ month: month.optional() }).strict();
