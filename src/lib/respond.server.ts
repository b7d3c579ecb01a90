import { ERROR_STATUS, type ErrorCode } from './api-errors';

const JSON_HEADERS = { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' };

export function dataResponse(data: unknown, status = 200): Response {
  return new Response(JSON.stringify({ data }), { status, headers: JSON_HEADERS });
}

export function errorResponse(code: ErrorCode, message: string, details?: unknown, headers: Record<string, string> = {}): Response {
  const error = details === undefined ? { code, message } : { code, message, details };
  return new Response(JSON.stringify({ error }), { status: ERROR_STATUS[code], headers: { ...JSON_HEADERS, ...headers } });
}
