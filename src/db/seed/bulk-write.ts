// Writes the in-memory demo pool (pool-sim.ts) in a few multi-row INSERTs
// inside the caller's transaction: parents before children, explicit ids
// handed out in memory from each table's sequence, the sequences moved past
// them at the end. About 50,000 log entries take a few seconds this way,
// against minutes as one scan transaction each.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { IdSource, type PoolSim } from './pool-sim';

export interface SimInspection {
  id: number;
  asset_id: number;
  kind: 'intermediate' | 'full';
  performed_on: string;
  inspector_id: number | null;
  site_id: number | null;
  checklist: Record<string, boolean>;
  leak_test_pressure_kpa: string;
  leak_test_minutes: string;
  leak_test_passed: boolean;
  outcome: 'pass';
  next_intermediate_due: string | null;
  next_full_due: string | null;
  scan_event_id: number;
  recorded_by: number | null;
}

/** Where each table's id sequence stands: ids are handed out in memory from there. */
export async function nextIds(tables: string[], t: Transaction): Promise<IdSource> {
  const starts: Record<string, number> = {};
  for (const table of tables) {
    const [row] = await sequelize.query<{ n: string }>(`SELECT nextval(pg_get_serial_sequence($1, 'id')) AS n`, { bind: [table], type: QueryTypes.SELECT, transaction: t });
    starts[table] = Number(row!.n);
  }
  return new IdSource(starts);
}

const ROWS_PER_STATEMENT = 10_000;

/** Column types as PostgreSQL names them (udt_name: int4, text, timestamptz, jsonb, _text for text[] …). */
async function columnTypes(table: string, t: Transaction): Promise<Map<string, string>> {
  const rows = await sequelize.query<{ column_name: string; udt_name: string }>(
    `SELECT column_name, udt_name FROM information_schema.columns WHERE table_schema = 'public' AND table_name = $1`,
    { bind: [table], type: QueryTypes.SELECT, transaction: t },
  );
  return new Map(rows.map((r) => [r.column_name, r.udt_name]));
}

/** A PostgreSQL array literal of strings ('{"a","b"}'), for array columns sent through unnest as text. */
function arrayLiteral(items: readonly string[]): string {
  return `{${items.map((s) => `"${s.replace(/["\\]/g, '\\$&')}"`).join(',')}}`;
}

/**
 * Inserts `rows` (objects keyed by column) with one bind parameter per column:
 * `INSERT … SELECT FROM unnest($1::int4[], $2::text[], …)`, 10,000 rows a
 * statement. JSON columns travel as text, array columns as array literals.
 */
async function insertRows(table: string, columns: string[], rows: readonly object[], t: Transaction) {
  if (!rows.length) return;
  const types = await columnTypes(table, t);
  const specs = columns.map((c) => {
    const udt = types.get(c);
    if (!udt) throw new Error(`${table}.${c}: no such column`);
    if (udt.startsWith('_')) return { c, param: 'text[]', select: `v.${c}::${udt.slice(1)}[]`, encode: (v: unknown) => (v == null ? null : arrayLiteral(v as string[])) };
    if (udt === 'jsonb' || udt === 'json') return { c, param: 'text[]', select: `v.${c}::${udt}`, encode: (v: unknown) => (v == null ? null : JSON.stringify(v)) };
    return { c, param: `${udt}[]`, select: `v.${c}`, encode: (v: unknown) => v ?? null };
  });
  const sql = `INSERT INTO ${table} (${columns.join(', ')})
    SELECT ${specs.map((s) => s.select).join(', ')}
      FROM unnest(${specs.map((s, i) => `$${i + 1}::${s.param}`).join(', ')}) AS v(${columns.join(', ')})`;
  for (let start = 0; start < rows.length; start += ROWS_PER_STATEMENT) {
    const chunk = rows.slice(start, start + ROWS_PER_STATEMENT) as Array<Record<string, unknown>>;
    const bind = specs.map((s) => chunk.map((row) => s.encode(row[s.c])));
    await sequelize.query(sql, { bind, transaction: t });
  }
}

