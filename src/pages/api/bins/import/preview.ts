import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { previewImport, readUpload } from '@/lib/bins/register-import.server';

/**
 * Check a register CSV without writing anything. The body is the file itself
 * (any Content-Type; its bytes are sniffed). Too large → 413, not CSV text →
 * 415, header problems → 422; otherwise every line with its problems.
 */
export const POST = endpoint({ capability: 'bins.import', query: z.object({ name: text().max(200).optional() }) }, async ({ ctx }) => previewImport(await readUpload(ctx.request)));
