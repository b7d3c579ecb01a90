import { endpoint } from '@/lib/endpoint.server';
import { runSuggestQuery } from '@/lib/planning/run-forms';
import { suggestCollectionRuns } from '@/lib/planning/truck-runs.server';

/** Runs suggested for a depot from the open collection requests: GET /api/planning/runs/suggest?depot=3&trailer=1&window=2&detour=60. */
export const GET = endpoint({ capability: 'orders.view', query: runSuggestQuery }, async ({ query }) => suggestCollectionRuns(query));
