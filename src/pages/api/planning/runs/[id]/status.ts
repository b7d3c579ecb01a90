import { endpoint } from '@/lib/endpoint.server';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { runCommandSchema } from '@/lib/planning/run-forms';
import { commandRun } from '@/lib/planning/truck-runs.server';

/** Confirm, cancel or close a run: POST { command, version }. */
export const POST = endpoint({ capability: 'orders.edit', params: idParams('Truck run'), body: runCommandSchema }, async ({ ctx, params, body }) =>
  commandRun(params.id, body.command, body.version, actorFrom(ctx.locals)),
);
