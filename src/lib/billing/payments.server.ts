// Online payment through the hosted payments provider's official SDK (`stripe`). The app opens a checkout session
// for an amount of an invoice, sends the customer to the provider's pay page, and learns the outcome only from
// the provider's signed events: the signature is verified by the SDK on the exact bytes received, before any
// parsing; each event is kept by its id (a replay changes nothing); an invoice is marked paid only from a
// verified event whose session the app opened for that invoice and amount.
//
// Configuration (environment): PAYMENTS_SECRET_KEY, PAYMENTS_WEBHOOK_SECRET, and PAYMENTS_API_HOST / _PORT /
// _PROTOCOL when the provider is reached somewhere other than its default address (`npm start` and `npm test` point
// them at the local fake, src/cli/pay-fake.mjs).
import Stripe from 'stripe';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import type { AuditActor } from '@/lib/audit.server';
import { appUrl } from '@/lib/app-url.server';
import { localDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { invoiceView, mailPaymentReceived, recordPayment, typedAmount } from './invoices.server';
import { paymentProblem } from './invoice-rules';
import { actionFor, type ProviderAction } from './payment-events';
import type { StatementScope } from './statement-views.server';

let client: { key: string; stripe: Stripe } | null = null;

function config() {
  const key = process.env.PAYMENTS_SECRET_KEY;
  const webhookSecret = process.env.PAYMENTS_WEBHOOK_SECRET;
  if (!key || !webhookSecret) throw new AppError('unavailable', 'Online payment is not set up here; pay by bank transfer as the invoice says.');
  return { key, webhookSecret };
}

function provider(): Stripe {
  const { key } = config();
  const where = [process.env.PAYMENTS_API_HOST, process.env.PAYMENTS_API_PORT, process.env.PAYMENTS_API_PROTOCOL].join('|');
  if (client?.key !== `${key}|${where}`) {
    const port = process.env.PAYMENTS_API_PORT ? Number(process.env.PAYMENTS_API_PORT) : undefined;
    const protocol = process.env.PAYMENTS_API_PROTOCOL === 'http' ? 'http' : undefined;
    client = { key: `${key}|${where}`, stripe: new Stripe(key, { host: process.env.PAYMENTS_API_HOST || undefined, port, protocol, maxNetworkRetries: 1, timeout: 10_000 }) };
  }
  return client.stripe;
}

export type CheckoutStatus = 'open' | 'processing' | 'paid' | 'failed' | 'needs_review';

/** A customer pays (part of) their own invoice online: the provider's pay page to go to. */
export async function startCheckout(invoiceId: number, scope: StatementScope, amount: string, userId: number | null): Promise<{ url: string }> {
  const invoice = await invoiceView(invoiceId, scope);
  if (invoice.series !== 'invoice') throw new AppError('not_found', 'There is no such invoice.');
  const amountMinor = typedAmount(amount, invoice.currency);
  const problem = paymentProblem(amountMinor, invoice.balance, invoice.currency);
  if (problem) throw new AppError('unprocessable', problem);
  const back = `${appUrl()}/portal/invoices/${invoice.id}`;
  let session: Stripe.Checkout.Session;
  try {
    session = await provider().checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: invoice.currency.toLowerCase(), unit_amount: amountMinor, product_data: { name: `Invoice ${invoice.number}` } } }],
      client_reference_id: String(invoice.id),
      metadata: { invoiceId: String(invoice.id), invoiceNumber: invoice.number },
      success_url: `${back}?checkout={CHECKOUT_SESSION_ID}`,
      cancel_url: back,
    });
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw new AppError('unavailable', 'The payment provider could not be reached. Try again in a moment, or pay by bank transfer.');
  }
  if (!session.url) throw new AppError('unavailable', 'The payment provider gave no page to pay on. Try again in a moment.');
  await sequelize.query(`INSERT INTO payment_checkouts (id, invoice_id, amount_minor, currency, created_by) VALUES ($1, $2, $3, $4, $5)`, {
    bind: [session.id, invoice.id, amountMinor, invoice.currency, userId],
  });
  return { url: session.url };
}

export interface WebhookOutcome {
  event: string;
  outcome: 'replay' | ProviderAction['kind'] | 'needs_review';
}

/**
 * A provider event, as received. Refused (400, nothing recorded) unless the SDK verifies its signature on these
 * bytes; then kept by its id and acted on in one transaction, so a failure leaves it unseen for the provider to
 * send again.
 */
