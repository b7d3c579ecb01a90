// Reading a request body without ever holding more than its limit: refused by
// its declared Content-Length before anything is read, and by the bytes
// actually received when the length is missing (chunked) or understated. On
// the limit the stream is cancelled; the app server (src/cli/serve.mjs) then
// stops reading the connection, so the rest of a huge upload never arrives
// in memory.
import { AppError } from '@/lib/api-errors';

/** What src/cli/serve.mjs throws from the body stream past its own hard limit. */
const SERVER_BODY_LIMIT = 'LOOPFOLD_BODY_LIMIT';

export function declaredLength(request: Request): number | null {
  const raw = request.headers.get('content-length');
  if (raw === null || !/^\d{1,15}$/.test(raw.trim())) return null;
  return Number(raw);
}

/**
 * The body's bytes, at most `maxBytes` of them; otherwise `tooLarge()` is
 * thrown (an AppError with code payload_too_large, answered 413).
 */
export async function readBodyCapped(request: Request, maxBytes: number, tooLarge: () => AppError): Promise<Uint8Array> {
  const declared = declaredLength(request);
  if (declared !== null && declared > maxBytes) {
    await request.body?.cancel().catch(() => undefined);
    throw tooLarge();
  }
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let received = 0;
  for (;;) {
    let step: ReadableStreamReadResult<Uint8Array>;
    try {
      step = await reader.read();
    } catch (err) {
      if ((err as { code?: unknown } | null)?.code === SERVER_BODY_LIMIT) throw tooLarge();
      throw new AppError('bad_request', 'The request body could not be read (the connection ended early).');
    }
    if (step.done) break;
    received += step.value.byteLength;
    if (received > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(step.value);
  }
  if (chunks.length === 1) return chunks[0]!;
  const bytes = new Uint8Array(received);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.byteLength;
  }
  return bytes;
}

/** A multipart or url-encoded form read within `maxBytes`, parsed only once it is all here. */
export async function readFormCapped(request: Request, maxBytes: number, tooLarge: () => AppError): Promise<FormData> {
  const type = request.headers.get('content-type') ?? '';
  const bytes = await readBodyCapped(request, maxBytes, tooLarge);
  return new Response(bytes as Uint8Array<ArrayBuffer>, { headers: { 'content-type': type } }).formData();
}
