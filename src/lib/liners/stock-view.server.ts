// The liner stock page's figures: per depot and liner spec, what is on the shelf, on its way, taken by
// the order book and forecast, the reorder plan and the lots in first-expiry order with their projected
// use-up day, liners at risk and a proposed transfer. Reads the ledger, the order book and the supplier
// terms; every computation is in liner-stock.ts.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { getSettings } from '@/lib/settings/settings.server';
import { addDays, localDate, type LocalDate } from '@/lib/calendar';
import { DEMAND_STATUSES_SQL } from '@/lib/planning/order-status';
import {
  daysOfCover,
  forecastFromDaily,
  knownDemandByDay,
  planReorder,
  projectFefo,
  proposeTransfer,
  unplannedDaily,
  type Demand,
  type DemandOrder,
  type DepotStockPicture,
  type LotProjection,
  type ReorderPlan,
  type StockLot,
  type TransferProposal,
} from './liner-stock';
import { specMeetsGrade } from './liner-specs';
import { onOrderBy } from './purchase-orders.server';

/** Days of the order book counted as known demand. */
export const HORIZON_DAYS = 28;
/** Days of ledger history behind the forecast. */
export const HISTORY_DAYS = 56;
/** Cycle service level of the reorder point. */
export const SERVICE_LEVEL = 0.95;
/** Holding cost a year as a share of the liner's price (common practice: carrying costs of 20–30 % a year). */
export const HOLDING_SHARE = 0.25;

interface LotRow {
  site_id: number;
  lot_id: number;
  lot_number: string;
  expiry_date: string;
  status: string;
  spec_id: number | null;
  on_hand: number;
  supplier: string;
}
interface SpecRow {
  id: number;
  code: string;
  name: string;
  food_contact: boolean;
  max_fill_temp_c: number | null;
  supplier_id: number | null;
  supplier: string | null;
  lead_time_days: number | null;
  order_cost: string | null;
  pack_size: number | null;
  min_order_qty: number | null;
  price_per_liner: string | null;
  order_email: string | null;
}

export interface LotLine extends LotProjection {
  status: string;
  supplier: string;
  transfer: TransferProposal | null;
}

export interface SpecStock {
  specId: number | null;
  code: string;
  name: string;
  supplier: string | null;
  onHand: number;
  inTransit: number;
  /** Liners still to come on open purchase orders. */
  onOrder: number;
  /** Liners the open orders served from the depot take within the horizon (one per bin still to go out). */
  allocated: number;
  forecastPerDay: number;
  forecastSd: number;
  daysOfCover: number;
  plan: ReorderPlan | null;
  /** Why there is no plan (no supplier terms). */
  planMissing: string | null;
  leadTimeDays: number | null;
  pack: { packSize: number; minimumOrder: number } | null;
  lots: LotLine[];
  /** Lots not usable now (on hold, recalled, expired) still on the shelf. */
  blocked: Array<{ lotId: number; lotNumber: string; status: string; onHand: number; expiryDate: string }>;
}

export interface DepotStock {
  siteId: number;
  name: string;
  specs: SpecStock[];
}
export interface StockPicture {
  today: LocalDate;
  depots: DepotStock[];
}

const rows = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

