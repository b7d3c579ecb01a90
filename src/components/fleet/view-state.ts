// Moving a saved view's state into the grid and back out, and describing the
// active filters in words for the chips above the grid.
import type { ColumnState, GridApi } from 'ag-grid-community';
import { BIN_COLUMNS, BIN_COLUMN_IDS, isBinColumnId, type BinColumnId, type FilterCondition, type SimpleCondition, type SortItem } from '@/lib/fleet/grid-query';
import { DEFAULT_VISIBLE, type ViewColumn, type ViewState } from '@/lib/fleet/grid-views';
import { formatLongDate } from '@/lib/calendar';
import type { FilterChoices, GridRow } from './types';

export const EMPTY_STATE: ViewState = { filterModel: {}, sortModel: [], columns: [] };

/** The complete column layout a view implies: listed columns in order, then the rest hidden. */
function columnLayout(state: ViewState): ColumnState[] {
  const listed: ViewColumn[] = state.columns.length ? state.columns : DEFAULT_VISIBLE.map((colId) => ({ colId, hide: false }));
  const rest: ViewColumn[] = BIN_COLUMN_IDS.filter((id) => !listed.some((c) => c.colId === id)).map((colId) => ({ colId, hide: true }));
  return [...listed, ...rest].map((c): ColumnState => {
    const sortAt = state.sortModel.findIndex((s) => s.colId === c.colId);
    return {
      colId: c.colId,
      hide: c.hide,
      ...(c.width ? { width: c.width } : {}),
      sort: sortAt >= 0 ? state.sortModel[sortAt]!.sort : null,
      sortIndex: sortAt >= 0 ? sortAt : null,
    };
  });
}

export function applyViewState(api: GridApi<GridRow>, state: ViewState) {
  api.applyColumnState({ state: columnLayout(state), applyOrder: true });
  api.setFilterModel(state.filterModel as Record<string, unknown>);
}

export function readViewState(api: GridApi<GridRow>): ViewState {
  const cs = api.getColumnState().filter((c) => isBinColumnId(c.colId));
  const sortModel: SortItem[] = cs
    .filter((c) => c.sort)
    .sort((a, b) => (a.sortIndex ?? 0) - (b.sortIndex ?? 0))
    .map((c) => ({ colId: c.colId as BinColumnId, sort: c.sort! }));
  const columns = cs.map((c) => ({ colId: c.colId as BinColumnId, hide: !!c.hide, width: Math.min(1000, Math.max(40, Math.round(c.width ?? 120))) }));
  return { filterModel: (api.getFilterModel() ?? {}) as ViewState['filterModel'], sortModel, columns };
}

/** JSON with object keys sorted, so two equal states compare equal however their keys were ordered. */
export function stableJson(value: unknown): string {
  return JSON.stringify(value, (_k, v) => (v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).sort(([a], [b]) => a.localeCompare(b))) : v));
}

/** Whether what the grid shows differs from a view (filters, sort, visible columns in order; widths ignored). */
export function sameView(a: ViewState, b: ViewState): boolean {
  const visible = (s: ViewState) =>
    columnLayout(s)
      .filter((c) => !c.hide)
      .map((c) => c.colId);
  return stableJson(a.filterModel) === stableJson(b.filterModel) && stableJson(a.sortModel) === stableJson(b.sortModel) && visible(a).join() === visible(b).join();
}

// ---------------------------------------------------------------------------------------------------
// Filters in words

const OP_WORDS: Record<string, string> = {
  contains: 'contains',
  notContains: 'does not contain',
  equals: 'is',
  notEqual: 'is not',
  startsWith: 'starts with',
  endsWith: 'ends with',
  lessThan: '<',
  lessThanOrEqual: '≤',
  greaterThan: '>',
  greaterThanOrEqual: '≥',
  blank: 'is empty',
  notBlank: 'is not empty',
};
const DATE_WORDS: Record<string, string> = {
  lessThan: 'before',
  greaterThan: 'after',
  lessThanOrEqual: 'on or before',
  greaterThanOrEqual: 'on or after',
  equals: 'on',
  notEqual: 'not on',
};

function describeSimple(colId: BinColumnId, c: SimpleCondition, choices: FilterChoices): string {
  switch (c.filterType) {
    case 'set': {
      const options: Array<{ value: unknown; label: string }> =
        colId === 'status' ? choices.statuses : colId === 'site' ? choices.sites : colId === 'customer' ? choices.customers : choices.binTypes;
      const names = c.values.map((v) => (v === null ? 'none' : (options.find((o) => o.value === v)?.label ?? String(v))));
      if (names.length === 0) return 'none selected';
      return names.length <= 3 ? names.join(', ') : `${names.slice(0, 2).join(', ')} and ${names.length - 2} more`;
    }
    case 'boolean':
      return c.value ? 'yes' : 'no';
    case 'text':
      return c.type === 'blank' || c.type === 'notBlank' ? OP_WORDS[c.type]! : `${OP_WORDS[c.type]} “${c.filter}”`;
    case 'number': {
      const unit = BIN_COLUMNS[colId].kind === 'daysSince' ? ' days' : '';
      if (c.type === 'inRange') return `${c.filter}–${c.filterTo}${unit}`;
      if (c.type === 'blank' || c.type === 'notBlank') return OP_WORDS[c.type]!;
      return `${OP_WORDS[c.type]} ${c.filter}${unit}`;
    }
    case 'date': {
      const day = (d: string | null | undefined) => (d ? formatLongDate(d.slice(0, 10)) : '?');
      if (c.type === 'inRange') return `${day(c.dateFrom)} to ${day(c.dateTo)}`;
      if (c.type === 'blank' || c.type === 'notBlank') return OP_WORDS[c.type]!;
      return `${DATE_WORDS[c.type] ?? c.type} ${day(c.dateFrom)}`;
    }
  }
}

export function describeFilter(colId: BinColumnId, cond: FilterCondition, choices: FilterChoices): string {
  if ('conditions' in cond) return cond.conditions.map((c) => describeSimple(colId, c, choices)).join(cond.operator === 'AND' ? ' and ' : ' or ');
  return describeSimple(colId, cond, choices);
}
