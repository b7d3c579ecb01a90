// The whole register as CSV, streamed: one page of bins at a time by keyset
// pagination over the id (no OFFSET, no loading 100,000 rows at once), each
// page written as soon as it is read, and the next read only when the client
// has taken the last one.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { exportCsvChunk, type ExportRow } from './register-csv';

const PAGE = 2000;

interface Row extends ExportRow {
  id: number;
}

async function page(afterId: number, size: number): Promise<Row[]> {
  return sequelize.query<Row>(
    `SELECT a.id, a.grai, a.serial, bt.code AS bin_type, a.status, s.code AS site, o.name AS customer,
            to_char(a.manufacture_month, 'YYYY-MM') AS manufacture_month, a.un_marking, a.trip_count,
            a.last_inspection_on, a.last_full_inspection_on, a.next_intermediate_due, a.next_full_due, a.next_due
       FROM assets a
       JOIN bin_types bt ON bt.id = a.bin_type_id
       LEFT JOIN sites s ON s.id = a.site_id
       LEFT JOIN organisations o ON o.id = a.customer_id
      WHERE a.id > $1
      ORDER BY a.id
      LIMIT $2`,
    { bind: [afterId, size], type: QueryTypes.SELECT },
  );
}

/** The register as a byte stream of CSV (UTF-8; csvResponse() adds the byte-order mark). */
export function registerCsvStream(opts: { pageSize?: number } = {}): ReadableStream<Uint8Array> {
  const size = opts.pageSize ?? PAGE;
  const encoder = new TextEncoder();
  let lastId = 0;
  let first = true;
  return new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        try {
          const rows = await page(lastId, size);
          const chunk = exportCsvChunk(rows, first);
          if (chunk) controller.enqueue(encoder.encode(chunk));
          first = false;
          if (rows.length < size) controller.close();
          else lastId = rows[rows.length - 1]!.id;
        } catch (e) {
          controller.error(e);
        }
      },
    },
    { highWaterMark: 1 },
  );
}

export function exportFilename(today: string): string {
  return `loopfold-bin-register-${today}.csv`;
}
