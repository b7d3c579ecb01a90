// What a verified provider event means, as a literal table: the checkout-session events of hosted pay pages
// (completed paid / completed unpaid then async succeeded or failed) as the provider documents them (from memory,
// common practice of such providers); anything else, or a session of another shape, is ignored.
import { describe, test, expect } from 'vitest';
import { actionFor } from '@/lib/billing/payment-events';

const session = (over: Record<string, unknown> = {}) => ({
  id: 'cs_test_1',
  object: 'checkout.session',
  amount_total: 3000,
  currency: 'eur',
  payment_status: 'paid',
  payment_intent: 'pi_test_1',
  metadata: { invoiceId: '7', invoiceNumber: 'INV-2026-00007' },
  ...over,
});
const event = (type: string, object: unknown = session()) => ({ id: 'evt_1', type, data: { object } });

describe('provider events', () => {
  test.each([
    [
      'checkout.session.completed',
      session(),
      { kind: 'paid', eventId: 'evt_1', checkoutId: 'cs_test_1', invoiceId: 7, amountMinor: 3000, currency: 'EUR', reference: 'pi_test_1' },
    ],
    ['checkout.session.completed', session({ payment_status: 'unpaid' }), { kind: 'processing', eventId: 'evt_1', checkoutId: 'cs_test_1' }],
    [
      'checkout.session.async_payment_succeeded',
      session(),
      { kind: 'paid', eventId: 'evt_1', checkoutId: 'cs_test_1', invoiceId: 7, amountMinor: 3000, currency: 'EUR', reference: 'pi_test_1' },
    ],
    ['checkout.session.async_payment_failed', session({ payment_status: 'unpaid' }), { kind: 'failed', eventId: 'evt_1', checkoutId: 'cs_test_1' }],
    [
      'checkout.session.completed',
      session({ payment_intent: null }),
      { kind: 'paid', eventId: 'evt_1', checkoutId: 'cs_test_1', invoiceId: 7, amountMinor: 3000, currency: 'EUR', reference: 'cs_test_1' },
    ],
    [
      'checkout.session.completed',
      session({ metadata: {} }),
      { kind: 'paid', eventId: 'evt_1', checkoutId: 'cs_test_1', invoiceId: null, amountMinor: 3000, currency: 'EUR', reference: 'pi_test_1' },
    ],
  ])('%s with %j', (type, object, expected) => {
    expect(actionFor(event(type, object))).toEqual(expected);
  });

  test('other events and odd shapes are ignored, never guessed at', () => {
    expect(actionFor(event('charge.refunded'))).toMatchObject({ kind: 'ignored', reason: /not one we act on/ });
    expect(actionFor(event('checkout.session.completed', session({ amount_total: -5 })))).toMatchObject({ kind: 'ignored', reason: /unexpected shape/ });
    expect(actionFor(event('checkout.session.completed', session({ amount_total: 12.5 })))).toMatchObject({ kind: 'ignored' });
    expect(actionFor(event('checkout.session.completed', { ...session(), object: 'payment_intent' }))).toMatchObject({ kind: 'ignored' });
    expect(actionFor({ nothing: true })).toMatchObject({ kind: 'ignored', reason: 'not an event' });
    expect(actionFor(null)).toMatchObject({ kind: 'ignored' });
  });
});
