import type { Status } from '@/lib/scans/lifecycle';

/**
 * The missing-bin rule (operator policy, not a regulation): a bin out of the
 * depots — on hire, waiting for collection or on the road — that nobody has
 * scanned for this many days is marked missing, so it shows up for chasing and,
 * if it stays lost, for the lost-bin charge.
 */
export const MISSING_AFTER_DAYS = 120;

const OUT_OF_DEPOT: readonly Status[] = ['on_hire', 'awaiting_collection', 'in_transit'];

export function isSilentTooLong(bin: { status: Status; lastScanAt: Date | null }, now: Date, days = MISSING_AFTER_DAYS): boolean {
  if (!OUT_OF_DEPOT.includes(bin.status) || !bin.lastScanAt) return false;
  return now.getTime() - bin.lastScanAt.getTime() > days * 86_400_000;
}

/** The rule as SQL: the same test, so a query finds exactly the bins the function would. */
export const SILENT_BINS_SQL = `status IN ('on_hire', 'awaiting_collection', 'in_transit') AND last_scan_at < $1::timestamptz - make_interval(days => $2)`;
