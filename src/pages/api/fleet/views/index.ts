import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { createView, listViews } from '@/lib/fleet/saved-views.server';
import { MAX_VIEW_NAME } from '@/lib/fleet/grid-views';

/** The fleet grid's views this user may open: built-in, their own, and those other planners shared. */
export const GET = endpoint({ capability: 'fleet.view' }, async ({ user }) => listViews(user));

const createSchema = z
  .object({
    name: text().trim().min(1, 'Give the view a name').max(MAX_VIEW_NAME),
    shared: z.boolean().default(false),
    state: z.unknown(),
  })
  .strict();

export const POST = endpoint({ capability: 'fleet.view', body: createSchema, status: 201 }, async ({ user, body }) =>
  createView(user, { name: body.name, shared: body.shared, state: body.state }),
);
