import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { tariffInputSchema } from '@/lib/planning/tariffs';
import { addTariff, tariffsOf } from '@/lib/planning/tariffs.server';

const query = z.object({ customer: z.coerce.number().int().positive().max(2_147_483_647) }).strict();

/** A customer's tariffs, newest first: GET /api/admin/tariffs?customer=4. */
export const GET = endpoint({ capability: 'tariffs.manage', query }, async ({ query }) => tariffsOf(query.customer));

/** A new tariff; an open-ended one it succeeds is ended the day before. */
export const POST = endpoint({ capability: 'tariffs.manage', body: tariffInputSchema, status: 201 }, async ({ ctx, body }) => addTariff(body, actorFrom(ctx.locals)));
