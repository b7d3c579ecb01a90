// The test-day plan of one depot: its bins due within the next months, each available from today when it
// stands at the depot, or from when it is expected back (dispatch day + the customer's usual days on hire)
// when it is out; planned by planTestDays() within the depot's capacity per weekday.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { addDays, addMonthsToDate, localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { planTestDays, type BinToTest, type TestDayPlan } from './test-day-plan';
import { usualDaysOnHire } from './dispatch-check.server';

export interface PlannedBin {
  id: string;
  grai: string;
  serial: string;
  status: string;
  dueOn: LocalDate;
  availableFrom: LocalDate;
  where: string;
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
  }>(
    `SELECT a.id, a.grai, a.serial, a.status, a.next_due::text, s.name AS site_name, t.customer_id,
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
  for (const r of rows) {
    let availableFrom = today;
    if (r.out_on && r.customer_id !== null) {
      if (!usual.has(r.customer_id)) usual.set(r.customer_id, await usualDaysOnHire(r.customer_id, settings.timeZone, today));
      const days = usual.get(r.customer_id);
      const back = days === null || days === undefined ? addDays(today, 1) : addDays(r.out_on, days);
      availableFrom = back > today ? back : addDays(today, 1);
    }
    const b: PlannedBin = { id: String(r.id), grai: r.grai, serial: r.serial, status: r.status, dueOn: r.next_due, availableFrom, where: r.site_name ?? 'on the road' };
    bins.set(b.id, b);
    toTest.push({ id: b.id, dueOn: b.dueOn, availableFrom });
  }
  const plan = planTestDays({ from: today, capacity: { perWeekday: depot.test_capacity }, bins: toTest });
  return { depot: { id: depot.id, name: depot.name, capacity: depot.test_capacity }, depots, today, until, months, plan, bins };
}
