/**
 * What the public bin page offers for where the bin is. Pure.
 *
 *   offersCollection(status) → whether "empty and ready for collection" makes sense for a bin in this status
 *
 * A bin out with a customer (on hire, folded and waiting, or one we have lost track of) can be ready for collection;
 * one in our own depots or workshop (available, prepared, in quarantine or repair, retired) or on a truck has nothing
 * to collect. A damage report fits everywhere.
 */
import type { Status } from '@/lib/scans/lifecycle';

export const COLLECTABLE_STATUSES: readonly Status[] = ['on_hire', 'awaiting_collection', 'missing'];

export function offersCollection(status: Status): boolean {
  return COLLECTABLE_STATUSES.includes(status);
}
