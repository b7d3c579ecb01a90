// The trip list: one page of rotations, sorted and filtered in PostgreSQL (never in the browser), from a
// query already checked by src/lib/trips/trip-list-query.ts. Column names come from the whitelist below and
// values travel as bind parameters, so nothing a visitor types reaches the SQL text.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { startOfLocalDay } from './bin-life.server';
import { AppError } from '@/lib/api-errors';
import { addDays, localDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import { cycleTimeDays, dwellAtCustomer, type DwellAtCustomer } from './trip-stats';
import { fillRecordText } from './trip-display';
import { sealCheck, sealMismatchSql, type SealCheck } from './seal-check';
import { pageCount, type TripListQuery, type TripSortKey } from './trip-list-query';
import { parseSerialisedGrai } from '@/lib/gs1';

export interface TripListRow {
  id: number;
  status: 'open' | 'closed';
  assetId: number;
  grai: string;
  serial: string;
  customerId: number;
  customerName: string;
  depotName: string;
  customerSiteName: string | null;
  dispatchedAt: string;
  deliveredAt: string | null;
  collectedAt: string | null;
  returnedAt: string | null;
  dispatchedOn: LocalDate;
  returnedOn: LocalDate | null;
  cycleDays: number | null;
  dwell: DwellAtCustomer | null;
  linerLotId: number | null;
  linerLotNumber: string | null;
  fill: string | null;
  sealsApplied: string[];
  sealsVerified: string[];
  seals: SealCheck;
}

export interface TripListPage {
  rows: TripListRow[];
  total: number;
  page: number;
  size: number;
  pages: number;
}

/** Bind parameters built as the SQL is written; the time zone is bound once, where first used. */
class Params {
  readonly values: unknown[] = [];
  private zoneRef: string | null = null;
  constructor(private readonly timeZone: string) {}
  add(value: unknown): string {
    this.values.push(value);
    return `$${this.values.length}`;
  }
  zone(): string {
    this.zoneRef ??= this.add(this.timeZone);
    return this.zoneRef;
  }
  /** A timestamp column's calendar date in the operator's zone. */
  local(column: string): string {
    return `(${column} AT TIME ZONE ${this.zone()})::date`;
  }
}

/** The whitelist: sort key → SQL expression. Anything not here is refused before a query is built. */
const SORT_SQL: Record<TripSortKey, (p: Params) => string> = {
  dispatched: () => 't.dispatched_at',
  returned: () => 't.returned_at',
  bin: () => `lpad(a.serial, 16, '0') COLLATE "C"`,
  customer: () => 'o.name',
  depot: () => 'ds.name',
  // The same calendar-day counts trip-stats.ts shows, so the order matches the numbers on the page.
  dwell: (p) => `(${p.local('coalesce(t.collected_at, t.returned_at)')} - ${p.local('coalesce(t.delivered_at, t.dispatched_at)')})`,
  cycle: (p) => `(${p.local('t.returned_at')} - ${p.local('t.dispatched_at')})`,
  lot: () => 'l.lot_number',
  status: () => 't.status',
  id: () => 't.id',
};

// A seal mismatch exactly as sealState() decides it (./seal-check.ts).
const SEAL_MISMATCH_SQL = sealMismatchSql('t');

const COLUMNS = `
  t.id, t.status, t.asset_id, a.grai, a.serial, t.customer_id, o.name AS customer_name, ds.name AS depot_name,
  cs.name AS customer_site_name, t.dispatched_at, t.delivered_at, t.collected_at, t.returned_at, t.liner_lot_id,
  l.lot_number, t.fill_product, t.fill_volume_l, t.fill_mass_kg, t.fill_temperature_c, t.seals_applied, t.seals_verified,
  t.seal_mismatch`;

const FROM = `
  FROM trips t
  JOIN assets a ON a.id = t.asset_id
  JOIN organisations o ON o.id = t.customer_id
  JOIN sites ds ON ds.id = t.depot_site_id
  LEFT JOIN sites cs ON cs.id = t.customer_site_id
  LEFT JOIN liner_lots l ON l.id = t.liner_lot_id`;

/** LIKE patterns treat % and _ as wildcards; a typed value must match literally. */
function likeLiteral(value: string): string {
  return value.replace(/[\\%_]/g, (c) => `\\${c}`);
}

function whereFor(query: TripListQuery, p: Params, prefixLength: number): string {
  const clauses: string[] = [];
  const f = query.filters;
  if (f.status) clauses.push(`t.status = ${p.add(f.status)}`);
  if (f.customer !== undefined) clauses.push(`t.customer_id = ${p.add(f.customer)}`);
  if (f.depot !== undefined) clauses.push(`t.depot_site_id = ${p.add(f.depot)}`);
  if (f.bin) {
    // A whole GRAI in any written form (grouped, a label's Digital Link) names one bin; anything else is
    // the beginning of a serial.
    const grai = parseSerialisedGrai(f.bin, { companyPrefixLength: prefixLength });
    if (grai.ok) clauses.push(`a.grai = ${p.add(grai.grai.value)}`);
    else clauses.push(`a.serial ILIKE ${p.add(likeLiteral(f.bin))} || '%'`);
  }
  if (f.lot) clauses.push(`l.lot_number ILIKE ${p.add(likeLiteral(f.lot))} || '%'`);
  if (f.from) clauses.push(`t.dispatched_at >= ${startOfLocalDay(p.add(f.from), p.zone())}`);
  if (f.to) clauses.push(`t.dispatched_at < ${startOfLocalDay(p.add(addDays(f.to, 1)), p.zone())}`);
  if (f.mismatch) clauses.push(SEAL_MISMATCH_SQL);
  return clauses.length ? `WHERE ${clauses.join(' AND ')}` : '';
}

interface Row {
  id: number;
  status: 'open' | 'closed';
  asset_id: number;
  grai: string;
  serial: string;
  customer_id: number;
  customer_name: string;
  depot_name: string;
  customer_site_name: string | null;
  dispatched_at: Date;
  delivered_at: Date | null;
  collected_at: Date | null;
  returned_at: Date | null;
  liner_lot_id: number | null;
  lot_number: string | null;
  fill_product: string | null;
  fill_volume_l: string | null;
  fill_mass_kg: string | null;
  fill_temperature_c: string | null;
  seals_applied: string[];
  seals_verified: string[];
  seal_mismatch: boolean;
}

const iso = (v: Date | string | null) => (v === null ? null : new Date(v).toISOString());

function toRow(r: Row, timeZone: string): TripListRow {
  const times = { dispatchedAt: iso(r.dispatched_at)!, deliveredAt: iso(r.delivered_at), collectedAt: iso(r.collected_at), returnedAt: iso(r.returned_at) };
  const forStats = { assetId: String(r.asset_id), customerId: String(r.customer_id), depotId: '', ...times };
  return {
    id: r.id,
    status: r.status,
    assetId: r.asset_id,
    grai: r.grai,
    serial: r.serial,
    customerId: r.customer_id,
    customerName: r.customer_name,
    depotName: r.depot_name,
    customerSiteName: r.customer_site_name,
    ...times,
    dispatchedOn: localDate(times.dispatchedAt, timeZone),
    returnedOn: times.returnedAt ? localDate(times.returnedAt, timeZone) : null,
    cycleDays: cycleTimeDays(forStats, timeZone),
    dwell: dwellAtCustomer(forStats, timeZone),
    linerLotId: r.liner_lot_id,
    linerLotNumber: r.lot_number,
    fill: fillRecordText({ product: r.fill_product, volumeL: r.fill_volume_l, massKg: r.fill_mass_kg, temperatureC: r.fill_temperature_c }),
    sealsApplied: r.seals_applied ?? [],
    sealsVerified: r.seals_verified ?? [],
    seals: sealCheck(r.seals_applied ?? [], r.seals_verified ?? [], r.seal_mismatch),
  };
}

export async function listTrips(query: TripListQuery): Promise<TripListPage> {
  if (!Object.hasOwn(SORT_SQL, query.sort)) throw new AppError('bad_request', `The trip list cannot be sorted by "${query.sort}".`);
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const { timeZone, gs1PrefixLength } = await getSettings();
  const p = new Params(timeZone);
  const where = whereFor(query, p, gs1PrefixLength);
  const countBind = [...p.values];
  const order = SORT_SQL[query.sort](p);
  const [counted] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${FROM} ${where}`, { bind: countBind, type: QueryTypes.SELECT });
  const total = counted?.n ?? 0;
  const pages = pageCount(total, query.size);
  const rows = await sequelize.query<Row>(
    `SELECT ${COLUMNS}
       ${FROM} ${where}
      ORDER BY ${order} ${dir} NULLS LAST, t.id ${dir}
      LIMIT ${p.add(query.size)} OFFSET ${p.add((query.page - 1) * query.size)}`,
    { bind: p.values, type: QueryTypes.SELECT },
  );
  return { rows: rows.map((r) => toRow(r, timeZone)), total, page: query.page, size: query.size, pages };
}

/** One trip as a list row (the trip page builds on it); null when there is no such trip. */
export async function tripRowById(id: number): Promise<TripListRow | null> {
  const { timeZone } = await getSettings();
  const [row] = await sequelize.query<Row>(`SELECT ${COLUMNS} ${FROM} WHERE t.id = $1`, { bind: [id], type: QueryTypes.SELECT });
  return row ? toRow(row, timeZone) : null;
}
