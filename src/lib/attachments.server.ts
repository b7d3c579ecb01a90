// Uploaded files live in PostgreSQL (stateless app servers). The content type
// is sniffed from the bytes (file-type), never taken from the client, and only
// a short list of kinds is accepted.
import { reachableBins, siteLimited } from '@/lib/customer-scope.server';
import { createHash } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { fileTypeFromBuffer } from 'file-type';
import { Attachment } from '@/models';
import { AppError } from './api-errors';
import { readFormCapped } from '@/lib/http/body.server';
import { can, type Role } from './permissions';

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

const ALLOWED: Record<'photo' | 'certificate' | 'document', string[]> = {
  photo: ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/avif'],
  certificate: ['application/pdf', 'image/jpeg', 'image/png'],
  document: ['application/pdf'],
};

export interface StoreInput {
  bytes: Uint8Array;
  filename: string | null;
  purpose: 'photo' | 'certificate' | 'document';
  organisationId: number | null;
  uploadedBy: number | null;
}

/**
 * Checks an upload's size and sniffs its type from the bytes; returns the
 * content type or throws the AppError to show. Callers that must refuse a bad
 * file before doing anything else (counting a rate limit, say) call it first.
 */
export async function checkUpload(bytes: Uint8Array, purpose: StoreInput['purpose']): Promise<string> {
  if (bytes.byteLength === 0) throw new AppError('validation_failed', 'The file is empty.');
  if (bytes.byteLength > MAX_UPLOAD_BYTES) throw new AppError('payload_too_large', `Files may be at most ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`);
  const sniffed = await fileTypeFromBuffer(bytes);
  if (!sniffed || !ALLOWED[purpose].includes(sniffed.mime)) {
    throw new AppError('unsupported_media_type', purpose === 'photo' ? 'That file is not a photo (JPEG, PNG, WebP or HEIC).' : 'That file type is not accepted here.');
  }
  return sniffed.mime;
}

export async function storeAttachment(input: StoreInput, transaction?: Transaction): Promise<{ id: number; contentType: string; byteSize: number }> {
  const contentType = await checkUpload(input.bytes, input.purpose);
  const row = await Attachment.create(
    {
      content: Buffer.from(input.bytes),
      contentType,
      byteSize: input.bytes.byteLength,
      sha256: createHash('sha256').update(input.bytes).digest('hex'),
      filename: input.filename?.slice(0, 200) ?? null,
      purpose: input.purpose,
      organisationId: input.organisationId,
      uploadedBy: input.uploadedBy,
    },
    { transaction },
  );
  return { id: row.id, contentType, byteSize: row.byteSize };
}

/** A multipart upload form's whole body: the largest file and room for the other fields and the part headers. */
export const MAX_FORM_BYTES = MAX_UPLOAD_BYTES + 64 * 1024;

/**
 * Reads a multipart form, never more than MAX_FORM_BYTES: refused by its
 * declared length before reading, or as soon as a chunked body passes it.
 */
export async function readForm(request: Request): Promise<FormData> {
  if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
    await request.body?.cancel().catch(() => undefined);
    throw new AppError('unsupported_media_type', 'Send the form as multipart/form-data.');
  }
  const tooLarge = () => new AppError('payload_too_large', `Files may be at most ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`, { maxBytes: MAX_FORM_BYTES });
  try {
    return await readFormCapped(request, MAX_FORM_BYTES, tooLarge);
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw new AppError('bad_request', 'The upload could not be read.');
  }
}

/** The file in a form field, or null when none was chosen. */
export async function formFile(form: FormData, field: string): Promise<{ bytes: Uint8Array; filename: string | null } | null> {
  const file = form.get(field);
  if (!(file instanceof File) || file.size === 0) return null;
  return { bytes: new Uint8Array(await file.arrayBuffer()), filename: file.name || null };
}

/**
 * A stored file with its bytes, for someone allowed to see it: operator staff (who may edit bins, and the yard)
 * see every file; anyone else only their own organisation's. null when there is no such file for this user.
 */
export async function attachmentFor(user: { id?: number; role: Role; organisationId: number; siteIds?: number[] | null }, id: number): Promise<Attachment | null> {
  const row = await Attachment.scope('withContent').findByPk(id);
  const staff = can(user.role, 'bins.edit') || user.role === 'yard';
  if (!row || !(staff || row.organisationId === user.organisationId)) return null;
  // A customer user limited to some sites: a bin's photo only when the bin is at (or for) one of them; a loose file only their own.
  if (siteLimited(user)) {
    const visible = row.assetId !== null ? (await reachableBins(user, [row.assetId])).has(row.assetId) : row.uploadedBy === user.id;
    if (!visible) return null;
  }
  return row;
}
