import { endpoint } from '@/lib/endpoint.server';
import { binsPageQuerySchema } from '@/lib/fleet/grid-params';
import { checkGrid, fetchBinsPage } from '@/lib/fleet/fleet-grid.server';
import { dataResponse } from '@/lib/respond.server';
import { parseGridRequest } from '@/lib/fleet/grid-query';

/**
 * One page of the fleet grid (AG Grid's infinite row model): rows startRow..endRow of the bins that pass
 * filterModel, ordered by sortModel; lastRow when the page reached the end of the set. The size of the
 * set comes from /api/fleet/bins/count, asked beside the first page, so no page waits for a count.
 */
export const GET = endpoint({ capability: 'fleet.view', query: binsPageQuerySchema }, async ({ query }) => {
  const req = checkGrid(() => parseGridRequest(query));
  const t0 = performance.now();
  const page = await fetchBinsPage(req);
  const res = dataResponse(page);
  res.headers.set('Server-Timing', `db;desc="page query";dur=${(performance.now() - t0).toFixed(1)}`);
  return res;
});
