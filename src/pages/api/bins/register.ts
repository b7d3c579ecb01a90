import { endpoint } from '@/lib/endpoint.server';
import { registerBody, registerFromForm } from '@/lib/bins/bin-forms.server';

/** Register one bin (the /bins/new form). Every problem comes back at once, per field. */
export const POST = endpoint({ capability: 'bins.edit', body: registerBody, status: 201 }, async ({ ctx, user, body }) =>
  registerFromForm(user, body, ctx.locals.clientAddress ?? null),
);
