// The one catalogue of API error codes. Every endpoint answers
//   { data: ... }                                  on success
//   { error: { code, message, details? } }         on failure
// with the HTTP status listed here, so clients branch on `code`, never on text.

export const ERROR_STATUS = {
  bad_json: 400,
  validation_failed: 400,
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  method_not_allowed: 405,
  conflict: 409,
  changed_meanwhile: 409,
  duplicate: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  transition_refused: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export interface ApiErrorBody {
  code: ErrorCode;
  message: string;
  details?: unknown;
}

export type ApiEnvelope<T> = { data: T } | { error: ApiErrorBody };

/** Thrown by services; turned into the envelope by the endpoint wrapper. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly details?: unknown;
  /** Headers the answer carries (Retry-After on a rate limit). */
  readonly headers?: Record<string, string>;
  constructor(code: ErrorCode, message: string, details?: unknown, headers?: Record<string, string>) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.details = details;
    this.headers = headers;
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}
