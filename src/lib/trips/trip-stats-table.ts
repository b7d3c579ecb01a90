/**
 * The trip statistics page's table: trip-stats.ts `summarise()` per bin, customer or depot, with the time at
 * the depot between trips added, and one row for everything together.
 *
 *   statsTable(trips, { groupBy, period, timeZone }) → { rows, overall }
 *
 * Time at the depot: the gap from a bin's return to its next dispatch (`depotGaps()`), counted for the period
 * the next dispatch falls in. Callers pass, besides the period's trips, each bin's last trip before the period
 * so the first gap of the period is known. A gap belongs to the bin, to the depot that dispatched the next
 * trip (where the bin waited) and to the customer of that next trip (whose order it waited for).
 */
import { depotGaps, summarise, tripDates } from './trip-stats';
import type { GroupBy, GroupSummary, Period, Trip } from './trip-stats';

export interface StatsRow extends GroupSummary {
  /** Return → next dispatch gaps whose dispatch falls in the period. */
  depotGaps: number;
  meanDepotDays: number | null;
}

export interface StatsTable {
  rows: StatsRow[];
  /** All trips as one group; null when the period has no trips. */
  overall: StatsRow | null;
}

const ALL = '*';

function mean(values: readonly number[]): number | null {
  return values.length === 0 ? null : values.reduce((s, v) => s + v, 0) / values.length;
}

export function statsTable(trips: readonly Trip[], { groupBy, period, timeZone }: { groupBy: GroupBy; period: Period; timeZone: string }): StatsTable {
  const customerOfDispatch = new Map<string, string>();
  for (const trip of trips) customerOfDispatch.set(`${trip.assetId}|${tripDates(trip, timeZone).dispatched}`, trip.customerId);

  const gapsByKey = new Map<string, number[]>();
  const allGaps: number[] = [];
  for (const gap of depotGaps(trips, timeZone)) {
    if (gap.dispatchedOn < period.from || gap.dispatchedOn > period.to) continue;
    const key = groupBy === 'asset' ? gap.assetId : groupBy === 'depot' ? gap.depotId : (customerOfDispatch.get(`${gap.assetId}|${gap.dispatchedOn}`) ?? '');
    const list = gapsByKey.get(key) ?? [];
    list.push(gap.days);
    gapsByKey.set(key, list);
    allGaps.push(gap.days);
  }

  const withGaps = (summary: GroupSummary, gaps: readonly number[]): StatsRow => ({ ...summary, depotGaps: gaps.length, meanDepotDays: mean(gaps) });
  const rows = summarise(trips, { groupBy, period, timeZone }).map((s) => withGaps(s, gapsByKey.get(s.key) ?? []));
  const [together] = summarise(
    trips.map((t) => ({ ...t, customerId: ALL })),
    { groupBy: 'customer', period, timeZone },
  );
  return { rows, overall: together ? withGaps({ ...together, key: ALL }, allGaps) : null };
}
