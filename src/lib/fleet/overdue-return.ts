/**
 * When a bin with a customer is overdue back.
 *
 *   overdueBack({ status, deliveredOn, dispatchedOn, freeDays, today }) → OverdueCheck
 *   lastFreeDay(deliveredOn, freeDays)                                  → the last day still inside the free days
 *   overdueBackSql(today, timeZone)                                     → the same "overdue" as an SQL predicate
 *
 * The rule (the operator's hire terms): a bin that is with the customer — on hire, or folded and awaiting
 * collection — is overdue once more calendar days have passed since its delivery than the customer's free
 * days. Days are local dates in the operator's time zone: delivered on 1 Mar with 14 free days, 15 Mar is
 * day 14 and still free, 16 Mar is day 15 and one day over. A bin whose delivery was never scanned counts from
 * its dispatch (the earlier date, so the count never flatters the customer's side); such a count is marked
 * `estimated`. Bins in any other status (in transit back, at a depot, missing…) are not "overdue back": the
 * rule does not apply to them.
 */
import { addDays, daysBetween } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import type { Status } from '@/lib/scans/lifecycle';

/** The statuses in which a bin is with the customer and the free-day clock runs. */
export const WITH_CUSTOMER_STATUSES = ['on_hire', 'awaiting_collection'] as const satisfies readonly Status[];

export interface OverdueInput {
  status: Status;
  deliveredOn: LocalDate | null;
  dispatchedOn: LocalDate | null;
  freeDays: number;
  today: LocalDate;
}

export interface OverdueCheck {
  /** False when the bin is not with the customer (or no date is known): nothing below counts then. */
  applies: boolean;
  /** Calendar days from delivery (or dispatch) to today; null when the rule does not apply. */
  daysWithCustomer: number | null;
  /** Days beyond the free days; 0 when not overdue. */
  daysOver: number;
  overdue: boolean;
  /** The count starts at the dispatch because the delivery was never scanned. */
  estimated: boolean;
  /** The last day inside the free days; null when the rule does not apply. */
  freeUntil: LocalDate | null;
}

const NOT_APPLICABLE: OverdueCheck = { applies: false, daysWithCustomer: null, daysOver: 0, overdue: false, estimated: false, freeUntil: null };

export function isWithCustomer(status: Status): boolean {
  return (WITH_CUSTOMER_STATUSES as readonly Status[]).includes(status);
}

export function lastFreeDay(deliveredOn: LocalDate, freeDays: number): LocalDate {
  if (!Number.isInteger(freeDays) || freeDays < 0) throw new RangeError(`Free days must be a whole number ≥ 0, got ${freeDays}`);
  return addDays(deliveredOn, freeDays);
}

export function overdueBack({ status, deliveredOn, dispatchedOn, freeDays, today }: OverdueInput): OverdueCheck {
  const start = deliveredOn ?? dispatchedOn;
  if (!isWithCustomer(status) || start === null) return NOT_APPLICABLE;
  const freeUntil = lastFreeDay(start, freeDays);
  // Records from the future (a clock off on a phone) count as zero days, never as negative ones.
  const daysWithCustomer = Math.max(0, daysBetween(start, today));
  const daysOver = Math.max(0, daysWithCustomer - freeDays);
  return { applies: true, daysWithCustomer, daysOver, overdue: daysOver > 0, estimated: deliveredOn === null, freeUntil };
}

/**
 * overdueBack(...).overdue as SQL, for queries that filter or count in the database (the fleet grid's
 * "Over free days", the planners' digest). `today` and `timeZone` are SQL expressions (bind parameters);
 * the query must alias the bin `a`, its current trip `t` (trips.id = a.current_trip_id, LEFT JOIN is fine)
 * and the bin's customer `o`. "More days since the start than free days" is written as "the start instant
 * is before the first moment of local day (today − free days)", so an index on the instant can serve it.
 * Checked against overdueBack() row by row in tests/integration/fleet/overdue-back-drift.test.ts.
 */
export function overdueBackSql(today: string, timeZone: string): string {
  const statuses = WITH_CUSTOMER_STATUSES.map((s) => `'${s}'`).join(', ');
  return `(a.status IN (${statuses}) AND COALESCE(t.delivered_at, t.dispatched_at) < ((${today} - o.free_days)::timestamp AT TIME ZONE ${timeZone}))`;
}
