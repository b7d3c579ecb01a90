/**
 * Reads what the repositioning plan works from — depots and customer sites with their coordinates, empties in the
 * depots and waiting at customers, confirmed orders still to load, the trip history for the returns forecast —
 * and hands it to the pure planner (`repositioning.ts`), which solves on the solver's worker thread.
 */
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { addDays, localDate, type LocalDate } from '@/lib/calendar';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';
import { loadTripHistory } from './returns-forecast.server';
import { binsOutAsOf, fitReturnModel, forecastReturns, type DepotForecast } from './returns-forecast';
import { loadCapacity, STANDARD_TRAILER } from './load-plan';
import { binTypesForLoading } from './bin-types-for-loading.server';
import { depotBalance, planRepositioning, type RepoBinType, type RepoDepot, type RepoSite, type RepositioningPlan } from './repositioning';
import { solveTruckPlanOffThread } from './plan-solver.server';
import type { PlanSettings } from './repositioning-settings';

interface SiteRow {
  id: number;
  name: string;
  kind: string;
  lat: number | null;
  lon: number | null;
}
interface CountRow {
  site_id: number;
  bin_type_id: number;
  n: number;
}

export interface DepotRow {
  key: string;
  name: string;
  type: string;
  onHand: number;
  needed: number;
  backByHorizon: number;
  shortage: number;
  shortOn: LocalDate | null;
  spare: number;
}

export interface RepositioningView {
  today: LocalDate;
  horizonEnd: LocalDate;
  settings: PlanSettings;
  types: Array<RepoBinType & { limitedBy: string }>;
  depots: Array<{ key: string; name: string; lat: number; lon: number }>;
  sites: Array<{ key: string; name: string; lat: number; lon: number; awaiting: number }>;
  /** Sites left out because they have no coordinates. */
  unplaced: string[];
  rows: DepotRow[];
  forecast: Array<DepotForecast & { name: string }>;
  result: RepositioningPlan;
  seconds: number;
}

const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

export async function repositioningView(settings: PlanSettings, now = new Date()): Promise<RepositioningView> {
  const t0 = performance.now();
  const { timeZone } = await getSettings();
  const today = localDate(now, timeZone);
  const horizonEnd = addDays(today, settings.horizonDays);
  const [sites, typeRows, onHand, awaiting, history] = await Promise.all([
    q<SiteRow>(`SELECT id, name, kind, latitude::float8 AS lat, longitude::float8 AS lon FROM sites WHERE active AND kind IN ('depot', 'customer') ORDER BY name`),
    binTypesForLoading(),
    q<CountRow>(`SELECT a.site_id, a.bin_type_id, count(*)::int AS n FROM assets a JOIN sites s ON s.id = a.site_id
                  WHERE s.kind = 'depot' AND a.status IN ('available', 'prepared') GROUP BY 1, 2`),
    q<CountRow>(`SELECT a.site_id, a.bin_type_id, count(*)::int AS n FROM assets a JOIN sites s ON s.id = a.site_id
                  WHERE s.kind = 'customer' AND a.status = 'awaiting_collection' GROUP BY 1, 2`),
    loadTripHistory(),
  ]);

  const types = typeRows.flatMap((t) => {
    const cap = loadCapacity(STANDARD_TRAILER, t.bin, { kind: 'folded' });
    return cap.ok ? [{ key: String(t.id), name: t.name, truckCapacity: cap.bins, limitedBy: cap.explanation }] : [];
  });
  const placed = sites.filter((s) => s.lat !== null && s.lon !== null);
  const depotSites = placed.filter((s) => s.kind === 'depot');
  // Bins still to go out on the depots' confirmed orders wanted by the horizon's end (the yard's own list of open
  // orders, so both count the same); an order already late counts today.
  const orders = new Map(await Promise.all(depotSites.map(async (d) => [d.id, await openOrdersAt(d.id, { neededBy: horizonEnd })] as const)));
  const count = (rows: CountRow[]) => {
    const m = new Map<string, number>();
    for (const r of rows) m.set(`${r.site_id}:${r.bin_type_id}`, r.n);
    return (site: number, type: string) => m.get(`${site}:${type}`) ?? 0;
  };
  const held = count(onHand);
  const waiting = count(awaiting);

  // Expected returns per depot and bin type at the forecast's low quantile, cumulative by date.
  const model = fitReturnModel(history, today);
  const out = binsOutAsOf(history, today);
  const lowBy = new Map<string, Map<LocalDate, number>>();
  for (const t of types) {
    for (const f of forecastReturns(
      model,
      out.filter((b) => b.binTypeKey === t.key),
      { asOf: today, horizonDays: settings.horizonDays },
    )) {
      lowBy.set(`${f.depotKey}:${t.key}`, new Map(f.days.map((d) => [d.date, d.cumulativeLow])));
    }
  }
  const returnsBy = (depot: number, type: string) => (date: LocalDate) => lowBy.get(`${depot}:${type}`)?.get(date) ?? 0;

  const rows: DepotRow[] = [];
  const depots: RepoDepot[] = depotSites.map((s) => {
    const balance: RepoDepot['balance'] = {};
    for (const t of types) {
      const mine = (orders.get(s.id) ?? [])
        .filter((o) => String(o.binTypeId) === t.key)
        .map((o) => ({ date: o.neededBy < today ? today : o.neededBy, bins: Math.max(0, o.quantity - o.loaded) }));
      const b = depotBalance({ onHand: held(s.id, t.key), needs: mine, returnsBy: returnsBy(s.id, t.key) });
      balance[t.key] = b;
      const backByHorizon = returnsBy(s.id, t.key)(horizonEnd);
      if (held(s.id, t.key) || b.needed || backByHorizon) {
        rows.push({
          key: String(s.id),
          name: s.name,
          type: t.name,
          onHand: held(s.id, t.key),
          needed: b.needed,
          backByHorizon,
          shortage: b.shortage,
          shortOn: b.shortOn,
          spare: b.spare,
        });
      }
    }
    return { key: String(s.id), name: s.name, point: { lat: s.lat!, lon: s.lon! }, balance };
  });
  const customerSites: RepoSite[] = placed
    .filter((s) => s.kind === 'customer' && types.some((t) => waiting(s.id, t.key) > 0))
    .map((s) => ({ key: String(s.id), name: s.name, point: { lat: s.lat!, lon: s.lon! }, awaiting: Object.fromEntries(types.map((t) => [t.key, waiting(s.id, t.key)])) }));

  const result = await planRepositioning({ types, depots, sites: customerSites, costPerKm: settings.costPerKm, roadFactor: settings.roadFactor }, (input) =>
    solveTruckPlanOffThread(input, { timeLimit: settings.timeLimitSeconds, mipRelGap: settings.mipRelGap }),
  );
  const names = new Map(sites.map((s) => [String(s.id), s.name]));
  return {
    today,
    horizonEnd,
    settings,
    types,
    depots: depotSites.map((s) => ({ key: String(s.id), name: s.name, lat: s.lat!, lon: s.lon! })),
    sites: customerSites.map((s) => ({ key: s.key, name: s.name, lat: s.point.lat, lon: s.point.lon, awaiting: Object.values(s.awaiting).reduce((a, b) => a + b, 0) })),
    unplaced: sites.filter((s) => s.lat === null || s.lon === null).map((s) => s.name),
    rows,
    forecast: forecastReturns(model, out, { asOf: today, horizonDays: settings.horizonDays }).map((f) => ({ ...f, name: names.get(f.depotKey) ?? `site ${f.depotKey}` })),
    result,
    seconds: Math.round(performance.now() - t0) / 1000,
  };
}
