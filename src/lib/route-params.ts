import { z } from 'zod';

/** A record id in a path segment ([id]): a positive whole number within PostgreSQL's integer. */
export function recordId(what: string) {
  const message = `${what} ids are positive whole numbers.`;
  return z.coerce.number({ invalid_type_error: message }).int(message).positive(message).max(2_147_483_647, message);
}

/** The `params` schema of a route whose one path parameter is [id]. */
export const idParams = (what: string) => z.object({ id: recordId(what) });
