// The one way browser code talks to Loopfold's API. Every endpoint answers
// { data } or { error: { code, message, details } } (src/lib/api-errors.ts);
// this unwraps the first and throws the second as an ApiError, so callers
// branch on `code` and show `message`, which is written for people.
import type { ErrorCode } from '../api-errors';

export class ApiError extends Error {
  readonly code: ErrorCode | 'network' | 'bad_response';
  readonly status: number;
  readonly details?: unknown;
  constructor(code: ApiError['code'], message: string, status: number, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.code = code;
    this.status = status;
    this.details = details;
  }
}

export type QueryValue = string | number | boolean | null | undefined | object;

/** Builds a path with a query string; objects and arrays travel as JSON, empty values are left out. */
export function withQuery(path: string, query: Record<string, QueryValue> = {}): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) {
    if (v === undefined || v === null || v === '') continue;
    params.set(k, typeof v === 'object' ? JSON.stringify(v) : String(v));
  }
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  query?: Record<string, QueryValue>;
  body?: unknown;
  signal?: AbortSignal;
}

export async function api<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(withQuery(path, opts.query), {
      method: opts.method ?? 'GET',
      credentials: 'same-origin',
      headers: { Accept: 'application/json', ...(opts.body === undefined ? {} : { 'Content-Type': 'application/json' }) },
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      signal: opts.signal,
    });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError('network', 'Loopfold could not be reached. Check your connection and try again.', 0);
  }
  let payload: unknown;
  try {
    payload = await res.json();
  } catch {
    throw new ApiError('bad_response', `The server answered ${res.status} without the expected JSON. Try again.`, res.status);
  }
  const envelope = payload as { data?: T; error?: { code: ErrorCode; message: string; details?: unknown } };
  if (!res.ok || envelope.error) {
    const e = envelope.error;
    throw new ApiError(e?.code ?? 'bad_response', e?.message ?? `The server answered ${res.status}.`, res.status, e?.details);
  }
  return envelope.data as T;
}

/** SWR fetcher: the key is the path. */
export const fetcher = <T>(path: string): Promise<T> => api<T>(path);
