// The fleet grid's data: one page of bins for AG Grid's infinite row model, the filtered set as a CSV
// stream, and the choices its set filters offer. SQL comes from src/lib/fleet/grid-query.ts (whitelisted
// columns, bind parameters only); this module runs it.
import { csvLines, csvTable } from '../csv';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate, formatLongDate } from '@/lib/calendar';
import { AppError } from '@/lib/api-errors';
import {
  binsCountQuery,
  binsExportQuery,
  binsPageQuery,
  BIN_COLUMNS,
  COUNT_CAP,
  GridQueryError,
  type BinColumnId,
  type FilterModel,
  type GridRequest,
  type QueryContext,
  type SqlStatement,
} from './grid-query';
import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';

/** Runs a check from the grid's query language; a refusal becomes a 400 validation_failed with its details. */
export function checkGrid<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof GridQueryError) throw new AppError('validation_failed', `The grid request was refused: ${err.message}`, err.issues);
    throw err;
  }
}

/** One grid row: what the cells show, computed in the operator's zone; no more (it travels 100 at a time). */
export interface BinRow {
  id: number;
  grai: string;
  serial: string;
  status: Status;
  binTypeId: number;
  binTypeCode: string;
  siteId: number | null;
  siteName: string | null;
  customerId: number | null;
  customerName: string | null;
  freeDays: number | null;
  daysAtSite: number | null;
  /** Arrival day in the operator's zone, 'YYYY-MM-DD'. */
  siteSinceOn: string | null;
  daysSilent: number | null;
  /** Last scan in the operator's zone, 'YYYY-MM-DD HH:MM'. */
  lastScanLocal: string | null;
  tripCount: number;
  lastInspectionOn: string | null;
  nextDue: string | null;
  overdue: boolean;
  dueSoon: boolean;
  dueThisMonth: boolean;
  overFreeDays: boolean;
  linerLot: string | null;
}

export interface BinsPage {
  rows: BinRow[];
  /** Rows in the whole filtered set when this page reached its end; otherwise null (ask countBins). */
  lastRow: number | null;
  /** The operator's today, against which day counts and due flags were computed. */
  today: string;
}

interface PgClient {
  query(text: string, values?: unknown[]): Promise<{ rows: Record<string, unknown>[] }>;
}

/** Runs statements on one pooled connection (the read side, when replicas are configured). */
async function withConnection<T>(fn: (client: PgClient) => Promise<T>): Promise<T> {
  const conn = (await sequelize.connectionManager.getConnection({ type: 'read' })) as PgClient;
  try {
    return await fn(conn);
  } finally {
    sequelize.connectionManager.releaseConnection(conn);
  }
}

async function run(statement: SqlStatement): Promise<Record<string, unknown>[]> {
  return withConnection(async (c) => (await c.query(statement.text, statement.values)).rows);
}

export async function queryContext(now = new Date()): Promise<QueryContext> {
  const { timeZone } = await getSettings();
  return { timeZone, today: localDate(now, timeZone) };
}

/** One page of the grid; lastRow is known when the page comes back short (the end of the set). */
export async function fetchBinsPage(req: GridRequest, ctx?: QueryContext): Promise<BinsPage> {
  const context = ctx ?? (await queryContext());
  const rows = await run(binsPageQuery(req, context));
  const lastRow = rows.length < req.endRow - req.startRow ? req.startRow + rows.length : null;
  return { rows: rows as unknown as BinRow[], lastRow, today: context.today };
}

/**
 * How many bins pass the filter, or null when there are more than COUNT_CAP (the grid then scrolls on
 * to find the end). Asked for beside the first page of a filter, never inside a page request.
 */
export async function countBins(filterModel: FilterModel, ctx?: QueryContext): Promise<number | null> {
  const context = ctx ?? (await queryContext());
  const [row] = await run(binsCountQuery(filterModel, context));
  const n = Number(row!.n);
  return n > COUNT_CAP ? null : n;
}

// ---------------------------------------------------------------------------------------------------
// CSV export

const EXPORT_CHUNK = 1000;

/** How each column reads in a spreadsheet: plain values, dates as YYYY-MM-DD, instants in the operator's zone. */
function csvValue(colId: BinColumnId, row: BinRow): string | number | null {
  switch (colId) {
    case 'binType':
      return row.binTypeCode;
    case 'status':
      return STATUS_LABELS[row.status] ?? row.status;
    case 'site':
      return row.siteName;
    case 'customer':
      return row.customerName;
    case 'lastScanAt':
      return row.lastScanLocal;
    case 'overdue':
    case 'dueSoon':
    case 'dueThisMonth':
    case 'overFreeDays':
      return row[colId] ? 'yes' : 'no';
    default:
      return row[colId] as string | number | null;
  }
}

