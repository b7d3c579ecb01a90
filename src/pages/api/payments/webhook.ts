import { rawEndpoint } from '@/lib/endpoint.server';
import { receiveProviderEvent } from '@/lib/billing/payments.server';

/** The payment provider's events, signed: POST /api/payments/webhook (verified on the exact bytes; 400 when not). */
export const POST = rawEndpoint({ capability: 'public', maxBytes: 256 * 1024 }, async ({ ctx, raw }) =>
  receiveProviderEvent(raw, ctx.request.headers.get('stripe-signature'), ctx.locals.clientAddress ?? null),
);
