import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { parseTripListQuery } from '@/lib/trips/trip-list-query';
import { listTrips } from '@/lib/trips/trip-list.server';

/**
 * One page of trips, sorted and filtered on the server: GET /api/trips?sort=dwell&dir=asc&customer=4&page=2.
 * An unknown column or filter is a 400 with the allowed names, never ignored.
 */
export const GET = endpoint({ capability: 'trips.view' }, async ({ ctx }) => {
  const parsed = parseTripListQuery(ctx.url.searchParams);
  if (!parsed.ok) throw new AppError('bad_request', parsed.issues.map((i) => i.message).join(' '), parsed.issues);
  return listTrips(parsed.query);
});
