import { endpoint } from '@/lib/endpoint.server';
import { gridModelsQuery } from '@/lib/fleet/grid-params';
import { checkGrid, countBins } from '@/lib/fleet/fleet-grid.server';
import { parseFilterModel } from '@/lib/fleet/grid-query';

/** How many bins pass filterModel: { count }, or { count: null } past a million (the grid scrolls on to find the end). */
export const GET = endpoint({ capability: 'fleet.view', query: gridModelsQuery }, async ({ query }) => {
  const filterModel = checkGrid(() => parseFilterModel(query.filterModel));
  return { count: await countBins(filterModel) };
});