export async function receiveProviderEvent(raw: Uint8Array, signature: string | null, ip: string | null): Promise<WebhookOutcome> {
  const { webhookSecret } = config();
  if (!signature) throw new AppError('bad_request', 'The event carries no signature.');
  let verified: Stripe.Event;
  try {
    verified = provider().webhooks.constructEvent(Buffer.from(raw), signature, webhookSecret);
  } catch {
    throw new AppError('bad_request', 'The event signature does not verify.');
  }
  const action = actionFor(verified);
  const actor: AuditActor = { userId: null, ip };
  const { timeZone } = await getSettings();
  const outcome = await sequelize.transaction(async (transaction): Promise<WebhookOutcome & { invoiceId?: number; amountMinor?: number }> => {
    const checkoutId = action.kind === 'ignored' ? null : action.checkoutId;
    const [fresh] = await sequelize.query<{ id: string }>(
      `INSERT INTO payment_events (id, type, checkout_id, outcome) VALUES ($1, $2, $3, $4) ON CONFLICT (id) DO NOTHING RETURNING id`,
      { bind: [verified.id, verified.type, checkoutId, action.kind], type: QueryTypes.SELECT, transaction },
    );
    if (!fresh) return { event: verified.id, outcome: 'replay' as const };
    if (action.kind === 'ignored') return { event: verified.id, outcome: 'ignored' as const };
    const [checkout] = await sequelize.query<{ invoice_id: number; amount_minor: string; currency: string; status: CheckoutStatus }>(
      `SELECT invoice_id, amount_minor, currency, status FROM payment_checkouts WHERE id = $1 FOR UPDATE`,
      { bind: [action.checkoutId], type: QueryTypes.SELECT, transaction },
    );
    // A session the app never opened: kept as seen, acted on never.
    if (!checkout) return { event: verified.id, outcome: 'ignored' as const };
    const setStatus = (status: CheckoutStatus, problem: string | null = null) =>
      sequelize.query(`UPDATE payment_checkouts SET status = $2, problem = $3, updated_at = now() WHERE id = $1`, { bind: [action.checkoutId, status, problem], transaction });
    if (action.kind === 'processing') {
      if (checkout.status === 'open') await setStatus('processing');
      return { event: verified.id, outcome: 'processing' as const };
    }
    if (action.kind === 'failed') {
      await setStatus('failed', 'The provider reports the payment failed.');
      return { event: verified.id, outcome: 'failed' as const };
    }
    const matches = action.invoiceId === checkout.invoice_id && action.amountMinor === Number(checkout.amount_minor) && action.currency === checkout.currency;
    if (!matches) {
      await setStatus('needs_review', 'The paid amount or invoice differs from the checkout opened.');
      return { event: verified.id, outcome: 'needs_review' as const };
    }
    try {
      await recordPayment(
        checkout.invoice_id,
        { amountMinor: action.amountMinor, method: 'card', paidOn: localDate(new Date(), timeZone), providerRef: action.reference, note: null },
        actor,
        { transaction, mail: false },
      );
    } catch (err) {
      // Paid at the provider but more than is outstanding now (a transfer arrived meanwhile): money came in, so the
      // admin decides (refund by credit note); the event is not lost.
      if (!(err instanceof AppError)) throw err;
      await setStatus('needs_review', err.message);
      return { event: verified.id, outcome: 'needs_review' as const };
    }
    await setStatus('paid');
    return { event: verified.id, outcome: 'paid' as const, invoiceId: checkout.invoice_id, amountMinor: action.amountMinor };
  });
  // The customer's receipt goes out once the payment is committed.
  if (outcome.outcome === 'paid' && outcome.invoiceId && outcome.amountMinor) await mailPaymentReceived(outcome.invoiceId, outcome.amountMinor);
  return { event: outcome.event, outcome: outcome.outcome };
}

/** The latest online payment of an invoice, for the invoice page (e.g. "your last bank debit failed"). */
export async function latestCheckout(invoiceId: number): Promise<{ id: string; status: CheckoutStatus; amountMinor: number; problem: string | null } | null> {
  const [row] = await sequelize.query<{ id: string; status: CheckoutStatus; amount_minor: string; problem: string | null }>(
    `SELECT id, status, amount_minor, problem FROM payment_checkouts WHERE invoice_id = $1 ORDER BY created_at DESC LIMIT 1`,
    { bind: [invoiceId], type: QueryTypes.SELECT },
  );
  return row ? { id: row.id, status: row.status, amountMinor: Number(row.amount_minor), problem: row.problem } : null;
}