/** Every depot's liner stock, by spec (the pool-wide view; one depot's page takes its own entry). */
export async function stockPicture(now = new Date()): Promise<StockPicture> {
  const { timeZone } = await getSettings();
  const today = localDate(now, timeZone);
  const horizonEnd = addDays(today, HORIZON_DAYS - 1);
  const since = addDays(today, -HISTORY_DAYS);
  const [depots, lots, specs, transit, orders, lined, used, planned, listed, onOrder] = await Promise.all([
    rows<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'depot' AND active ORDER BY name`),
    rows<LotRow>(
      `SELECT m.site_id, l.id AS lot_id, l.lot_number, to_char(l.expiry_date, 'YYYY-MM-DD') AS expiry_date, l.status, l.liner_spec_id AS spec_id, l.supplier,
              sum(m.quantity)::int AS on_hand
         FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
        GROUP BY m.site_id, l.id HAVING sum(m.quantity) > 0`,
    ),
    rows<SpecRow>(
      `SELECT s.id, s.code, s.name, s.food_contact, s.max_fill_temp_c, s.supplier_id, sup.name AS supplier, sup.lead_time_days, sup.order_cost,
              sup.pack_size, sup.min_order_qty, sup.price_per_liner, sup.order_email
         FROM liner_specs s LEFT JOIN liner_suppliers sup ON sup.id = s.supplier_id ORDER BY s.code`,
    ),
    rows<{ site_id: number; spec_id: number | null; n: number }>(
      `SELECT m.to_site_id AS site_id, l.liner_spec_id AS spec_id, (-sum(m.quantity))::int AS n
         FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
        WHERE m.kind = 'sent' AND NOT EXISTS (SELECT 1 FROM liner_moves a WHERE a.sent_move_id = m.id)
        GROUP BY 1, 2`,
    ),
    rows<{ depot_site_id: number; bin_type_id: number; needed_by: string; bins: number; food: boolean; temp: number | null }>(
      `SELECT ho.depot_site_id, ho.bin_type_id, to_char(ho.needed_by, 'YYYY-MM-DD') AS needed_by, ho.liner_food_contact AS food, ho.liner_max_fill_temp_c AS temp,
              GREATEST(ho.quantity - (SELECT count(*)::int FROM trips t WHERE t.hire_order_id = ho.id), 0) AS bins
         FROM hire_orders ho WHERE ho.status IN (${DEMAND_STATUSES_SQL}) AND ho.needed_by <= $1::date ORDER BY ho.needed_by, ho.id`,
      [horizonEnd],
    ),
    rows<{ site_id: number; spec_id: number | null; n: number }>(
      `SELECT a.site_id, l.liner_spec_id AS spec_id, count(*)::int AS n FROM assets a JOIN liner_lots l ON l.id = a.liner_lot_id
        WHERE a.status = 'prepared' AND a.current_trip_id IS NULL GROUP BY 1, 2`,
    ),
    // Liners used per day: fits and kits, less fits reversed.
    rows<{ site_id: number; spec_id: number | null; day: string; n: number }>(
      `SELECT m.site_id, l.liner_spec_id AS spec_id, to_char((m.occurred_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS day, (-sum(m.quantity))::int AS n
         FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
        WHERE (m.kind IN ('fitted', 'kit_sent') OR (m.kind = 'reversal' AND m.quantity > 0)) AND m.occurred_at >= ($1::date AT TIME ZONE $2)
        GROUP BY 1, 2, 3`,
      [since, timeZone],
    ),
    // Bins sent out that day on orders the book held at least a lead time (of the spec's supplier, else 14 days) before.
    rows<{ site_id: number; spec_id: number | null; day: string; n: number }>(
      `SELECT t.depot_site_id AS site_id, l.liner_spec_id AS spec_id, to_char((t.dispatched_at AT TIME ZONE $2)::date, 'YYYY-MM-DD') AS day, count(*)::int AS n
         FROM trips t JOIN hire_orders ho ON ho.id = t.hire_order_id JOIN liner_lots l ON l.id = t.liner_lot_id
         LEFT JOIN liner_specs s ON s.id = l.liner_spec_id LEFT JOIN liner_suppliers sup ON sup.id = s.supplier_id
        WHERE t.dispatched_at >= ($1::date AT TIME ZONE $2) AND ho.created_at <= t.dispatched_at - make_interval(days => COALESCE(sup.lead_time_days, 14))
        GROUP BY 1, 2, 3`,
      [since, timeZone],
    ),
    rows<{ bin_type_id: number; spec_id: number }>('SELECT bin_type_id, liner_spec_id AS spec_id FROM bin_type_liner_specs'),
    onOrderBy(),
  ]);

  const key = (site: number, spec: number | null) => `${site}:${spec ?? 'none'}`;
  const specById = new Map(specs.map((s) => [s.id, s]));
  const stockBy = new Map<string, number>();
  for (const l of lots) if (l.status === 'released' && l.expiry_date >= today) stockBy.set(key(l.site_id, l.spec_id), (stockBy.get(key(l.site_id, l.spec_id)) ?? 0) + l.on_hand);

  // Each order's bins take liners of one spec: a spec the bin type lists (any when it lists none) that meets
  // the order's grade, the one the depot holds most of (then the lowest code) — the spec the yard would reach for.
  const listedBy = new Map<number, number[]>();
  for (const r of listed) listedBy.set(r.bin_type_id, [...(listedBy.get(r.bin_type_id) ?? []), r.spec_id]);
  const ordersBy = new Map<string, DemandOrder[]>();
  for (const o of orders) {
    if (o.bins === 0) continue;
    const candidates = (listedBy.get(o.bin_type_id) ?? specs.map((s) => s.id))
      .map((id) => specById.get(id)!)
      .filter((s) => s && specMeetsGrade({ foodContact: s.food_contact, maxFillTempC: s.max_fill_temp_c }, { foodContact: o.food, maxFillTempC: o.temp }))
      .sort((a, b) => (stockBy.get(key(o.depot_site_id, b.id)) ?? 0) - (stockBy.get(key(o.depot_site_id, a.id)) ?? 0) || a.code.localeCompare(b.code));
    const k = key(o.depot_site_id, candidates[0]?.id ?? null);
    ordersBy.set(k, [...(ordersBy.get(k) ?? []), { neededBy: o.needed_by, bins: o.bins }]);
  }
  const count = (list: Array<{ site_id: number; spec_id: number | null; n: number }>) => new Map(list.map((r) => [key(r.site_id, r.spec_id), r.n]));
  const transitBy = count(transit);
  const linedBy = count(lined);
  const daily = (list: Array<{ site_id: number; spec_id: number | null; day: string; n: number }>) => {
    const m = new Map<string, Map<string, number>>();
    for (const r of list) {
      const k = key(r.site_id, r.spec_id);
      if (!m.has(k)) m.set(k, new Map());
      m.get(k)!.set(r.day, r.n);
    }
    return m;
  };
  const usedBy = daily(used);
  const plannedBy = daily(planned);
  const historyDays = Array.from({ length: HISTORY_DAYS }, (_, i) => addDays(since, i));

  // Which depot × spec pairs to show: any with stock, liners on the way, orders or recent use.
  const pairs = new Set<string>([...lots.map((l) => key(l.site_id, l.spec_id)), ...transitBy.keys(), ...ordersBy.keys(), ...usedBy.keys(), ...onOrder.keys()]);
  const pictures = new Map<string, { lots: StockLot[]; demand: Demand; all: LotRow[] }>();
  for (const d of depots) {
    for (const specId of [...specs.map((s) => s.id), null]) {
      const k = key(d.id, specId);
      if (!pairs.has(k)) continue;
      const known = knownDemandByDay(ordersBy.get(k) ?? [], { today, horizonDays: HORIZON_DAYS, linedReady: linedBy.get(k) ?? 0 });
      const forecast = forecastFromDaily(unplannedDaily(historyDays.map((day) => ({ consumed: usedBy.get(k)?.get(day) ?? 0, planned: plannedBy.get(k)?.get(day) ?? 0 }))));
      const all = lots.filter((l) => l.site_id === d.id && l.spec_id === specId);
      const usable = all.filter((l) => l.status === 'released' && l.expiry_date >= today);
      pictures.set(k, { lots: usable.map((l) => ({ lotId: l.lot_id, lotNumber: l.lot_number, onHand: l.on_hand, expiryDate: l.expiry_date })), demand: { known, forecast }, all });
    }
  }

  const out: DepotStock[] = depots.map((d) => ({ siteId: d.id, name: d.name, specs: [] }));
  for (const depot of out) {
    for (const specId of [...specs.map((s) => s.id), null]) {
      const k = key(depot.siteId, specId);
      const p = pictures.get(k);
      if (!p) continue;
      const spec = specId === null ? null : specById.get(specId)!;
      const others: DepotStockPicture[] = out
        .filter((o) => o.siteId !== depot.siteId && pictures.has(key(o.siteId, specId)))
        .map((o) => ({ siteId: o.siteId, name: o.name, ...pictures.get(key(o.siteId, specId))! }));
      const onHand = p.lots.reduce((s, l) => s + l.onHand, 0);
      const inTransit = transitBy.get(k) ?? 0;
      const ordered = onOrder.get(k) ?? 0;
      const terms = spec && spec.lead_time_days !== null ? spec : null;
      const plan = terms
        ? planReorder({
            demand: p.demand,
            leadTimeDays: terms.lead_time_days!,
            serviceLevel: SERVICE_LEVEL,
            inventoryPosition: onHand + inTransit + ordered,
            orderCost: Number(terms.order_cost),
            holdingCostPerUnitYear: Math.max(0.01, Number(terms.price_per_liner) * HOLDING_SHARE),
            pack: { packSize: terms.pack_size!, minimumOrder: terms.min_order_qty! },
          })
        : null;
      const projected = projectFefo(p.lots, p.demand, { today });
      const supplierOf = new Map(p.all.map((l) => [l.lot_id, l.supplier]));
      depot.specs.push({
        specId,
        code: spec?.code ?? 'No spec',
        name: spec?.name ?? 'Lots received before specs were recorded',
        supplier: spec?.supplier ?? null,
        onHand,
        inTransit,
        onOrder: ordered,
        allocated: p.demand.known.reduce((s, v) => s + v, 0),
        forecastPerDay: p.demand.forecast.mean,
        forecastSd: p.demand.forecast.sd,
        daysOfCover: daysOfCover(onHand, p.demand),
        plan,
        planMissing: plan ? null : spec ? `No supplier terms for ${spec.code}: give it a supplier on the liner specs page.` : 'Lots without a spec have no supplier terms.',
        leadTimeDays: terms?.lead_time_days ?? null,
        pack: terms ? { packSize: terms.pack_size!, minimumOrder: terms.min_order_qty! } : null,
        lots: projected.map((l) => ({
          ...l,
          status: 'released',
          supplier: supplierOf.get(l.lotId) ?? '',
          transfer: l.atRisk > 0 ? proposeTransfer(l, l.atRisk, others, { today }) : null,
        })),
        blocked: p.all
          .filter((l) => l.status !== 'released' || l.expiry_date < today)
          .map((l) => ({
            lotId: l.lot_id,
            lotNumber: l.lot_number,
            status: l.expiry_date < today && l.status === 'released' ? 'expired' : l.status,
            onHand: l.on_hand,
            expiryDate: l.expiry_date,
          })),
      });
    }
  }
  return { today, depots: out };
}

export interface LedgerFilter {
  siteId: number;
  kind?: string;
  lot?: string;
  from?: string;
  to?: string;
  limit?: number;
}
export interface LedgerLine {
  id: number;
  occurredAt: Date;
  kind: string;
  lotNumber: string;
  quantity: number;
  counted: number | null;
  expected: number | null;
  reason: string | null;
  grai: string | null;
  otherSite: string | null;
  orderRef: string | null;
  who: string | null;
}

/** The depot's stock moves, newest first, filtered by kind, lot number (prefix) and local dates. */
export async function ledgerAt(f: LedgerFilter): Promise<LedgerLine[]> {
  const { timeZone } = await getSettings();
  const bind: unknown[] = [f.siteId, timeZone];
  const where = ['m.site_id = $1', '$2::text IS NOT NULL'];
  if (f.kind) where.push(`m.kind = $${bind.push(f.kind)}`);
  if (f.lot) where.push(`l.lot_number ILIKE $${bind.push(`${f.lot.replace(/[\\%_]/g, '\\$&')}%`)}`);
  if (f.from) where.push(`m.occurred_at >= ($${bind.push(f.from)}::date AT TIME ZONE $2)`);
  if (f.to) where.push(`m.occurred_at < (($${bind.push(f.to)}::date + 1) AT TIME ZONE $2)`);
  return rows<LedgerLine>(
    `SELECT m.id::int AS id, m.occurred_at AS "occurredAt", m.kind, l.lot_number AS "lotNumber", m.quantity, m.counted, m.expected, m.reason,
            a.grai, COALESCE(ts.name, fs.name) AS "otherSite", ho.reference AS "orderRef", u.name AS who
       FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id
       LEFT JOIN assets a ON a.id = m.asset_id
       LEFT JOIN sites ts ON ts.id = m.to_site_id
       LEFT JOIN liner_moves sm ON sm.id = m.sent_move_id LEFT JOIN sites fs ON fs.id = sm.site_id
       LEFT JOIN hire_orders ho ON ho.id = m.hire_order_id
       LEFT JOIN users u ON u.id = m.user_id
      WHERE ${where.join(' AND ')}
      ORDER BY m.occurred_at DESC, m.id DESC LIMIT $${bind.push(f.limit ?? 200)}`,
    bind,
  );
}

export interface CountDifference {
  occurredAt: Date;
  lotNumber: string;
  counted: number;
  expected: number;
  who: string | null;
  note: string | null;
}

/** Stock counts at the depot that found a difference (the adjustment they made), newest first. */
export async function countDifferences(siteId: number, limit = 20): Promise<CountDifference[]> {
  return rows<CountDifference>(
    `SELECT m.occurred_at AS "occurredAt", l.lot_number AS "lotNumber", m.counted, m.expected, u.name AS who, m.reason AS note
       FROM liner_moves m JOIN liner_lots l ON l.id = m.lot_id LEFT JOIN users u ON u.id = m.user_id
      WHERE m.site_id = $1 AND m.kind = 'counted' AND m.quantity <> 0 ORDER BY m.occurred_at DESC, m.id DESC LIMIT $2`,
    [siteId, limit],
  );
}
