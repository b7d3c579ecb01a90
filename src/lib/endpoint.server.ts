import type { APIContext, APIRoute } from 'astro';
import { type z, ZodError, type ZodTypeAny } from 'zod';
import { OptimisticLockError, UniqueConstraintError, ForeignKeyConstraintError, ValidationError, DatabaseError } from 'sequelize';
import { AppError, type ErrorCode } from './api-errors';
import { can, type Capability } from './permissions';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { dataResponse, errorResponse } from './respond.server';
import { readBodyCapped } from '@/lib/http/body.server';
import { formFile, readForm } from '@/lib/attachments.server';
import { hit } from '@/lib/rate-limits.server';
import type { RateLimiterPostgres } from 'rate-limiter-flexible';

const MAX_JSON_BYTES = 1_000_000;

interface EndpointOptions<B extends ZodTypeAny, Q extends ZodTypeAny, P extends ZodTypeAny, F extends ZodTypeAny> {
  /** Who may call it: a capability from the role table, or 'public' (see publicEndpoint). */
  capability: Capability | 'public';
  /** A JSON body. */
  body?: B;
  query?: Q;
  /** The route's own path parameters ([id], [grai]…), validated like the rest. */
  params?: P;
  /**
   * A multipart form (file uploads): the text fields, validated by this schema, and the names of its file
   * fields, each handed over as bytes or null. The whole form is read within MAX_FORM_BYTES.
   */
  form?: F;
  files?: readonly string[];
  /** Checked before the body is read, so a flood costs no reading: a limiter and the key a request counts under. */
  throttle?: { limiter: () => RateLimiterPostgres; key: (ctx: APIContext) => string; message: string };
  /** HTTP status on success (default 200). */
  status?: number;
}

export type UploadedFile = { bytes: Uint8Array; filename: string | null };

interface HandlerArgs<B extends ZodTypeAny, Q extends ZodTypeAny, P extends ZodTypeAny, F extends ZodTypeAny, U> {
  ctx: APIContext;
  user: U;
  body: z.infer<B>;
  query: z.infer<Q>;
  params: z.infer<P>;
  form: z.infer<F>;
  files: Record<string, UploadedFile | null>;
}

/** Turns zod issues into { field: message } for forms. */
function zodDetails(err: ZodError) {
  return err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) {
    throw new AppError('unsupported_media_type', 'Send the request body as JSON (Content-Type: application/json).');
  }
  const bytes = await readBodyCapped(
    request,
    MAX_JSON_BYTES,
    () => new AppError('payload_too_large', `The request body is too large (at most ${MAX_JSON_BYTES / 1_000_000} MB of JSON).`, { maxBytes: MAX_JSON_BYTES }),
  );
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return text === '' ? {} : JSON.parse(text);
  } catch {
    throw new AppError('bad_json', 'The request body is not valid JSON.');
  }
}

/** Any thrown error as the AppError it is answered with; only the unexpected becomes `internal` (a 500). */
function asAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return new AppError('validation_failed', 'Some fields are not valid.', zodDetails(err));
  if (err instanceof OptimisticLockError) return new AppError('changed_meanwhile', 'Someone else changed this record meanwhile. Reload and try again.');
  if (err instanceof UniqueConstraintError)
    return new AppError(
      'duplicate',
      'A record with the same key already exists.',
      err.errors?.map((e) => e.path),
    );
  if (err instanceof ForeignKeyConstraintError) return new AppError('unprocessable', 'A referenced record does not exist.');
  if (err instanceof ValidationError) return new AppError('validation_failed', err.message);
  if (err instanceof DatabaseError && /violates check constraint|invalid input syntax|out of range/.test(err.message)) {
    return new AppError('unprocessable', 'A value is outside what the record allows.');
  }
  console.error('[api] unexpected error', err);
  return new AppError('internal', 'Something went wrong on our side. Try again; if it keeps happening, tell your administrator.');
}

/** The envelope's `error` member for a thrown error, with the HTTP status it is answered with. */
export function errorEnvelope(err: unknown): { status: number; error: { code: ErrorCode; message: string; details?: unknown } } {
  const e = asAppError(err);
  return { status: e.status, error: e.details === undefined ? { code: e.code, message: e.message } : { code: e.code, message: e.message, details: e.details } };
}

/** Maps any thrown error onto the envelope; only the unexpected becomes a 500. */
export function toErrorResponse(err: unknown): Response {
  const e = asAppError(err);
  return errorResponse(e.code, e.message, e.details, e.headers);
}

/** What endpoint() was told, kept on the route for tests that drive every route from its schemas. */
export interface EndpointSchemas {
  capability: Capability | 'public';
  body?: ZodTypeAny;
  query?: ZodTypeAny;
  params?: ZodTypeAny;
  form?: ZodTypeAny;
  files?: readonly string[];
  /** Set on rawEndpoint() routes: the body is bytes the handler checks itself (a signed webhook). */
  raw?: true;
}

type Route = APIRoute & { schemas: EndpointSchemas };

