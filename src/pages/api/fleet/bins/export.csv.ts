import { endpoint } from '@/lib/endpoint.server';
import { binsExportQuerySchema } from '@/lib/fleet/grid-params';
import { checkGrid, exportBinsCsv, exportFileName, queryContext, EXPORTABLE_COLUMNS } from '@/lib/fleet/fleet-grid.server';
import { parseFilterModel, parseSortModel, type BinColumnId } from '@/lib/fleet/grid-query';
import { DEFAULT_VISIBLE } from '@/lib/fleet/grid-views';
import { AppError } from '@/lib/api-errors';
import { csvResponse } from '@/lib/http/csv-response';

function exportColumns(list: string | undefined): BinColumnId[] {
  if (!list) return [...DEFAULT_VISIBLE];
  const ids = list
    .split(',')
    .map((c) => c.trim())
    .filter(Boolean);
  const unknown = ids.filter((c) => !(EXPORTABLE_COLUMNS as string[]).includes(c));
  if (unknown.length || ids.length === 0) {
    throw new AppError('validation_failed', `Cannot export column(s) ${unknown.join(', ') || '(none)'}; the columns are ${EXPORTABLE_COLUMNS.join(', ')}.`);
  }
  return [...new Set(ids)] as BinColumnId[];
}

/** The grid's current filtered, sorted set as CSV (every matching row, streamed in chunks). */
export const GET = endpoint({ capability: 'fleet.view', query: binsExportQuerySchema }, async ({ query }) => {
  const req = checkGrid(() => ({ sortModel: parseSortModel(query.sortModel), filterModel: parseFilterModel(query.filterModel) }));
  const columns = exportColumns(query.columns);
  const ctx = await queryContext();
  const body = await exportBinsCsv(req, columns, ctx);
  return csvResponse(body, exportFileName(ctx.today));
});
