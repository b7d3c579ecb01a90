import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { storeAttachment } from '@/lib/attachments.server';

const form = z.object({ purpose: z.enum(['photo', 'certificate', 'document']).default('photo') });

/** Upload a photo or certificate (multipart, field "file"); answers with the stored id. */
export const POST = endpoint({ capability: 'scan.record', form, files: ['file'], status: 201 }, async ({ user, form, files }) => {
  if (!files.file) throw new AppError('validation_failed', 'Choose a file to upload.', [{ path: 'file', message: 'Choose a file to upload.' }]);
  return storeAttachment({ ...files.file, purpose: form.purpose, organisationId: user.organisationId, uploadedBy: user.id });
});
