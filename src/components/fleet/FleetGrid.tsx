// The fleet grid: every bin in the pool, paged, sorted and filtered on the server
// (AG Grid's infinite row model; the browser never holds more than a few blocks).
// Rendered as a client-only island; the page hands in the first page of rows,
// the saved views and the filter choices it read on the server.
import { useCallback, useMemo, useRef, useState } from 'react';
import { AgGridReact } from 'ag-grid-react';
import {
  ModuleRegistry,
  InfiniteRowModelModule,
  TextFilterModule,
  NumberFilterModule,
  DateFilterModule,
  CustomFilterModule,
  ColumnApiModule,
  RowStyleModule,
  type GridApi,
  type GridReadyEvent,
  type IDatasource,
  type IGetRowsParams,
  type RowClickedEvent,
  type CellKeyDownEvent,
} from 'ag-grid-community';
import { api, withQuery, ApiError } from '@/lib/api.client';
import { Icon } from '@/components/ui/Icon';
import { BIN_COLUMNS, isBinColumnId, type BinColumnId, type FilterCondition } from '@/lib/fleet/grid-query';
import type { ViewState } from '@/lib/fleet/grid-views';
import { loopfoldGridTheme } from './grid-theme';
import { buildColumnDefs } from './columns';
import { binHref } from './cells';
import { ViewBar } from './ViewBar';
import { EMPTY_STATE, applyViewState, describeFilter, readViewState, sameView, stableJson } from './view-state';
import type { FilterChoices, GridContext, GridPage, GridRow, ViewSummary } from './types';

// Only what this grid uses (all community modules together are ~330 KB gzipped).
ModuleRegistry.registerModules([InfiniteRowModelModule, TextFilterModule, NumberFilterModule, DateFilterModule, CustomFilterModule, ColumnApiModule, RowStyleModule]);

const PAGE_ROWS = 100;

export interface FleetGridProps {
  firstPage: GridPage;
  /** Size of the first view's filtered set, counted on the server (null: too costly to count). */
  firstCount: number | null;
  firstState: ViewState;
  views: ViewSummary[];
  initialViewId: string | null;
  choices: FilterChoices;
  prefixLength: number;
  /** The page's CSP nonce for the grid's injected <style> elements. */
  styleNonce?: string;
}

