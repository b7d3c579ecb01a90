// The one typed client islands use to call Loopfold's API. It unwraps the
// envelope ({ data } / { error }) and throws ApiError, so callers branch on
// `code` (the catalogue in src/lib/api-errors.ts), never on message text.
import type { ApiErrorBody, ErrorCode } from '../api-errors';

export class ApiError extends Error {
  readonly code: ErrorCode | 'network';
  readonly status: number;
  readonly details?: unknown;
  constructor(code: ErrorCode | 'network', message: string, status: number, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.code = code;
    this.status = status;
    this.details = details;
  }
}

async function call<T>(method: string, path: string, body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      credentials: 'same-origin',
      headers: body === undefined ? { Accept: 'application/json' } : { 'Content-Type': 'application/json', Accept: 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new ApiError('network', 'No connection to Loopfold. It will be tried again when the signal is back.', 0);
  }
  let json: { data?: T; error?: ApiErrorBody } | null = null;
  try {
    json = (await res.json()) as { data?: T; error?: ApiErrorBody };
  } catch {
    /* not JSON (proxy error page) */
  }
  if (!res.ok || !json || 'error' in json) {
    const e = json?.error;
    throw new ApiError(e?.code ?? 'internal', e?.message ?? `Loopfold answered ${res.status}.`, res.status, e?.details);
  }
  return json.data as T;
}

export const api = {
  get: <T>(path: string) => call<T>('GET', path),
  post: <T>(path: string, body?: unknown) => call<T>('POST', path, body ?? {}),
  put: <T>(path: string, body?: unknown) => call<T>('PUT', path, body ?? {}),
  patch: <T>(path: string, body?: unknown) => call<T>('PATCH', path, body ?? {}),
  delete: <T>(path: string) => call<T>('DELETE', path),
};

/** SWR fetcher: `useSWR(path, fetcher)`. */
export const fetcher = <T>(path: string) => api.get<T>(path);
