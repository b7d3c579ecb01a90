import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { ledgerQuery, ledgerQuerySchema } from '@/lib/liners/ledger-query';
import { ledgerAt } from '@/lib/liners/stock-view.server';
import { MOVE_LABEL } from '@/lib/liners/liner-moves';
import { csvTable } from '@/lib/csv';
import { csvResponse } from '@/lib/http/csv-response';
import { getSettings } from '@/lib/settings/settings.server';
import { formatMomentAbsolute } from '@/lib/moment-text';

const query = ledgerQuerySchema.extend({ depot: z.coerce.number().int().positive().max(2_147_483_647) }).strict();

/** A depot's stock moves as CSV, with the page's filters: GET /api/liners/moves.csv?depot=1&kind=fitted&from=2026-11-01. */
export const GET = endpoint({ capability: 'liners.view', query }, async ({ ctx, query: q }) => {
  const parsed = ledgerQuery(Object.fromEntries(ctx.url.searchParams));
  if (!parsed.ok) throw new AppError('bad_request', parsed.message);
  const { timeZone } = await getSettings();
  const moves = await ledgerAt({ siteId: q.depot, ...parsed.value, limit: 100_000 });
  const rows = moves.map((m) => [
    m.id,
    formatMomentAbsolute(m.occurredAt.toISOString(), timeZone),
    m.kind,
    MOVE_LABEL[m.kind as keyof typeof MOVE_LABEL],
    m.lotNumber,
    m.quantity,
    m.counted,
    m.expected,
    m.grai,
    m.otherSite,
    m.orderRef,
    m.reason,
    m.who,
  ]);
  const fields = ['move', 'when', 'kind', 'move_label', 'lot', 'liners', 'counted', 'expected', 'bin', 'other_depot', 'hire_order', 'reason', 'by'];
  return csvResponse(csvTable(fields, rows), `liner-moves-depot-${q.depot}.csv`);
});
