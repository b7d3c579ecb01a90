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
 * hire billing (src/lib/billing/hire-days.ts), so "overdue" and "charged" agree on every day. The terms are those
 * billing charges the trip by: the customer's tariff version in force on the day the bin was dispatched (its free
 * days, whether the first day counts, whether hire starts at the delivery or the dispatch). A customer with no
 * tariff in force that day falls back to its own free-days column and the default terms, which give the counts
 * above. `tripTermSql()` reads those terms in SQL, `overdueBackSql()` uses them.
 */
import type { LocalDate } from '@/lib/calendar';
import { DEFAULT_DAY_COUNT, hireDaysThrough, lastFreeDay as lastFreeHireDay, type DayCountTerms } from '@/lib/billing/hire-days';
import type { Status } from '@/lib/scans/lifecycle';
import type { HireStartEvent } from '@/lib/billing/hire-billing';

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
  /** The event the hire starts at (the customer's tariff): the delivery (the dispatch when it was never scanned) by default. */
  hireStartsAt?: HireStartEvent;
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

export function overdueBack({ status, deliveredOn, dispatchedOn, freeDays, today, dayCount = DEFAULT_DAY_COUNT, hireStartsAt = 'delivery' }: OverdueInput): OverdueCheck {
  const start = hireStartsAt === 'dispatch' ? dispatchedOn : (deliveredOn ?? dispatchedOn);
  if (!isWithCustomer(status) || start === null) return NOT_APPLICABLE;
  const freeUntil = lastFreeDay(start, freeDays, dayCount);
  // Records from the future (a clock off on a phone) count as zero days, never as negative ones.
  const daysWithCustomer = hireDaysThrough(start, today, dayCount);
  const daysOver = Math.max(0, daysWithCustomer - freeDays);
  return { applies: true, daysWithCustomer, daysOver, overdue: daysOver > 0, estimated: hireStartsAt === 'delivery' && deliveredOn === null, freeUntil };
}

/** A trip's hire terms as the overdue rule takes them (from the columns `tripTermsSelectSql()` names). */
export interface TripTerms {
  freeDays: number;
  dayCount: DayCountTerms;
  hireStartsAt: HireStartEvent;
}

/** The columns `tripTermsSelectSql()` adds to a row. */
export interface TripTermsRow {
  terms_free_days: number | null;
  terms_first_day_counts: boolean | null;
  terms_last_day_counts: boolean | null;
  terms_hire_starts_at: string | null;
}

export function tripTermsOf(row: TripTermsRow): TripTerms {
  return {
    freeDays: row.terms_free_days ?? 0,
    dayCount: {
      firstDayCounts: row.terms_first_day_counts ?? DEFAULT_DAY_COUNT.firstDayCounts,
      lastDayCounts: row.terms_last_day_counts ?? DEFAULT_DAY_COUNT.lastDayCounts,
    },
    hireStartsAt: row.terms_hire_starts_at === 'dispatch' ? 'dispatch' : 'delivery',
  };
}

/** The trip `t`'s customer's tariff version `v` in force on the local day of the dispatch (versions never overlap). */
function versionInForceSql(timeZone: string): string {
  const day = `(t.dispatched_at AT TIME ZONE ${timeZone})::date`;
  return `v.customer_id = t.customer_id AND v.valid_from <= ${day} AND (v.valid_to IS NULL OR v.valid_to >= ${day})`;
}

/**
 * One term of the trip `t` as SQL: the tariff version of the trip's customer in force on the local day of its
 * dispatch, else the customer's own column (`o`, free days) or the default. `timeZone` is an SQL expression.
 */
export function tripTermSql(term: 'free_days' | 'first_day_counts' | 'last_day_counts' | 'hire_starts_at', timeZone: string): string {
  const version = `(SELECT v.${term} FROM tariffs v WHERE ${versionInForceSql(timeZone)})`;
  const fallback = {
    free_days: 'o.free_days',
    first_day_counts: String(DEFAULT_DAY_COUNT.firstDayCounts),
    last_day_counts: String(DEFAULT_DAY_COUNT.lastDayCounts),
    hire_starts_at: "'delivery'",
  }[term];
  return `COALESCE(${version}, ${fallback})`;
}

/** The columns tripTermsOf() reads, for a SELECT list (needs `t` and `o` as overdueBackSql does). */
export function tripTermsSelectSql(timeZone: string): string {
  return (['free_days', 'first_day_counts', 'last_day_counts', 'hire_starts_at'] as const).map((c) => `${tripTermSql(c, timeZone)} AS terms_${c}`).join(', ');
}

/**
 * overdueBack(...).overdue as SQL, for queries that filter or count in the database (the fleet grid's
 * "Over free days", the planners' digest). `today` and `timeZone` are SQL expressions (bind parameters);
 * the query must alias the bin `a`, its current trip `t` (trips.id = a.current_trip_id, LEFT JOIN is fine)
 * and the bin's customer `o`. "More counted days since the start than free days" — today − start + k > free,
 * k = 1 when the first day counts — is written as "the start instant is before the first moment of local day
 * (today − free days + k)", so an index on the instant can serve it.
 * Checked against overdueBack() row by row in tests/integration/fleet/overdue-back-drift.test.ts.
 */
export function overdueBackSql(today: string, timeZone: string): string {
  const statuses = WITH_CUSTOMER_STATUSES.map((s) => `'${s}'`).join(', ');
  const by = (starts: string, freeDays: string, firstCounts: string) =>
    `CASE WHEN ${starts} = 'dispatch' THEN t.dispatched_at ELSE COALESCE(t.delivered_at, t.dispatched_at) END` +
    ` < ((${today} - ${freeDays} + CASE WHEN ${firstCounts} THEN 1 ELSE 0 END)::timestamp AT TIME ZONE ${timeZone})`;
  // One look-up of the version per bin (not one per term); without a version, the customer's column and the defaults.
  const version = `(SELECT ${by('v.hire_starts_at', 'v.free_days', 'v.first_day_counts')} FROM tariffs v WHERE ${versionInForceSql(timeZone)})`;
  const fallback = by("'delivery'", 'o.free_days', String(DEFAULT_DAY_COUNT.firstDayCounts));
  return `(a.status IN (${statuses}) AND COALESCE(${version}, ${fallback}))`;
}