export default function FleetGrid({ firstPage, firstCount, firstState, views, initialViewId, choices, prefixLength, styleNonce }: FleetGridProps) {
  const gridApi = useRef<GridApi<GridRow> | null>(null);
  const context = useMemo<GridContext>(() => ({ today: firstPage.today, prefixLength }), [firstPage.today, prefixLength]);
  const columnDefs = useMemo(() => buildColumnDefs(choices, window.matchMedia('(min-width: 768px)').matches), [choices]);
  const [selectedId, setSelectedId] = useState<string | null>(initialViewId);
  const [baseState, setBaseState] = useState<ViewState>(firstState);
  const [state, setState] = useState<ViewState>(firstState);
  const [count, setCount] = useState<number | null>(firstPage.lastRow ?? firstCount);
  const [loaded, setLoaded] = useState(firstPage.rows.length);
  const [error, setError] = useState<string | null>(null);
  // The first page was read on the server; hand it to the grid instead of asking again.
  const firstPageRef = useRef<{ key: string; page: GridPage } | null>({ key: stableJson([firstState.sortModel, firstState.filterModel]), page: firstPage });

  // The size of the filtered set is asked for beside the first page of each filter (never inside a
  // page request); a new sort of the same filter reuses it, and an answer for a filter that has since
  // changed is dropped. n: undefined while asked, null when too many to count.
  const known = useRef<{ key: string; n: number | null | undefined }>({ key: stableJson(firstState.filterModel), n: firstPage.lastRow ?? firstCount });
  const askCount = useCallback((filterModel: object) => {
    const key = stableJson(filterModel);
    known.current = { key, n: undefined };
    setCount(null);
    api<{ count: number | null }>('/api/fleet/bins/count', { query: { filterModel } })
      .then(({ count: n }) => {
        if (known.current.key !== key) return;
        known.current = { key, n };
        setCount(n);
        if (n !== null) gridApi.current?.setRowCount(n, true);
      })
      .catch(() => undefined); // without a count the grid still scrolls to the end
  }, []);

  const datasource = useMemo<IDatasource>(
    () => ({
      getRows(params: IGetRowsParams) {
        const filterKey = stableJson(params.filterModel);
        const deliver = (page: GridPage) => {
          context.today = page.today;
          setLoaded((n) => Math.max(n, params.startRow + page.rows.length));
          const counted = known.current.key === filterKey && typeof known.current.n === 'number' ? known.current.n : undefined;
          params.successCallback(page.rows, page.lastRow ?? counted);
          if (page.lastRow !== null) {
            known.current = { key: filterKey, n: page.lastRow };
            setCount(page.lastRow);
          } else if (params.startRow === 0 && known.current.key !== filterKey) {
            askCount(params.filterModel);
          }
        };
        const first = firstPageRef.current;
        firstPageRef.current = null;
        if (first && params.startRow === 0 && first.key === stableJson([params.sortModel, params.filterModel])) {
          deliver(first.page);
          return;
        }
        setError(null);
        api<GridPage>('/api/fleet/bins', {
          query: { startRow: params.startRow, endRow: params.endRow, sortModel: params.sortModel, filterModel: params.filterModel },
        })
          .then(deliver)
          .catch((err: unknown) => {
            params.failCallback();
            setError(err instanceof ApiError ? err.message : 'The bins could not be loaded. Try again.');
          });
      },
    }),
    [context, askCount],
  );

  const onGridReady = useCallback(
    (e: GridReadyEvent<GridRow>) => {
      gridApi.current = e.api;
      applyViewState(e.api, firstState);
      e.api.setGridOption('datasource', datasource);
      setState(readViewState(e.api));
    },
    [datasource, firstState],
  );

  const syncState = useCallback(() => {
    if (gridApi.current) setState(readViewState(gridApi.current));
  }, []);

  function selectView(view: ViewSummary | null) {
    const next = view?.state ?? EMPTY_STATE;
    setSelectedId(view?.id ?? null);
    setBaseState(next);
    if (gridApi.current) applyViewState(gridApi.current, next);
    const url = new URL(window.location.href);
    if (view) url.searchParams.set('view', view.id);
    else url.searchParams.delete('view');
    window.history.replaceState(null, '', url);
  }

  function setStatusFilter(status: string) {
    const g = gridApi.current;
    if (!g) return;
    void g.setColumnFilterModel('status', status ? { filterType: 'set', values: [status] } : null).then(() => g.onFilterChanged());
  }

  function clearFilter(colId: string) {
    const g = gridApi.current;
    if (!g) return;
    void g.setColumnFilterModel(colId, null).then(() => g.onFilterChanged());
  }

  function exportCsv() {
    const g = gridApi.current;
    if (!g) return;
    const now = readViewState(g);
    const columns = now.columns
      .filter((c) => !c.hide)
      .map((c) => c.colId)
      .join(',');
    const a = document.createElement('a');
    a.href = withQuery('/api/fleet/bins/export.csv', { sortModel: now.sortModel, filterModel: now.filterModel, columns });
    a.download = '';
    document.body.append(a);
    a.click();
    a.remove();
  }

  const open = (grai: string) => window.location.assign(binHref(grai));
  const onRowClicked = (e: RowClickedEvent<GridRow>) => {
    if (!e.data || (e.event?.target as HTMLElement | null)?.closest('a')) return;
    open(e.data.grai);
  };
  const onCellKeyDown = (e: CellKeyDownEvent<GridRow>) => {
    if ((e.event as KeyboardEvent | null)?.key === 'Enter' && e.data) open(e.data.grai);
  };

  const statusModel = state.filterModel.status;
  const quickStatus = statusModel && !('conditions' in statusModel) && statusModel.filterType === 'set' && statusModel.values.length === 1 ? String(statusModel.values[0]) : '';
  const activeFilters = Object.entries(state.filterModel).filter((e): e is [BinColumnId, FilterCondition] => isBinColumnId(e[0]) && !!e[1]);

  return (
    <div className="flex flex-col gap-3">
      <ViewBar initialViews={views} selectedId={selectedId} modified={!sameView(state, baseState)} onSelect={selectView} currentState={() => readViewState(gridApi.current!)}>
        <div className="flex flex-wrap items-end gap-2 xl:ml-auto">
          <div>
            <label className="label" htmlFor="status-quick">
              Status
            </label>
            <select id="status-quick" className="field" value={quickStatus} onChange={(e) => setStatusFilter(e.target.value)}>
              <option value="">{statusModel && !quickStatus ? 'Several statuses' : 'All statuses'}</option>
              {choices.statuses.map((s) => (
                <option key={s.value} value={s.value}>
                  {s.label}
                </option>
              ))}
            </select>
          </div>
          <details className="relative">
            <summary className="btn-quiet cursor-pointer list-none">Columns</summary>
            <fieldset className="card absolute z-20 mt-1 w-64 p-3 text-sm">
              <legend className="sr-only">Columns to show</legend>
              {columnDefs.map((c) => (
                <label key={c.colId} className="flex min-h-[32px] cursor-pointer items-center gap-2">
                  <input
                    type="checkbox"
                    checked={!(state.columns.find((x) => x.colId === c.colId)?.hide ?? true)}
                    onChange={(e) => gridApi.current?.setColumnsVisible([c.colId], e.target.checked)}
                  />
                  {c.headerName}
                </label>
              ))}
            </fieldset>
          </details>
          <button type="button" className="btn-quiet" onClick={exportCsv} id="export-csv">
            Export CSV
          </button>
        </div>
      </ViewBar>

      <p className="text-sm text-ink-soft num" aria-live="polite">
        <span id="bin-count" className="font-medium text-ink">
          {count !== null ? `${count.toLocaleString('en-GB')} ${count === 1 ? 'bin' : 'bins'}` : `more than ${loaded.toLocaleString('en-GB')} bins`}
        </span>
        {' · '}days counted to {choices.todayLabel} ({choices.timeZone})
      </p>

      {activeFilters.length > 0 && (
        <ul className="flex flex-wrap gap-2" aria-label="Active filters">
          {activeFilters.map(([colId, cond]) => (
            <li key={colId} className="inline-flex items-center gap-1 rounded-full border border-paper-line bg-card py-1 pl-3 pr-1 text-sm">
              <span className="font-medium">{BIN_COLUMNS[colId].label}:</span> {describeFilter(colId, cond, choices)}
              <button
                type="button"
                className="inline-flex h-7 w-7 items-center justify-center rounded-full hover:bg-paper-deep"
                onClick={() => clearFilter(colId)}
                aria-label={`Remove the ${BIN_COLUMNS[colId].label} filter`}
              >
                ×
              </button>
            </li>
          ))}
        </ul>
      )}

      {error && (
        <p className="notice-fault flex items-center gap-2" role="alert">
          <Icon name="alert" /> {error}
        </p>
      )}
      {count === 0 && !error && (
        <p className="notice-info" role="status">
          No bins match these filters. Remove a filter above, or choose another view.
        </p>
      )}

      {/* Nearly a screen high: scrolled to, the grid fills the window (about 18 rows at 800 px). */}
      <div className="h-[calc(100dvh-6rem)] min-h-[26rem] w-full" id="fleet-grid">
        <AgGridReact<GridRow>
          theme={loopfoldGridTheme}
          styleNonce={styleNonce}
          columnDefs={columnDefs}
          defaultColDef={{ sortable: true, resizable: true, minWidth: 80 }}
          context={context}
          rowModelType="infinite"
          cacheBlockSize={PAGE_ROWS}
          maxBlocksInCache={30}
          maxConcurrentDatasourceRequests={2}
          blockLoadDebounceMillis={120}
          infiniteInitialRowCount={PAGE_ROWS}
          getRowId={(p) => String(p.data.id)}
          onGridReady={onGridReady}
          onFilterChanged={syncState}
          onSortChanged={syncState}
          onColumnMoved={syncState}
          onColumnVisible={syncState}
          onRowClicked={onRowClicked}
          onCellKeyDown={onCellKeyDown}
          rowClass="cursor-pointer"
          suppressCellFocus={false}
          animateRows={false}
          suppressColumnVirtualisation
        />
      </div>
    </div>
  );
}
