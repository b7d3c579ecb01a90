/**
 * What a verified event of the payment provider means for an invoice. Pure: the signature was checked by the
 * provider's SDK before anything here runs, and the shape is checked again here (zod), so a well-signed event of
 * an unexpected shape is ignored, not guessed at.
 *
 *   actionFor(event) → paid (amount, reference) · processing · failed · ignored (with why)
 *
 * The provider's checkout sessions (common practice of hosted payment pages): a card payment completes the
 * session with payment_status "paid"; a bank debit completes it "unpaid" and settles later with
 * async_payment_succeeded or async_payment_failed.
 */
import { z } from 'zod';

const session = z.object({
  id: z.string().min(1).max(120),
  object: z.literal('checkout.session'),
  amount_total: z.number().int().positive(),
  currency: z.string().regex(/^[a-z]{3}$/),
  payment_status: z.enum(['paid', 'unpaid', 'no_payment_required']),
  payment_intent: z.string().max(120).nullable().optional(),
  metadata: z.record(z.string()).default({}),
});

const event = z.object({ id: z.string().min(1).max(120), type: z.string().max(80), data: z.object({ object: z.unknown() }) });

export type ProviderAction =
  | { kind: 'paid'; eventId: string; checkoutId: string; invoiceId: number | null; amountMinor: number; currency: string; reference: string }
  | { kind: 'processing'; eventId: string; checkoutId: string }
  | { kind: 'failed'; eventId: string; checkoutId: string }
  | { kind: 'ignored'; eventId: string; reason: string };

const HANDLED = ['checkout.session.completed', 'checkout.session.async_payment_succeeded', 'checkout.session.async_payment_failed'];

export function actionFor(raw: unknown): ProviderAction {
  const e = event.safeParse(raw);
  if (!e.success) return { kind: 'ignored', eventId: '', reason: 'not an event' };
  const eventId = e.data.id;
  if (!HANDLED.includes(e.data.type)) return { kind: 'ignored', eventId, reason: `${e.data.type} is not one we act on` };
  const s = session.safeParse(e.data.data.object);
  if (!s.success) return { kind: 'ignored', eventId, reason: 'the session has an unexpected shape' };
  const checkoutId = s.data.id;
  if (e.data.type === 'checkout.session.async_payment_failed') return { kind: 'failed', eventId, checkoutId };
  if (s.data.payment_status !== 'paid') return { kind: 'processing', eventId, checkoutId };
  const invoiceId = Number(s.data.metadata.invoiceId);
  return {
    kind: 'paid',
    eventId,
    checkoutId,
    invoiceId: Number.isSafeInteger(invoiceId) && invoiceId > 0 ? invoiceId : null,
    amountMinor: s.data.amount_total,
    currency: s.data.currency.toUpperCase(),
    reference: s.data.payment_intent ?? checkoutId,
  };
}
