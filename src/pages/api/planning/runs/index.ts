import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { runCreateSchema } from '@/lib/planning/run-forms';
import { RUN_STATUSES } from '@/lib/planning/run-status';
import { createRun, listRuns } from '@/lib/planning/truck-runs.server';

const listQuery = z.object({ status: z.enum([...RUN_STATUSES, 'open']).optional(), depot: z.coerce.number().int().positive().optional() }).strict();

/** Truck runs, open ones first: GET /api/planning/runs?status=open&depot=3. */
export const GET = endpoint({ capability: 'orders.view', query: listQuery }, async ({ query }) => ({ rows: await listRuns({ status: query.status, depotId: query.depot }) }));

/** Save a run (usually a suggestion): depot, day, stops in order with the bins expected at each; it starts planned. */
export const POST = endpoint({ capability: 'orders.edit', body: runCreateSchema, status: 201 }, async ({ ctx, body }) => createRun(body, actorFrom(ctx.locals)));
