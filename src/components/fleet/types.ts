// What the fleet grid island receives: the server's row and page shapes as they
// arrive over JSON.
import type { BinRow, FilterChoices } from '@/lib/fleet/fleet-grid.server';
import type { ViewSummary } from '@/lib/fleet/saved-views.server';

export type GridRow = BinRow;

export interface GridPage {
  rows: GridRow[];
  lastRow: number | null;
  today: string;
}

export type { FilterChoices, ViewSummary };

/** Shared with every cell renderer through the grid's context. */
export interface GridContext {
  today: string;
  prefixLength: number;
}
