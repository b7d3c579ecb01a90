// The lapse check before a hire dispatch, with the facts it needs from the database: the bin's fill limit
// (test due date, or the end of its inner receptacle's period of use), the order's wanted date, and the
// customer's usual days on hire. The rules are pure (dispatch-check.ts, service-life.ts).
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { kaplanMeier } from '@/lib/planning/returns-forecast';
import { policyForBinType } from '@/lib/bins/bin-policy';
import { checkDispatch, daysOnHireFromCurve, daysOnHireFromTrips, type DispatchCheck } from './dispatch-check';
import { fillLimit, serviceLifeEnd } from './service-life';

/** How many of the customer's latest trips the usual days on hire rest on. */
const RECENT_TRIPS = 400;

/**
 * The customer's usual days on hire (90th percentile): from the Kaplan–Meier curve of its trips (open ones
 * counted as still out), as the returns forecast reads them; where that curve never drops to 10 % (too many
 * still out), the nearest rank over its returned trips; null without any trip.
 */
export async function usualDaysOnHire(customerId: number, timeZone: string, today: string, t?: Transaction): Promise<number | null> {
  const rows = await sequelize.query<{ days: number; returned: boolean }>(
    `SELECT (COALESCE((returned_at AT TIME ZONE $2)::date, $3::date) - (dispatched_at AT TIME ZONE $2)::date)::int AS days, returned_at IS NOT NULL AS returned
       FROM trips WHERE customer_id = $1 ORDER BY dispatched_at DESC LIMIT ${RECENT_TRIPS}`,
    { bind: [customerId, timeZone, today], type: QueryTypes.SELECT, transaction: t },
  );
  const spells = rows.filter((r) => r.days >= 0);
  if (spells.length === 0) return null;
  return daysOnHireFromCurve(kaplanMeier(spells)) ?? daysOnHireFromTrips(spells.filter((s) => s.returned).map((s) => s.days));
}

export async function dispatchLapseCheck(
  assetId: number,
  order: { customer_id: number; needed_by: string },
  today: string,
  timeZone: string,
  t: Transaction,
): Promise<DispatchCheck> {
  const [bin] = await sequelize.query<{
    next_due: string | null;
    inner_made_month: string | null;
    service_life_applies: boolean;
    service_life_years: number;
    policy_kind: 'un' | 'own';
    intermediate_months: number;
    full_months: number;
  }>(
    `SELECT a.next_due::text, a.inner_made_month::text, bt.service_life_applies, bt.service_life_years, bt.policy_kind, bt.intermediate_months, bt.full_months
       FROM assets a JOIN bin_types bt ON bt.id = a.bin_type_id WHERE a.id = $1`,
    { bind: [assetId], type: QueryTypes.SELECT, transaction: t },
  );
  const policy = { applies: bin!.service_life_applies, years: bin!.service_life_years };
  // A type under 4.1.1.15 whose bin has no inner month on record: its period cannot be shown, so none is assumed.
  const lifeEnds = policy.applies && bin!.inner_made_month ? serviceLifeEnd(policy, bin!.inner_made_month.slice(0, 7)) : null;
  return checkDispatch({
    limit: fillLimit(bin!.next_due, lifeEnds),
    today,
    wantedOn: order.needed_by,
    usualDaysOnHire: await usualDaysOnHire(order.customer_id, timeZone, today, t),
    policy: policyForBinType({ policyKind: bin!.policy_kind, intermediateMonths: bin!.intermediate_months, fullMonths: bin!.full_months }),
  });
}
