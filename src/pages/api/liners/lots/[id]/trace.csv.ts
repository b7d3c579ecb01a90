import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { idParams } from '@/lib/route-params';
import { lotHeader, lotTrace, traceRow } from '@/lib/liners/liner-recall.server';
import { csvTable } from '@/lib/csv';
import { csvResponse } from '@/lib/http/csv-response';
import { getSettings } from '@/lib/settings/settings.server';

/** Every use of a liner lot as CSV: trips, bins lined and not dispatched, kits sent. */
export const GET = endpoint({ capability: 'liners.manage', params: idParams('Liner lot') }, async ({ params }) => {
  const lot = await lotHeader(params.id);
  if (!lot) throw new AppError('not_found', 'No liner lot with that number.');
  const { timeZone } = await getSettings();
  const rows = (await lotTrace(params.id)).map((u) => {
    const r = traceRow(u, timeZone);
    return [lot.lotNumber, r.use, r.bin, r.grai, r.customer, r.order, r.fillingSite, r.fillDay, r.product, r.day, r.liners, r.binNow, r.flaggedFit, r.dispatchBlocked];
  });
  const fields = [
    'lot',
    'use',
    'bin',
    'grai',
    'customer',
    'hire_order',
    'filling_site',
    'fill_day',
    'product',
    'day',
    'liners',
    'bin_now',
    'fitted_after_stop',
    'dispatch_blocked',
  ];
  return csvResponse(csvTable(fields, rows), `liner-lot-${lot.lotNumber}-trace.csv`);
});
