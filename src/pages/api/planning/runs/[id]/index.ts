import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { actorFrom } from '@/lib/audit.server';
import { idParams } from '@/lib/route-params';
import { runPatchSchema } from '@/lib/planning/run-forms';
import { runView, updateRun } from '@/lib/planning/truck-runs.server';

const params = idParams('Truck run');

/** One run: stops in driving order, expected and received per stop, the commands open now. */
export const GET = endpoint({ capability: 'orders.view', params }, async ({ params }) => {
  const view = await runView(params.id);
  if (!view) throw new AppError('not_found', 'There is no such truck run.');
  return view;
});

/** Change a planned run's day and stops (or put them in driving order), or its carrier and trailer. Needs the run's `version`. */
export const PATCH = endpoint({ capability: 'orders.edit', params, body: runPatchSchema }, async ({ ctx, params, body }) => updateRun(params.id, body, actorFrom(ctx.locals)));
