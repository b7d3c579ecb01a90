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
 *
 * The day count itself — which dates count, and that the free days are the first counted ones — is the one of
 * hire billing (src/lib/billing/hire-days.ts), so "overdue" and "charged" agree on every day. A customer's tariff
 * may say which ends count (`dayCount`); without it the default terms give the counts above.
 */
import type { LocalDate } from '@/lib/calendar';
import { DEFAULT_DAY_COUNT, hireDaysThrough, lastFreeDay as lastFreeHireDay, type DayCountTerms } from '@/lib/billing/hire-days';
import type { Status } from '@/lib/scans/lifecycle';

/** The statuses in which a bin is with the customer and the free-day clock runs. */
export const WITH_CUSTOMER_STATUSES = ['on_hire', 'awaiting_collection'] as const satisfies readonly Status[];

export interface OverdueInput {
  status: Status;
  deliveredOn: LocalDate | null;
  dispatchedOn: LocalDate | null;
  freeDays: number;
  today: LocalDate;
  /** Which ends of the hire count (the customer's tariff); the billing default when left out. */
  dayCount?: DayCountTerms;
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

export function lastFreeDay(deliveredOn: LocalDate, freeDays: number, dayCount: DayCountTerms = DEFAULT_DAY_COUNT): LocalDate {
  return lastFreeHireDay(deliveredOn, freeDays, dayCount);
}

export function overdueBack({ status, deliveredOn, dispatchedOn, freeDays, today, dayCount = DEFAULT_DAY_COUNT }: OverdueInput): OverdueCheck {
  const start = deliveredOn ?? dispatchedOn;
  if (!isWithCustomer(status) || start === null) return NOT_APPLICABLE;
  const freeUntil = lastFreeDay(start, freeDays, dayCount);
  // Records from the future (a clock off on a phone) count as zero days, never as negative ones.
  const daysWithCustomer = hireDaysThrough(start, today, dayCount);
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
