// The browser side of the API envelope: every Loopfold endpoint answers
// { data } or { error: { code, message, details? } }. This wrapper returns
// `data` or throws an ApiError, so islands branch on `code`, never on text.
import type { ErrorCode } from './api-errors';

/** A server error code, or what went wrong before an answer arrived. */
export type ClientErrorCode = ErrorCode | 'network' | 'bad_response';

export interface FieldIssue {
  path: string;
  message: string;
}

export class ApiError extends Error {
  readonly code: ClientErrorCode;
  readonly status: number;
  readonly details?: unknown;
  constructor(code: ClientErrorCode, message: string, status: number, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.code = code;
    this.status = status;
    this.details = details;
  }

  /** Field messages from a validation answer, keyed by field path ("" for the whole form). */
  fieldMessages(): Record<string, string> {
    const out: Record<string, string> = {};
    if (Array.isArray(this.details)) {
      for (const d of this.details as FieldIssue[]) {
        if (d && typeof d.message === 'string') out[typeof d.path === 'string' ? d.path : ''] ??= d.message;
      }
    }
    return out;
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

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  method?: Method;
  query?: Record<string, QueryValue>;
  body?: unknown;
  signal?: AbortSignal;
}

async function request<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(withQuery(path, opts.query), {
      method: opts.method ?? 'GET',
      credentials: 'same-origin',
      headers: opts.body === undefined ? { Accept: 'application/json' } : { Accept: 'application/json', 'Content-Type': 'application/json' },
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
    throw new ApiError('bad_response', `The server answered in a way this page does not understand (HTTP ${res.status}). Reload and try again.`, res.status);
  }
  const env = payload as { data?: T; error?: { code: ErrorCode; message: string; details?: unknown } };
  if (env && typeof env === 'object' && env.error) throw new ApiError(env.error.code, env.error.message, res.status, env.error.details);
  if (!res.ok || !env || typeof env !== 'object' || !('data' in env)) {
    throw new ApiError('bad_response', `Unexpected answer from the server (HTTP ${res.status}).`, res.status);
  }
  return env.data as T;
}

/**
 * `api(path, { method, query, body, signal })`, or the shorthands
 * `api.get(path)`, `api.post(path, body)`, `api.put`, `api.patch`, `api.delete`.
 */
export const api = Object.assign(<T>(path: string, opts?: RequestOptions) => request<T>(path, opts), {
  get: <T>(path: string) => request<T>(path),
  post: <T>(path: string, body?: unknown) => request<T>(path, { method: 'POST', body: body ?? {} }),
  put: <T>(path: string, body: unknown) => request<T>(path, { method: 'PUT', body }),
  patch: <T>(path: string, body: unknown) => request<T>(path, { method: 'PATCH', body }),
  delete: <T>(path: string) => request<T>(path, { method: 'DELETE' }),
});

/** SWR fetcher: `useSWR(path, fetcher)`. */
export const fetcher = <T>(path: string): Promise<T> => request<T>(path);
