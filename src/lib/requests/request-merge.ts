/**
 * When a new collection request is one already on the planners' list. Pure.
 *
 *   MERGE_WINDOW_HOURS                    → how long after a request's latest report a new one still joins it
 *   mergeTarget(openRequests, incoming, now) → the request the new report joins, or null for a new request
 *
 * The rule (common practice for request queues, no published source): a report joins an open or scheduled
 * request about the same bin, or about the same site (a report from a bin's label counts for the site the bin stands
 * at), while that request's latest report is less than the window old; the newest such request wins. Every form
 * asks how many folded bins wait there, so ten reports of 12 bins are still 12 bins: the latest quantity stated
 * stands, and the count of reports says how often it was asked.
 */
export const MERGE_WINDOW_HOURS = 72;

export interface OpenRequest {
  id: number;
  assetId: number | null;
  siteId: number | null;
  status: 'open' | 'scheduled' | 'done' | 'cancelled';
  lastReportedAt: Date;
}

export function mergeTarget(open: readonly OpenRequest[], incoming: { assetId: number | null; siteId: number | null }, now: Date): OpenRequest | null {
  const since = now.getTime() - MERGE_WINDOW_HOURS * 3_600_000;
  const matches = open.filter(
    (r) =>
      (r.status === 'open' || r.status === 'scheduled') &&
      r.lastReportedAt.getTime() > since &&
      ((incoming.assetId !== null && r.assetId === incoming.assetId) || (incoming.siteId !== null && r.siteId === incoming.siteId)),
  );
  return matches.sort((a, b) => b.lastReportedAt.getTime() - a.lastReportedAt.getTime() || b.id - a.id)[0] ?? null;
}
