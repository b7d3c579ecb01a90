import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { attachmentFor } from '@/lib/attachments.server';
import { idParams } from '@/lib/route-params';

const params = idParams('Attachment');

/**
 * Serves a stored file with its sniffed type, only to signed-in users who may
 * see it: operator staff see all; a customer only their own organisation's.
 */
export const GET = endpoint({ capability: 'bins.view', params }, async ({ user, params }) => {
  const row = await attachmentFor(user, params.id);
  if (!row) throw new AppError('not_found', 'No such file.');
  return new Response(new Uint8Array(row.content), {
    headers: {
      'Content-Type': row.contentType,
      'Content-Length': String(row.byteSize),
      'Cache-Control': 'private, max-age=3600',
      'Content-Disposition': `inline; filename="attachment-${row.id}"`,
      'X-Content-Type-Options': 'nosniff',
    },
  });
});
