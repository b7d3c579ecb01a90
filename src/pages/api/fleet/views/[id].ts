import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { deleteView, updateView } from '@/lib/fleet/saved-views.server';
import { MAX_VIEW_NAME, isBuiltinViewId } from '@/lib/fleet/grid-views';
import { AppError } from '@/lib/api-errors';

function viewId(raw: string | undefined): number {
  if (raw && isBuiltinViewId(raw)) throw new AppError('forbidden', 'Built-in views cannot be changed or deleted. Save a copy under your own name instead.');
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw new AppError('not_found', 'There is no such saved view.');
  return id;
}

const patchSchema = z
  .object({
    name: text().trim().min(1, 'Give the view a name').max(MAX_VIEW_NAME).optional(),
    shared: z.boolean().optional(),
    state: z.unknown().optional(),
    version: z.number().int().min(0),
  })
  .strict();

/** Rename, share or unshare, or overwrite the saved state of one's own view. */
export const PATCH = endpoint({ capability: 'fleet.view', body: patchSchema }, async ({ ctx, user, body }) => updateView(user, viewId(ctx.params.id), body));

export const DELETE = endpoint({ capability: 'fleet.view' }, async ({ ctx, user }) => {
  await deleteView(user, viewId(ctx.params.id));
  return { deleted: true };
});
