// When each bin joined the pool and, for bins retired or missing now, when it left — read from the scan log,
// so the pool overview (shrinkage) and the reuse report count "the pool on a day" the same way.
//
// Commissioned: the bin's register entry (its first log entry; the row's creation time if that entry is
// gone). Left: the newest retire or mark-missing entry of a bin whose status is retired or missing now. A bin
// missing in the past and found again since counts as in the pool throughout — the log keeps the detail, the
// figures stay simple.

/** A SELECT for a CTE: id, status, commissioned_at, left_at (timestamptz; left_at null while in service). */
export const BIN_LIFE_SQL = `
  SELECT a.id, a.status,
         coalesce((SELECT e.occurred_at FROM scan_events e
                    WHERE e.asset_id = a.id AND e.action = 'register' AND e.voided_at IS NULL
                    ORDER BY e.occurred_at, e.id LIMIT 1), a.created_at) AS commissioned_at,
         CASE WHEN a.status IN ('retired', 'missing') THEN
           (SELECT e.occurred_at FROM scan_events e
             WHERE e.asset_id = a.id AND e.action IN ('retire', 'mark_missing') AND e.voided_at IS NULL
             ORDER BY e.occurred_at DESC, e.id DESC LIMIT 1)
         END AS left_at
    FROM assets a`;

/** SQL for the instant a local date starts in the operator's zone, e.g. startOfLocalDay('$2', '$1'). */
export function startOfLocalDay(dateParam: string, zoneParam: string): string {
  return `(${dateParam}::date::timestamp AT TIME ZONE ${zoneParam})`;
}
