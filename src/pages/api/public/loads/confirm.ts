import { z } from 'zod';
import { publicEndpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { text } from '@/lib/text-input';
import { confirmDelivery, loadFromToken, loadCustomerId } from '@/lib/loads/load-service.server';
import { storeAttachment } from '@/lib/attachments.server';
import { publicFormLimit } from '@/lib/rate-limits.server';

const form = z.object({
  token: text().min(10).max(120),
  receivedByName: text().trim().min(2, 'Give your name.').max(120),
});

/**
 * The receiving end confirms a load through the link on its dispatch note
 * (no account needed): name, and optionally a photo of the delivered load.
 */
export const POST = publicEndpoint(
  {
    form,
    files: ['photo'],
    throttle: { limiter: publicFormLimit, key: (ctx) => `confirm:${ctx.locals.clientAddress}`, message: 'Too many submissions from here; try again later.' },
  },
  async ({ user, form, files }) => {
    const load = await loadFromToken(form.token);
    if (!load) throw new AppError('not_found', 'This delivery link is not valid. Check it against the dispatch note.');
    const photo = files.photo;
    const stored = photo ? await storeAttachment({ ...photo, purpose: 'photo', organisationId: await loadCustomerId(load), uploadedBy: user?.id ?? null }) : null;
    const result = await confirmDelivery(load, { receivedByName: form.receivedByName, photoId: stored?.id ?? null, userId: user?.id ?? null });
    return { reference: load.reference, ...result };
  },
);
