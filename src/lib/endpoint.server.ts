import type { APIContext, APIRoute } from 'astro';
import { z, ZodError, type ZodTypeAny } from 'zod';
import { OptimisticLockError, UniqueConstraintError, ForeignKeyConstraintError, ValidationError, DatabaseError } from 'sequelize';
import { AppError } from './api-errors';
import { can, type Capability } from './permissions';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { dataResponse, errorResponse } from './respond.server';
import { readBodyCapped } from '@/lib/http/body.server';

export const MAX_JSON_BYTES = 1_000_000;

interface EndpointOptions<B extends ZodTypeAny, Q extends ZodTypeAny> {
  /** Who may call it: a capability from the role table, or 'public'. */
  capability: Capability | 'public';
  body?: B;
  query?: Q;
  /** HTTP status on success (default 200). */
  status?: number;
}

interface HandlerArgs<B extends ZodTypeAny, Q extends ZodTypeAny, Pub extends boolean> {
  ctx: APIContext;
  user: Pub extends true ? SessionUser | null : SessionUser;
  body: z.infer<B>;
  query: z.infer<Q>;
}

/** Turns zod issues into { field: message } for forms. */
export function zodDetails(err: ZodError) {
  return err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) {
    throw new AppError('unsupported_media_type', 'Send the request body as JSON (Content-Type: application/json).');
  }
  const bytes = await readBodyCapped(request, MAX_JSON_BYTES, () =>
    new AppError('payload_too_large', `The request body is too large (at most ${MAX_JSON_BYTES / 1_000_000} MB of JSON).`, { maxBytes: MAX_JSON_BYTES }),
  );
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return text === '' ? {} : JSON.parse(text);
  } catch {
    throw new AppError('bad_json', 'The request body is not valid JSON.');
  }
}

/** Maps any thrown error onto the envelope; only the unexpected becomes a 500. */
export function toErrorResponse(err: unknown): Response {
  if (err instanceof AppError) return errorResponse(err.code, err.message, err.details);
  if (err instanceof ZodError) return errorResponse('validation_failed', 'Some fields are not valid.', zodDetails(err));
  if (err instanceof OptimisticLockError) {
    return errorResponse('changed_meanwhile', 'Someone else changed this record meanwhile. Reload and try again.');
  }
  if (err instanceof UniqueConstraintError) {
    return errorResponse('duplicate', 'A record with the same key already exists.', err.errors?.map((e) => e.path));
  }
  if (err instanceof ForeignKeyConstraintError) return errorResponse('unprocessable', 'A referenced record does not exist.');
  if (err instanceof ValidationError) return errorResponse('validation_failed', err.message);
  if (err instanceof DatabaseError && /violates check constraint|invalid input syntax|out of range/.test(err.message)) {
    return errorResponse('unprocessable', 'A value is outside what the record allows.');
  }
  console.error('[api] unexpected error', err);
  return errorResponse('internal', 'Something went wrong on our side. Try again; if it keeps happening, tell your administrator.');
}

/** What endpoint() was told, kept on the route for tests that drive every route from its schemas. */
export interface EndpointSchemas {
  capability: Capability | 'public';
  body?: ZodTypeAny;
  query?: ZodTypeAny;
}

/**
 * The one way to write an API route: declare who may call it and the shape of
 * its input; the handler gets validated values and returns plain data.
 */
export function endpoint<B extends ZodTypeAny = z.ZodUndefined, Q extends ZodTypeAny = z.ZodUndefined, Pub extends boolean = false>(
  opts: EndpointOptions<B, Q> & { capability: Pub extends true ? 'public' : Capability },
  handler: (args: HandlerArgs<B, Q, Pub>) => Promise<unknown>,
): APIRoute & { schemas: EndpointSchemas } {
  const route: APIRoute = async (ctx) => {
    try {
      const user = ctx.locals.user;
      if (opts.capability !== 'public') {
        if (!user) return errorResponse('unauthenticated', 'Sign in first.');
        if (!can(user.role, opts.capability)) return errorResponse('forbidden', 'Your role may not use this.');
      }
      const query = opts.query ? opts.query.parse(Object.fromEntries(ctx.url.searchParams)) : undefined;
      const body = opts.body ? opts.body.parse(await readJson(ctx.request)) : undefined;
      const result = await handler({ ctx, user: user as HandlerArgs<B, Q, Pub>['user'], body, query });
      if (result instanceof Response) return result;
      return dataResponse(result ?? null, opts.status ?? 200);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  return Object.assign(route, { schemas: { capability: opts.capability, body: opts.body, query: opts.query } });
}
