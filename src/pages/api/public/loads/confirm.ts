import type { APIRoute } from 'astro';
import { z } from 'zod';
import { text } from '@/lib/text-input';
import { confirmDelivery, loadFromToken, loadCustomerId } from '@/lib/loads/load-service.server';
import { formFile, readForm, storeAttachment } from '@/lib/attachments.server';
import { publicFormLimit, hit } from '@/lib/rate-limits.server';
import { dataResponse, errorResponse } from '@/lib/respond.server';
import { toErrorResponse } from '@/lib/endpoint.server';

const fields = z.object({
  token: text().min(10).max(120),
  receivedByName: text().trim().min(2, 'Give your name.').max(120),
});

/**
 * The receiving end confirms a load through the link on its dispatch note
 * (no account needed): name, and optionally a photo of the delivered load.
 */
export const POST: APIRoute = async ({ request, locals }) => {
  try {
    const wait = await hit(publicFormLimit(), `confirm:${locals.clientAddress}`);
    if (wait) return errorResponse('rate_limited', 'Too many submissions from here; try again later.', undefined, { 'Retry-After': String(wait) });
    const form = await readForm(request);
    const photo = await formFile(form, 'photo');
    const parsed = fields.safeParse({ token: form.get('token'), receivedByName: form.get('receivedByName') });
    if (!parsed.success) return errorResponse('validation_failed', parsed.error.issues[0]!.message, parsed.error.issues);
    const load = await loadFromToken(parsed.data.token);
    if (!load) return errorResponse('not_found', 'This delivery link is not valid. Check it against the dispatch note.');
    const stored = photo ? await storeAttachment({ ...photo, purpose: 'photo', organisationId: await loadCustomerId(load), uploadedBy: locals.user?.id ?? null }) : null;
    const result = await confirmDelivery(load, { receivedByName: parsed.data.receivedByName, photoId: stored?.id ?? null, userId: locals.user?.id ?? null });
    return dataResponse({ reference: load.reference, ...result });
  } catch (err) {
    return toErrorResponse(err);
  }
};