export const EXPORTABLE_COLUMNS = Object.keys(BIN_COLUMNS) as BinColumnId[];

/**
 * The filtered, sorted set as CSV, streamed: a server-side cursor hands out EXPORT_CHUNK rows at a time,
 * each chunk is written and the next is fetched only when the client has taken the last (backpressure),
 * so a 100,000-bin export never sits in memory. The cursor runs in one read-only transaction: one
 * consistent snapshot from the first row to the last.
 */
export async function exportBinsCsv(req: Pick<GridRequest, 'sortModel' | 'filterModel'>, columns: BinColumnId[], ctx?: QueryContext): Promise<ReadableStream<Uint8Array>> {
  const context = ctx ?? (await queryContext());
  const statement = binsExportQuery(req, context);
  const conn = (await sequelize.connectionManager.getConnection({ type: 'read' })) as PgClient;
  const encoder = new TextEncoder();
  let open = true;
  const close = async (ok: boolean) => {
    if (!open) return;
    open = false;
    try {
      await conn.query(ok ? 'COMMIT' : 'ROLLBACK');
    } finally {
      sequelize.connectionManager.releaseConnection(conn);
    }
  };
  try {
    await conn.query('BEGIN READ ONLY');
    await conn.query(`DECLARE bins_export NO SCROLL CURSOR FOR ${statement.text}`, statement.values);
  } catch (err) {
    await close(false).catch(() => undefined);
    throw err;
  }
  const header = csvTable(
    columns.map((c) => BIN_COLUMNS[c].label),
    [],
  );
  let wroteHeader = false;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        if (!wroteHeader) {
          wroteHeader = true;
          controller.enqueue(encoder.encode(header)); // csvResponse() puts the byte-order mark before it
          return;
        }
        const { rows } = await conn.query(`FETCH ${EXPORT_CHUNK} FROM bins_export`);
        if (rows.length) {
          const data = (rows as unknown as BinRow[]).map((r) => columns.map((c) => csvValue(c, r)));
          // src/lib/csv.ts: a text cell starting with = + - @ is not run as a formula when opened in a spreadsheet.
          controller.enqueue(encoder.encode(csvLines(data)));
        }
        if (rows.length < EXPORT_CHUNK) {
          await close(true);
          controller.close();
        }
      } catch (err) {
        await close(false).catch(() => undefined);
        controller.error(err);
      }
    },
    async cancel() {
      await close(false).catch(() => undefined);
    },
  });
}

export function exportFileName(today: string): string {
  return `loopfold-bins-${today}.csv`;
}

// ---------------------------------------------------------------------------------------------------
// Choices for the set filters

export interface FilterChoices {
  statuses: Array<{ value: Status; label: string }>;
  binTypes: Array<{ value: number; label: string }>;
  sites: Array<{ value: number; label: string; kind: string }>;
  customers: Array<{ value: number; label: string }>;
  today: string;
  todayLabel: string;
  timeZone: string;
}

export async function filterChoices(): Promise<FilterChoices> {
  const ctx = await queryContext();
  const [binTypes, sites, customers] = await Promise.all([
    sequelize.query<{ id: number; code: string; name: string }>('SELECT id, code, name FROM bin_types ORDER BY code', { type: QueryTypes.SELECT }),
    sequelize.query<{ id: number; name: string; kind: string }>('SELECT id, name, kind FROM sites ORDER BY kind, name', { type: QueryTypes.SELECT }),
    sequelize.query<{ id: number; name: string }>("SELECT id, name FROM organisations WHERE kind = 'customer' ORDER BY name", { type: QueryTypes.SELECT }),
  ]);
  return {
    statuses: (Object.keys(STATUS_LABELS) as Status[]).map((s) => ({ value: s, label: STATUS_LABELS[s] })),
    binTypes: binTypes.map((t) => ({ value: t.id, label: `${t.code} · ${t.name}` })),
    sites: sites.map((s) => ({ value: s.id, label: s.name, kind: s.kind })),
    customers: customers.map((c) => ({ value: c.id, label: c.name })),
    today: ctx.today,
    todayLabel: formatLongDate(ctx.today),
    timeZone: ctx.timeZone,
  };
}
