/**
 * When a new collection request is one already on the planners' list. Pure.
 *
 *   MERGE_WINDOW_HOURS                    → how long after a request's latest report a new one still joins it
 *   mergeTarget(openRequests, incoming, now) → the request the new report joins, or null for a new request
 *
 * The rule (common practice for request queues, no published source): a report about a bin (from its label)
 * joins an open or scheduled request about the same bin; a report about a site without a bin (the portal, a
 * planner taking a call) joins one about the same site without a bin; either only while the request's latest
 * report is less than the window old. The newest such request wins. Reports about two bins at one site stay two:
 * each states its own count. Ten reports of "12 bins ready" are still 12 bins, so the latest quantity stands and
 * the count of reports says how often it was asked.
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
      (incoming.assetId !== null ? r.assetId === incoming.assetId : incoming.siteId !== null && r.assetId === null && r.siteId === incoming.siteId),
  );
  return matches.sort((a, b) => b.lastReportedAt.getTime() - a.lastReportedAt.getTime() || b.id - a.id)[0] ?? null;
}
