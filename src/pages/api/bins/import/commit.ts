import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { commitImport, readUpload } from '@/lib/bins/register-import.server';

const query = z.object({
  sha256: text().regex(/^[0-9a-f]{64}$/, 'Give the sha256 of the previewed file.'),
  name: text().max(200).optional(),
});

/**
 * Register every bin of a previewed CSV in one transaction, or none. The body
 * is the same file again; `sha256` (from the preview) proves it is the one seen.
 */
export const POST = endpoint({ capability: 'bins.import', query, status: 201 }, async ({ ctx, user, query: q }) =>
  commitImport(user, await readUpload(ctx.request), { expectedSha256: q.sha256, filename: q.name ?? null, ip: ctx.locals.clientAddress ?? null }),
);