/** The text fields of a multipart form as a plain object (a repeated field becomes a list), files left out. */
function formFields(form: FormData, files: readonly string[]): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const [name, value] of form.entries()) {
    if (files.includes(name) || typeof value !== 'string') continue;
    const had = out[name];
    out[name] = had === undefined ? value : Array.isArray(had) ? [...had, value] : [had, value];
  }
  return out;
}

async function guard(
  ctx: APIContext,
  capability: Capability | 'public',
  throttle: EndpointOptions<ZodTypeAny, ZodTypeAny, ZodTypeAny, ZodTypeAny>['throttle'],
): Promise<Response | null> {
  const user = ctx.locals.user;
  if (capability !== 'public') {
    if (!user) return errorResponse('unauthenticated', 'Sign in first.');
    if (!can(user.role, capability)) return errorResponse('forbidden', 'Your role may not use this.');
  }
  if (throttle) {
    const wait = await hit(throttle.limiter(), throttle.key(ctx));
    if (wait) {
      await ctx.request.body?.cancel().catch(() => undefined);
      return errorResponse('rate_limited', throttle.message, undefined, { 'Retry-After': String(wait) });
    }
  }
  return null;
}

function answer(result: unknown, status: number): Response {
  return result instanceof Response ? result : dataResponse(result ?? null, status);
}

/**
 * The one way to write an API route: declare who may call it and the shape of
 * its input; the handler gets validated values and returns plain data.
 */
export function endpoint<
  B extends ZodTypeAny = z.ZodUndefined,
  Q extends ZodTypeAny = z.ZodUndefined,
  P extends ZodTypeAny = z.ZodUndefined,
  F extends ZodTypeAny = z.ZodUndefined,
>(opts: EndpointOptions<B, Q, P, F> & { capability: Capability }, handler: (args: HandlerArgs<B, Q, P, F, SessionUser>) => Promise<unknown>): Route {
  return build(opts, handler as (args: HandlerArgs<B, Q, P, F, SessionUser | null>) => Promise<unknown>);
}

/** endpoint() for callers without an account (forms on public pages, sign-in help): the user is there or null. */
export function publicEndpoint<
  B extends ZodTypeAny = z.ZodUndefined,
  Q extends ZodTypeAny = z.ZodUndefined,
  P extends ZodTypeAny = z.ZodUndefined,
  F extends ZodTypeAny = z.ZodUndefined,
>(opts: Omit<EndpointOptions<B, Q, P, F>, 'capability'>, handler: (args: HandlerArgs<B, Q, P, F, SessionUser | null>) => Promise<unknown>): Route {
  return build({ ...opts, capability: 'public' }, handler);
}

function build<B extends ZodTypeAny, Q extends ZodTypeAny, P extends ZodTypeAny, F extends ZodTypeAny>(
  opts: EndpointOptions<B, Q, P, F>,
  handler: (args: HandlerArgs<B, Q, P, F, SessionUser | null>) => Promise<unknown>,
): Route {
  const fileNames = opts.files ?? [];
  const route: APIRoute = async (ctx) => {
    try {
      const refused = await guard(ctx, opts.capability, opts.throttle);
      if (refused) return refused;
      const params = opts.params ? opts.params.parse(ctx.params) : undefined;
      const query = opts.query ? opts.query.parse(Object.fromEntries(ctx.url.searchParams)) : undefined;
      const body = opts.body ? opts.body.parse(await readJson(ctx.request)) : undefined;
      let form: unknown;
      const files: Record<string, UploadedFile | null> = {};
      if (opts.form) {
        const data = await readForm(ctx.request);
        form = opts.form.parse(formFields(data, fileNames));
        for (const name of fileNames) files[name] = await formFile(data, name);
      }
      const result = await handler({ ctx, user: ctx.locals.user ?? null, body, query, params, form, files });
      return answer(result, opts.status ?? 200);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  const schemas: EndpointSchemas = { capability: opts.capability, body: opts.body, query: opts.query, params: opts.params, form: opts.form, files: opts.files };
  return Object.assign(route, { schemas });
}

/**
 * For a caller that signs its request (a payment provider's webhook): the handler gets the body's exact bytes,
 * at most `maxBytes`, unparsed, because a signature is checked on what was received, not on a re-serialisation.
 */
export function rawEndpoint(
  opts: { capability: Capability | 'public'; maxBytes?: number; status?: number },
  handler: (args: { ctx: APIContext; user: SessionUser | null; raw: Uint8Array }) => Promise<unknown>,
): Route {
  const maxBytes = opts.maxBytes ?? MAX_JSON_BYTES;
  const route: APIRoute = async (ctx) => {
    try {
      const refused = await guard(ctx, opts.capability, undefined);
      if (refused) return refused;
      const raw = await readBodyCapped(ctx.request, maxBytes, () => new AppError('payload_too_large', `The request body is too large (at most ${maxBytes} bytes).`, { maxBytes }));
      return answer(await handler({ ctx, user: ctx.locals.user ?? null, raw }), opts.status ?? 200);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  return Object.assign(route, { schemas: { capability: opts.capability, raw: true as const } });
}
