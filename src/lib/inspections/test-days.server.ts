// The test-day plan of one depot: its bins due within the next months, each available from today when it
// stands at the depot, or from when it is expected back (dispatch day + the customer's usual days on hire)
// when it is out; planned by planTestDays() within the depot's capacity per weekday.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { addDays, addMonthsToDate, daysBetween, localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { expectedBackInDays, planTestDays, type BinToTest, type TestDayPlan } from './test-day-plan';
import { loadTripHistory } from '@/lib/planning/returns-forecast.server';
import { curveFor, fitReturnModel } from '@/lib/planning/returns-forecast';
import { usualDaysOnHire } from './dispatch-check.server';

export interface PlannedBin {
  id: string;
  grai: string;
  serial: string;
  status: string;
  dueOn: LocalDate;
  availableFrom: LocalDate;
  where: string;
  /** How the day it is back was worked out, for a bin out on hire. */
  backBy?: 'returns forecast' | 'usual days on hire';
}
export interface DepotTestPlan {
  depot: { id: number; name: string; capacity: number[] } | null;
  depots: Array<{ id: number; name: string }>;
  today: LocalDate;
  until: LocalDate;
  months: number;
  plan: TestDayPlan;
  bins: Map<string, PlannedBin>;
}

export async function depotTestPlan(depotId: number | null, months: number): Promise<DepotTestPlan> {
  const settings = await getSettings();
  const today = localDate(new Date(), settings.timeZone);
  const until = addMonthsToDate(today, months);
  const depots = await sequelize.query<{ id: number; name: string; test_capacity: number[] }>(
    `SELECT id, name, test_capacity FROM sites WHERE kind = 'depot' AND active ORDER BY name`,
    { type: QueryTypes.SELECT },
  );
  const depot = depots.find((d) => d.id === depotId) ?? depots[0] ?? null;
  const empty = { depot: null, depots, today, until, months, plan: { days: [], flagged: [] }, bins: new Map() };
  if (!depot) return empty;
  // At the depot, or out on a trip that left from it (it comes back there, as a rule).
  const rows = await sequelize.query<{
    id: number;
    grai: string;
    serial: string;
    status: string;
    next_due: string;
    site_name: string | null;
    customer_id: number | null;
    out_on: string | null;
    trip_site_id: number | null;
    bin_type_id: number;
  }>(
    `SELECT a.id, a.grai, a.serial, a.status, a.next_due::text, s.name AS site_name, t.customer_id, a.bin_type_id,
            coalesce(t.customer_site_id, t.discharge_site_id) AS trip_site_id,
            (t.dispatched_at AT TIME ZONE $3)::date::text AS out_on
       FROM assets a LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.status <> 'retired' AND a.next_due IS NOT NULL AND a.next_due <= $2
        AND (a.site_id = $1 OR (a.current_trip_id IS NOT NULL AND t.depot_site_id = $1))
      ORDER BY a.next_due, a.id`,
    { bind: [depot.id, until, settings.timeZone], type: QueryTypes.SELECT },
  );
  const usual = new Map<number, number | null>();
  const bins = new Map<string, PlannedBin>();
  const toTest: BinToTest[] = [];
  // Bins out on hire: expected back when the returns forecast's curve for their site says (its conditional
  // median); where it has nothing to say, the customer's usual days on hire from the trip history.
  const model = rows.some((r) => r.out_on) ? fitReturnModel(await loadTripHistory(), today) : null;
  for (const r of rows) {
    let availableFrom = today;
    let backBy: PlannedBin['backBy'];
    if (r.out_on && r.customer_id !== null) {
      const siteKey = r.trip_site_id !== null ? `site:${r.trip_site_id}` : `customer:${r.customer_id}`;
      const k = model ? expectedBackInDays(curveFor(model, siteKey, String(r.bin_type_id)).curve, Math.max(0, daysBetween(r.out_on, today))) : null;
      let back: LocalDate;
      if (k !== null) {
        back = addDays(today, k);
        backBy = 'returns forecast';
      } else {
        if (!usual.has(r.customer_id)) usual.set(r.customer_id, await usualDaysOnHire(r.customer_id, settings.timeZone, today));
        const days = usual.get(r.customer_id);
        back = days === null || days === undefined ? addDays(today, 1) : addDays(r.out_on, days);
        backBy = 'usual days on hire';
      }
      availableFrom = back > today ? back : addDays(today, 1);
    }
    const b: PlannedBin = { id: String(r.id), grai: r.grai, serial: r.serial, status: r.status, dueOn: r.next_due, availableFrom, where: r.site_name ?? 'on the road', backBy };
    bins.set(b.id, b);
    toTest.push({ id: b.id, dueOn: b.dueOn, availableFrom });
  }
  const plan = planTestDays({ from: today, capacity: { perWeekday: depot.test_capacity }, bins: toTest });
  return { depot: { id: depot.id, name: depot.name, capacity: depot.test_capacity }, depots, today, until, months, plan, bins };
}
