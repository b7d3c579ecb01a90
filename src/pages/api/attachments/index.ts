import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { readUpload, storeAttachment } from '@/lib/attachments.server';

const purpose = z.enum(['photo', 'certificate', 'document']);

/** Upload a photo or certificate (multipart, field "file"); answers with the stored id. */
export const POST = endpoint({ capability: 'scan.record', status: 201 }, async ({ ctx, user }) => {
  const { bytes, filename, form } = await readUpload(ctx.request);
  const p = purpose.parse(form.get('purpose') ?? 'photo');
  return storeAttachment({ bytes, filename, purpose: p, organisationId: user.organisationId, uploadedBy: user.id });
});
