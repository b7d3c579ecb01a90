// Online payment end to end against the local provider fake, through the provider's real SDK: the app opens a
// checkout for (part of) an invoice, the customer pays on the fake's pay page, the fake signs the event with the
// SDK's own test helper and the webhook route verifies it on the exact bytes. Success, a declined card, a bank
// debit that settles or fails later, a replayed event, a forged one, a session the app never opened, and partial
// payments that together settle the invoice.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import Stripe from 'stripe';
import { usePoolWorld, appErrorOf, addSecondCustomer } from '../support/fixtures';
import { oneBinMonth } from '../support/billing';
import { sqlRows } from '../support/hand-made';
import { callRoute, json } from '../support/route';
import { startPayFake, type PayFake } from '@/cli/pay-fake.mjs';
import { LOCAL_FAKE_KEYS } from '@/cli/pay-fake-keys.mjs';
import { issueInvoice, invoiceView } from '@/lib/billing/invoices.server';
import { startCheckout, latestCheckout } from '@/lib/billing/payments.server';
import { POST as webhook } from '@/pages/api/payments/webhook';

const w = usePoolWorld();
let fake: PayFake;
let invoiceId = 0;
const own = () => ({ kind: 'customer' as const, organisationId: w.customer.id, siteIds: null });

beforeAll(async () => {
  fake = await startPayFake({ ...LOCAL_FAKE_KEYS, webhookUrl: () => null }); // events held: the test delivers them
  Object.assign(process.env, {
    PAYMENTS_SECRET_KEY: LOCAL_FAKE_KEYS.secretKey,
    PAYMENTS_WEBHOOK_SECRET: LOCAL_FAKE_KEYS.webhookSecret,
    PAYMENTS_API_HOST: '127.0.0.1',
    PAYMENTS_API_PORT: String(fake.port),
    PAYMENTS_API_PROTOCOL: 'http',
  });
  // October 2026 (oneBinMonth): 72.60 to pay.
  const { statementId } = await oneBinMonth(w, '2026-10');
  invoiceId = (await issueInvoice(statementId, { userId: null, ip: null })).id;
});
afterAll(async () => {
  await fake?.close();
});

/** The customer presses a button on the fake's pay page. */
async function pay(url: string, action: 'card' | 'declined' | 'debit' | 'debit_fails'): Promise<Response> {
  return fetch(url, { method: 'POST', body: new URLSearchParams({ action }), redirect: 'manual' });
}

/** Delivers an event the fake signed, as the fake would (optionally tampered with). */
async function deliver(d: { payload: string; signature: string }, over: { payload?: string; signature?: string | null } = {}) {
  const headers: Record<string, string> = {};
  const signature = over.signature === undefined ? d.signature : over.signature;
  if (signature !== null) headers['stripe-signature'] = signature;
  return callRoute(webhook, { user: null, method: 'POST', path: '/api/payments/webhook', rawBody: over.payload ?? d.payload, headers });
}
const lastDelivery = () => fake.deliveries.at(-1)!;
const balance = async () => (await invoiceView(invoiceId, { kind: 'operator' })).balance;
const counts = async () =>
  (
    await sqlRows<{ payments: number; events: number }>(`SELECT (SELECT count(*)::int FROM invoice_payments) AS payments, (SELECT count(*)::int FROM payment_events) AS events`)
  )[0]!;

