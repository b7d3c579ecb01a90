import { endpoint } from '../../../../lib/server/endpoint';
import { gridModelsQuery } from '../../../../lib/server/grid-params';
import { checkGrid, countBins } from '../../../../lib/server/fleet-grid';
import { parseFilterModel } from '../../../../lib/grid-query';

/** How many bins pass filterModel: { count }, or { count: null } past a million (the grid scrolls on to find the end). */
export const GET = endpoint({ capability: 'fleet.view', query: gridModelsQuery }, async ({ query }) => {
  const filterModel = checkGrid(() => parseFilterModel(query.filterModel));
  return { count: await countBins(filterModel) };
});
