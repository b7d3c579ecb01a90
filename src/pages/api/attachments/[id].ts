import type { APIRoute } from 'astro';
import { attachmentFor } from '@/lib/attachments.server';
import { errorResponse } from '@/lib/respond.server';

/**
 * Serves a stored file with its sniffed type, only to signed-in users who may
 * see it: operator staff see all; a customer only their own organisation's.
 */
export const GET: APIRoute = async ({ params, locals }) => {
  const user = locals.user;
  if (!user) return errorResponse('unauthenticated', 'Sign in first.');
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) return errorResponse('bad_request', 'Attachment ids are positive whole numbers.');
  const row = await attachmentFor(user, id);
  if (!row) return errorResponse('not_found', 'No such file.');
  return new Response(new Uint8Array(row.content), {
    headers: {
      'Content-Type': row.contentType,
      'Content-Length': String(row.byteSize),
      'Cache-Control': 'private, max-age=3600',
      'Content-Disposition': `inline; filename="attachment-${row.id}"`,
      'X-Content-Type-Options': 'nosniff',
    },
  });
};