describe('paying an invoice online', () => {
  test('a declined card changes nothing; a card payment of part of it is recorded from the verified event', async () => {
    const { url } = await startCheckout(invoiceId, own(), '30.00', null);
    expect(url.startsWith(`${fake.base}/pay/cs_test_`)).toBe(true);
    const declined = await pay(url, 'declined');
    expect(await declined.text()).toMatch(/declined/);
    expect(fake.deliveries).toHaveLength(0);
    const paid = await pay(url, 'card');
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toMatch(new RegExp(`/portal/invoices/${invoiceId}\\?checkout=cs_test_`));
    const res = await deliver(lastDelivery());
    expect(res.status).toBe(200);
    expect((await json<{ data: { outcome: string } }>(res)).data.outcome).toBe('paid');
    expect(await balance()).toEqual({ grossMinor: 7260, creditedMinor: 0, paidMinor: 3000, outstandingMinor: 4260 });
    const [p] = await sqlRows<{ method: string; provider_ref: string }>(`SELECT method, provider_ref FROM invoice_payments WHERE invoice_id = $1`, [invoiceId]);
    expect(p!.method).toBe('card');
    expect(p!.provider_ref).toMatch(/^pi_test_/);
    expect((await latestCheckout(invoiceId))!.status).toBe('paid');
  });

  test('the same event again is a replay: nothing more recorded', async () => {
    const before = await counts();
    const res = await deliver(lastDelivery());
    expect((await json<{ data: { outcome: string } }>(res)).data.outcome).toBe('replay');
    expect(await counts()).toEqual(before);
  });

  test('forged, unsigned or wrongly signed events are refused (400) and record nothing', async () => {
    const before = await counts();
    const real = lastDelivery();
    const forged = real.payload.replace('"amount_total":3000', '"amount_total":4260').replace(real.event.id, 'evt_forged_1');
    const sdk = new Stripe(LOCAL_FAKE_KEYS.secretKey);
    const otherSecret = sdk.webhooks.generateTestHeaderString({ payload: forged, secret: 'whsec_someone_else' });
    for (const over of [{ payload: forged }, { signature: null }, { payload: forged, signature: otherSecret }, { signature: 't=1,v1=00' }]) {
      const res = await deliver(real, over);
      expect(res.status, JSON.stringify(over).slice(0, 80)).toBe(400);
      expect((await json<{ error: { code: string } }>(res)).error.code).toBe('bad_request');
    }
    expect(await counts()).toEqual(before);
  });

  test('a well-signed event for a session the app never opened is kept as seen and acted on never', async () => {
    const sdk = new Stripe(LOCAL_FAKE_KEYS.secretKey);
    const payload = JSON.stringify({
      id: 'evt_stray_1',
      object: 'event',
      type: 'checkout.session.completed',
      data: {
        object: { id: 'cs_test_stray', object: 'checkout.session', amount_total: 4260, currency: 'eur', payment_status: 'paid', metadata: { invoiceId: String(invoiceId) } },
      },
    });
    const res = await deliver({ payload, signature: sdk.webhooks.generateTestHeaderString({ payload, secret: LOCAL_FAKE_KEYS.webhookSecret }) });
    expect((await json<{ data: { outcome: string } }>(res)).data.outcome).toBe('ignored');
    expect((await balance()).paidMinor).toBe(3000);
  });

  test('a bank debit that fails leaves the invoice open and says so; one that settles pays the rest', async () => {
    const first = await startCheckout(invoiceId, own(), '42.60', null);
    await pay(first.url, 'debit_fails');
    expect((await json<{ data: { outcome: string } }>(await deliver(lastDelivery()))).data.outcome).toBe('processing');
    await expect.poll(() => fake.deliveries.at(-1)!.event.type, { timeout: 5000 }).toBe('checkout.session.async_payment_failed');
    expect((await json<{ data: { outcome: string } }>(await deliver(lastDelivery()))).data.outcome).toBe('failed');
    expect((await latestCheckout(invoiceId))!.status).toBe('failed');
    expect((await balance()).outstandingMinor).toBe(4260);

    const second = await startCheckout(invoiceId, own(), '42.60', null);
    await pay(second.url, 'debit');
    await deliver(lastDelivery());
    await expect.poll(() => fake.deliveries.at(-1)!.event.type, { timeout: 5000 }).toBe('checkout.session.async_payment_succeeded');
    expect((await json<{ data: { outcome: string } }>(await deliver(lastDelivery()))).data.outcome).toBe('paid');
    const v = await invoiceView(invoiceId, { kind: 'operator' });
    expect([v.balance.outstandingMinor, v.state]).toEqual([0, 'paid']);
    const mails = await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM mail_outbox WHERE kind = 'payment_received'`);
    expect(mails[0]!.n).toBe(2);
  });

  test('refused before the provider is asked: more than outstanding, a settled invoice, another organisation', async () => {
    const sessions = fake.sessions.size;
    expect((await appErrorOf(startCheckout(invoiceId, own(), '0.01', null))).code).toBe('unprocessable'); // settled
    const other = await addSecondCustomer(w);
    expect((await appErrorOf(startCheckout(invoiceId, { kind: 'customer', organisationId: other.customer.id, siteIds: null }, '1.00', null))).code).toBe('not_found');
    expect((await appErrorOf(startCheckout(invoiceId, own(), '1.005', null))).code).toBe('validation_failed');
    expect(fake.sessions.size).toBe(sessions);
  });
});
