// The one way to answer with a CSV download: content type, a safe file name,
// no caching, and the UTF-8 byte-order mark (spreadsheet programs read
// accented names right only with it). Streams stay streams: cancelling the
// download cancels the producer (e.g. closes a database cursor).
const BOM = '\uFEFF';
const BOM_BYTES = new TextEncoder().encode(BOM);

/** Letters, digits, dot, dash and underscore only: nothing that could break out of the header. */
export function safeFileName(name: string): string {
  const cleaned = name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+/, '');
  return (cleaned || 'export').slice(0, 120).replace(/(\.csv)?$/i, '.csv');
}

function csvHeaders(fileName: string): Record<string, string> {
  return {
    'Content-Type': 'text/csv; charset=utf-8',
    'Content-Disposition': `attachment; filename="${safeFileName(fileName)}"`,
    'Cache-Control': 'no-store',
    'X-Content-Type-Options': 'nosniff',
  };
}

/** A CSV download from text written by src/lib/csv.ts, or from a stream of its chunks. */
export function csvResponse(body: string | ReadableStream<Uint8Array>, fileName: string): Response {
  if (typeof body === 'string') return new Response(BOM + body, { status: 200, headers: csvHeaders(fileName) });
  const withBom = body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      start(controller) {
        controller.enqueue(BOM_BYTES);
      },
    }),
  );
  return new Response(withBom, { status: 200, headers: csvHeaders(fileName) });
}
