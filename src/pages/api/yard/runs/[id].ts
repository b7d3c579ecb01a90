import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { idParams } from '@/lib/route-params';
import { yardRunAt } from '@/lib/planning/truck-runs.server';

/** A run coming back to the yard user's depot: what is still expected per stop against what was received. */
export const GET = endpoint({ capability: 'home.yard', params: idParams('Truck run') }, async ({ user, params }) => {
  const depot = user.homeSiteId;
  const run = depot ? await yardRunAt(depot, params.id) : null;
  if (!run) throw new AppError('not_found', 'No run by that number comes back to your depot.');
  return run;
});
