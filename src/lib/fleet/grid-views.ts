/**
 * Saved views of the fleet grid: what a view holds, how a stored or submitted one is checked, and the
 * built-in views every planner starts with. Pure: no I/O.
 *
 * A view's filters are relative where time matters ("silent for 30 days", "due by the end of this
 * month"), so a view saved today still means the same thing next month.
 */
import { BIN_COLUMN_IDS, GridQueryError, isBinColumnId, parseFilterModel, parseSortModel, type BinColumnId, type FilterModel, type SortItem } from './grid-query';
import { STATUSES } from '@/lib/scans/lifecycle';
import { OVERVIEW_CARDS } from './overview-cards';

export const FLEET_GRID = 'fleet-bins';
export const MAX_VIEW_NAME = 80;

export interface ViewColumn {
  colId: BinColumnId;
  hide: boolean;
  width?: number;
}

export interface ViewState {
  filterModel: FilterModel;
  sortModel: SortItem[];
  /** Column order and visibility; empty = the grid's default layout. */
  columns: ViewColumn[];
}

export interface BuiltinView {
  id: string;
  name: string;
  description: string;
  state: ViewState;
}

/** Columns shown when a view does not say otherwise, in order. The rest start hidden. */
export const DEFAULT_VISIBLE: readonly BinColumnId[] = [
  'grai',
  'serial',
  'binType',
  'status',
  'site',
  'customer',
  'daysAtSite',
  'lastScanAt',
  'tripCount',
  'lastInspectionOn',
  'nextDue',
  'linerLot',
];

const NOT_RETIRED = STATUSES.filter((s) => s !== 'retired');

export const BUILTIN_VIEWS: readonly BuiltinView[] = [
  {
    id: 'builtin:overdue-returns',
    name: 'Overdue back from customers',
    description: 'On hire or folded and awaiting collection for longer than the customer’s free days.',
    state: {
      filterModel: OVERVIEW_CARDS.overdue.filter(30),
      sortModel: OVERVIEW_CARDS.overdue.sort,
      columns: [],
    },
  },
  {
    id: 'builtin:due-this-month',
    name: 'Due for test this month',
    description: 'Next periodic test due by the end of this month, overdue ones included; retired bins left out.',
    state: {
      filterModel: { dueThisMonth: { filterType: 'boolean', value: true }, status: { filterType: 'set', values: [...NOT_RETIRED] } },
      sortModel: [{ colId: 'nextDue', sort: 'asc' }],
      columns: [],
    },
  },
  {
    id: 'builtin:quarantine',
    name: 'In quarantine',
    description: 'Bins held back from use until someone checks them, longest held first.',
    state: {
      filterModel: { status: { filterType: 'set', values: ['quarantine'] } },
      sortModel: [{ colId: 'daysAtSite', sort: 'desc' }],
      columns: [],
    },
  },
  {
    id: 'builtin:silent-30',
    name: 'Silent for 30+ days',
    description: 'No scan for 30 days or more; bins in service only (retired and missing ones left out), as the overview counts them.',
    state: {
      filterModel: OVERVIEW_CARDS.silent.filter(30),
      sortModel: OVERVIEW_CARDS.silent.sort,
      columns: DEFAULT_VISIBLE.map((colId) => ({ colId, hide: false })).concat([{ colId: 'daysSilent', hide: false }]),
    },
  },
];

export function isBuiltinViewId(id: string): boolean {
  return BUILTIN_VIEWS.some((v) => v.id === id);
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Checks a view's state against the grid's whitelist; throws GridQueryError with what is wrong. */
export function parseViewState(raw: unknown, path = 'state'): ViewState {
  if (!isPlainObject(raw)) throw new GridQueryError([{ path, message: 'must be { filterModel, sortModel, columns }' }]);
  const filterModel = parseFilterModel(raw.filterModel, `${path}.filterModel`);
  const sortModel = parseSortModel(raw.sortModel, `${path}.sortModel`);
  const columns: ViewColumn[] = [];
  const rawColumns = raw.columns ?? [];
  if (!Array.isArray(rawColumns) || rawColumns.length > BIN_COLUMN_IDS.length) {
    throw new GridQueryError([{ path: `${path}.columns`, message: `must be a list of at most ${BIN_COLUMN_IDS.length} columns` }]);
  }
  const seen = new Set<string>();
  rawColumns.forEach((c: unknown, i) => {
    const p = `${path}.columns[${i}]`;
    if (!isPlainObject(c) || !isBinColumnId(c.colId)) {
      throw new GridQueryError([{ path: `${p}.colId`, message: `unknown column ${JSON.stringify(isPlainObject(c) ? c.colId : c)}` }]);
    }
    if (seen.has(c.colId)) throw new GridQueryError([{ path: `${p}.colId`, message: `${c.colId} is listed twice` }]);
    seen.add(c.colId);
    const col: ViewColumn = { colId: c.colId, hide: c.hide === true };
    if (c.width !== undefined && c.width !== null) {
      if (typeof c.width !== 'number' || !Number.isInteger(c.width) || c.width < 40 || c.width > 1000) {
        throw new GridQueryError([{ path: `${p}.width`, message: 'must be a whole number of pixels from 40 to 1000' }]);
      }
      col.width = c.width;
    }
    columns.push(col);
  });
  return { filterModel, sortModel, columns };
}

/** A view name as stored: trimmed, inner runs of spaces collapsed. */
export function cleanViewName(name: string): string {
  return name.trim().replace(/\s+/g, ' ');
}
