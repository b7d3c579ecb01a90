// The fleet grid's columns. Column ids are the server's whitelist (src/lib/fleet/grid-query.ts):
// whatever the grid sends as a sort or filter model is keyed by these ids.
import type { ColDef } from 'ag-grid-community';
import { BIN_COLUMNS, type BinColumnId } from '@/lib/fleet/grid-query';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';
import { GraiCell, StatusCell, DateCell, NextDueCell, LastScanCell, DaysAtSiteCell, DaysCell, FlagCell, TextCell } from './cells';
import { SetFilter, BooleanFilter, type SetOption } from './filters';
import type { FilterChoices, GridRow } from './types';

const TEXT_FILTER = {
  filter: 'agTextColumnFilter',
  filterParams: {
    filterOptions: ['contains', 'notContains', 'equals', 'notEqual', 'startsWith', 'endsWith', 'blank', 'notBlank'],
    maxNumConditions: 2,
    trimInput: true,
    debounceMs: 400,
  },
} satisfies ColDef;

const NUMBER_FILTER = {
  filter: 'agNumberColumnFilter',
  filterParams: {
    filterOptions: ['equals', 'notEqual', 'lessThan', 'lessThanOrEqual', 'greaterThan', 'greaterThanOrEqual', 'inRange', 'blank', 'notBlank'],
    maxNumConditions: 2,
    allowedCharPattern: '\\d\\-',
    debounceMs: 400,
    inRangeInclusive: true,
  },
} satisfies ColDef;

const DATE_FILTER = {
  filter: 'agDateColumnFilter',
  filterParams: {
    filterOptions: ['equals', 'notEqual', 'lessThan', 'greaterThan', 'inRange', 'blank', 'notBlank'],
    maxNumConditions: 2,
    inRangeInclusive: true,
  },
} satisfies ColDef;

function setFilter(options: SetOption[]): Pick<ColDef, 'filter' | 'filterParams'> {
  return { filter: SetFilter, filterParams: { options } };
}

const FLAG = { filter: BooleanFilter, sortable: false, cellRenderer: FlagCell, width: 150 } satisfies ColDef;

/** `pinGrai`: keep the GRAI in view while scrolling sideways (wide screens; on a phone it would fill the width). */
export function buildColumnDefs(choices: FilterChoices, pinGrai: boolean): Array<ColDef<GridRow> & { colId: BinColumnId }> {
  const label = (id: BinColumnId) => BIN_COLUMNS[id].label;
  return [
    { colId: 'grai', field: 'grai', headerName: label('grai'), pinned: pinGrai ? 'left' : null, width: 250, cellRenderer: GraiCell, ...TEXT_FILTER },
    { colId: 'serial', field: 'serial', headerName: label('serial'), width: 120, cellRenderer: TextCell, cellRendererParams: { mono: true }, ...TEXT_FILTER },
    { colId: 'binType', field: 'binTypeCode', headerName: label('binType'), width: 120, cellRenderer: TextCell, ...setFilter(choices.binTypes) },
    // Wide enough for the longest status with its "Test lapsed" mark.
    { colId: 'status', field: 'status', headerName: label('status'), width: 290, cellRenderer: StatusCell, ...setFilter(choices.statuses) },
    {
      colId: 'site',
      field: 'siteName',
      headerName: label('site'),
      width: 220,
      cellRenderer: TextCell,
      ...setFilter([...choices.sites.map((s) => ({ value: s.value, label: `${s.label} (${s.kind})` })), { value: null, label: 'No site (on the road)' }]),
    },
    {
      colId: 'customer',
      field: 'customerName',
      headerName: label('customer'),
      width: 190,
      cellRenderer: TextCell,
      ...setFilter([...choices.customers, { value: null, label: 'No customer' }]),
    },
    { colId: 'daysAtSite', field: 'daysAtSite', headerName: label('daysAtSite'), width: 200, cellRenderer: DaysAtSiteCell, ...NUMBER_FILTER },
    { colId: 'lastScanAt', field: 'lastScanLocal', headerName: label('lastScanAt'), width: 250, cellRenderer: LastScanCell, ...DATE_FILTER },
    { colId: 'daysSilent', field: 'daysSilent', headerName: label('daysSilent'), width: 150, cellRenderer: DaysCell, ...NUMBER_FILTER },
    { colId: 'tripCount', field: 'tripCount', headerName: label('tripCount'), width: 100, cellRenderer: TextCell, ...NUMBER_FILTER },
    { colId: 'lastInspectionOn', field: 'lastInspectionOn', headerName: label('lastInspectionOn'), width: 230, cellRenderer: DateCell, ...DATE_FILTER },
    { colId: 'nextDue', field: 'nextDue', headerName: label('nextDue'), width: 320, cellRenderer: NextDueCell, ...DATE_FILTER },
    { colId: 'linerLot', field: 'linerLot', headerName: label('linerLot'), width: 140, cellRenderer: TextCell, cellRendererParams: { mono: true }, ...TEXT_FILTER },
    { ...FLAG, colId: 'overdue', field: 'overdue', headerName: label('overdue') },
    { ...FLAG, colId: 'dueSoon', field: 'dueSoon', headerName: `Test due within ${DUE_SOON_DAYS} days`, width: 190 },
    { ...FLAG, colId: 'dueThisMonth', field: 'dueThisMonth', headerName: label('dueThisMonth'), width: 180 },
    { ...FLAG, colId: 'overFreeDays', field: 'overFreeDays', headerName: label('overFreeDays') },
  ];
}