async function moveSequence(table: string, t: Transaction) {
  await sequelize.query(`SELECT setval(pg_get_serial_sequence($1, 'id'), GREATEST((SELECT max(id) FROM ${table}), 1))`, { bind: [table], transaction: t });
}

export async function writePool(pool: PoolSim, inspections: SimInspection[], t: Transaction): Promise<{ events: number }> {
  await insertRows(
    'liner_lots',
    ['id', 'supplier', 'lot_number', 'spec', 'quantity_received', 'received_on', 'expiry_date', 'site_id', 'status', 'liner_spec_id', 'supplier_id'],
    [...pool.lots.values()],
    t,
  );
  await insertRows(
    'hire_orders',
    ['id', 'reference', 'customer_id', 'delivery_site_id', 'depot_site_id', 'bin_type_id', 'quantity', 'needed_by', 'status', 'product'],
    [...pool.orders.values()],
    t,
  );
  // Bins first without their open trip (trips refer to bins, bins to their open trip).
  const assets = [...pool.assets.values()].map((a) => ({
    id: a.id,
    grai: a.grai,
    serial: a.serial,
    bin_type_id: a.binTypeId,
    manufacture_month: a.manufactureMonth,
    un_marking: a.unMarking,
    status: a.status,
    site_id: a.siteId,
    site_since: a.siteSince,
    customer_id: a.customerId,
    leg: a.leg,
    prep_checked: a.prepChecked,
    liner_lot_id: a.linerLotId,
    filled: a.filled,
    last_scan_at: a.lastScanAt,
    trip_count: a.tripCount,
    last_inspection_on: a.lastInspectionOn,
    last_leak_test_on: a.lastLeakTestOn,
    last_full_inspection_on: a.lastFullInspectionOn,
    next_intermediate_due: a.nextIntermediateDue,
    next_full_due: a.nextFullDue,
    next_due: a.nextDue,
    version: a.version,
  }));
  await insertRows('assets', Object.keys(assets[0] ?? { id: 0 }), assets, t);
  const trips = [...pool.trips.values()];
  await insertRows('trips', Object.keys(trips[0] ?? { id: 0 }), trips, t);
  const open = [...pool.assets.values()].filter((a) => a.currentTripId !== null);
  if (open.length) {
    await sequelize.query(`UPDATE assets a SET current_trip_id = v.trip_id FROM unnest($1::int[], $2::int[]) AS v(asset_id, trip_id) WHERE a.id = v.asset_id`, {
      bind: [open.map((a) => a.id), open.map((a) => a.currentTripId)],
      transaction: t,
    });
  }
  const eventColumns = [
    'id',
    'asset_id',
    'action',
    'occurred_at',
    'site_id',
    'user_id',
    'client_event_id',
    'status_from',
    'status_to',
    'trip_id',
    'inferred',
    'flagged',
    'payload',
  ];
  await insertRows('scan_events', eventColumns, pool.events, t);
  // The liner ledger: receipts first, so every prefix of the rows keeps each lot's stock at 0 or more.
  await insertRows('liner_moves', ['lot_id', 'site_id', 'kind', 'quantity', 'occurred_at', 'user_id', 'asset_id', 'scan_event_id', 'reason'], pool.moves, t);
  await insertRows('scan_event_keys', ['client_event_id', 'user_id', 'scan_event_id', 'outcome'], pool.keys, t);
  await insertRows(
    'inspections',
    [
      'id',
      'asset_id',
      'kind',
      'performed_on',
      'inspector_id',
      'site_id',
      'checklist',
      'leak_test_pressure_kpa',
      'leak_test_minutes',
      'leak_test_passed',
      'outcome',
      'next_intermediate_due',
      'next_full_due',
      'scan_event_id',
      'recorded_by',
    ],
    inspections,
    t,
  );
  for (const table of ['liner_lots', 'hire_orders', 'assets', 'trips', 'scan_events', 'inspections']) await moveSequence(table, t);
  return { events: pool.events.length };
}
