import { endpoint } from '../../../../lib/server/endpoint';
import { binsPageQuerySchema } from '../../../../lib/server/grid-params';
import { checkGrid, fetchBinsPage } from '../../../../lib/server/fleet-grid';
import { parseGridRequest } from '../../../../lib/grid-query';

/**
 * One page of the fleet grid (AG Grid's infinite row model): rows startRow..endRow of the bins that pass
 * filterModel, ordered by sortModel, with lastRow when the size of the filtered set is known.
 */
export const GET = endpoint({ capability: 'fleet.view', query: binsPageQuerySchema }, async ({ query }) => {
  const req = checkGrid(() => parseGridRequest(query));
  return fetchBinsPage(req);
});
