// The browser side of the API envelope: every Loopfold endpoint answers
// { data } or { error: { code, message, details? } }. This wrapper returns
// `data` or throws an ApiError, so islands branch on `code`, never on text.
import type { ErrorCode } from '../api-errors';

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

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

async function request<T>(method: Method, path: string, body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      credentials: 'same-origin',
      headers: body === undefined ? { Accept: 'application/json' } : { Accept: 'application/json', 'Content-Type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
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

export const api = {
  get: <T>(path: string) => request<T>('GET', path),
  post: <T>(path: string, body?: unknown) => request<T>('POST', path, body ?? {}),
  put: <T>(path: string, body: unknown) => request<T>('PUT', path, body),
  patch: <T>(path: string, body: unknown) => request<T>('PATCH', path, body),
  delete: <T>(path: string) => request<T>('DELETE', path),
};
