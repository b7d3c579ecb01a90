import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { canonicalGrai, editBody, updateBin } from '@/lib/bins/bin-edit.server';
import { getSettings } from '@/lib/settings/settings.server';

/**
 * Correct a registered bin (the /bins/<grai>/edit form). The path rule for
 * /api/bins admits every role that may view bins; editing needs bins.edit,
 * which endpoint() checks before anything else. A stale form → 409 changed_meanwhile.
 */
export const PATCH = endpoint({ capability: 'bins.edit', body: editBody }, async ({ ctx, user, body }) => {
  const { gs1PrefixLength } = await getSettings();
  const grai = canonicalGrai(ctx.params.grai, gs1PrefixLength);
  if (!grai) throw new AppError('not_found', 'That is not a GRAI this register knows.');
  return updateBin(user, grai, body, ctx.locals.clientAddress ?? null);
});
