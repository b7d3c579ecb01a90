// The local stand-in for the hosted payments provider: the part of its HTTP API the app's official SDK calls
// (creating and reading checkout sessions), the provider's pay page a customer is sent to, and signed webhooks
// back to the app. The app reaches it only through the SDK's own host/port/protocol settings and cannot tell.
// Signatures are made with the SDK's own test helper, so the app verifies them exactly as it would real ones.
//
//   node src/cli/pay-fake.mjs            (LOOPFOLD_PAY_FAKE_PORT, PAYMENTS_SECRET_KEY, PAYMENTS_WEBHOOK_SECRET,
//                                         PAY_FAKE_WEBHOOK_URL: where events go, normally <app>/api/payments/webhook)
//   import { startPayFake } from './pay-fake.mjs'   (tests: one fake per app, on a free port)
//
// The pay page offers what a tester needs: pay by card (paid at once), a card that is declined (nothing happens),
// and a bank debit that settles a moment later or fails (the asynchronous events).
import http from 'node:http';
import { randomBytes } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import qs from 'qs';
import Stripe from 'stripe';

const id = (prefix) => `${prefix}_test_${randomBytes(12).toString('hex')}`;
const esc = (s) => String(s).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]);

/**
 * Starts the fake; resolves with its address, the events it sent (with their exact bytes and signature header in
 * `deliveries`) and a close(). A `webhookUrl()` that answers null holds the events for the caller to deliver.
 */
export async function startPayFake({ port = 0, secretKey, webhookSecret, webhookUrl, log = () => {} }) {
  const sessions = new Map();
  const sent = [];
  const deliveries = [];
  const signer = new Stripe(secretKey);
  let base = '';

  async function deliver(type, session) {
    const event = { id: id('evt'), object: 'event', api_version: '2025-01-27', created: Math.floor(Date.now() / 1000), livemode: false, type, data: { object: { ...session } } };
    const payload = JSON.stringify(event);
    const header = signer.webhooks.generateTestHeaderString({ payload, secret: webhookSecret });
    sent.push(event);
    deliveries.push({ event, payload, signature: header });
    const target = webhookUrl();
    if (!target) return event; // held: the caller (a test) delivers it
    // Like a provider: retried a few times until the app answers 2xx.
    for (let attempt = 1; attempt <= 3; attempt += 1) {
      try {
        const res = await fetch(target, { method: 'POST', headers: { 'Content-Type': 'application/json', 'Stripe-Signature': header }, body: payload });
        log(`[pay] ${type} → ${res.status}`);
        if (res.ok) return event;
      } catch (err) {
        log(`[pay] ${type} not delivered: ${err.message}`);
      }
      await new Promise((r) => setTimeout(r, 200 * attempt));
    }
    return event;
  }

  function apiError(res, status, message, type = 'invalid_request_error') {
    res.writeHead(status, { 'Content-Type': 'application/json' });
    res.end(JSON.stringify({ error: { type, message } }));
  }

  function json(res, body) {
    res.writeHead(200, { 'Content-Type': 'application/json', 'Request-Id': id('req') });
    res.end(JSON.stringify(body));
  }

  async function body(req) {
    const chunks = [];
    for await (const c of req) chunks.push(c);
    return Buffer.concat(chunks).toString('utf8');
  }

  function createSession(params) {
    const items = Array.isArray(params.line_items) ? params.line_items : Object.values(params.line_items ?? {});
    const total = items.reduce((n, li) => n + Number(li.quantity ?? 1) * Number(li.price_data?.unit_amount ?? NaN), 0);
    const currency = String(items[0]?.price_data?.currency ?? '').toLowerCase();
    if (params.mode !== 'payment' || !Number.isSafeInteger(total) || total <= 0 || !/^[a-z]{3}$/.test(currency) || !params.success_url) return null;
    const sessionId = id('cs');
    const session = {
      id: sessionId,
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: total,
      currency,
      client_reference_id: params.client_reference_id ?? null,
      metadata: params.metadata ?? {},
      customer_email: params.customer_email ?? null,
      payment_intent: null,
      success_url: params.success_url,
      cancel_url: params.cancel_url ?? null,
      description: items[0]?.price_data?.product_data?.name ?? '',
      url: `${base}/pay/${sessionId}`,
      created: Math.floor(Date.now() / 1000),
    };
    sessions.set(sessionId, session);
    return session;
  }

  function payPage(res, session, message = '') {
    const amount = `${(session.amount_total / 100).toFixed(2)} ${session.currency.toUpperCase()}`;
    const done = session.status !== 'open';
    res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' });
    res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Test payment page</title><style>body{font:16px system-ui,sans-serif;max-width:28rem;margin:2rem auto;padding:0 1rem;color:#222}
button{display:block;width:100%;min-height:48px;margin:.5rem 0;font:inherit;border-radius:6px;border:1px solid #555;background:#fff}
button.main{background:#333;color:#fff}.msg{padding:.75rem;border:1px solid #a33;background:#fee}</style></head><body>
<p><small>Local test payment provider — no real money moves.</small></p>
<h1>Pay ${esc(amount)}</h1><p>${esc(session.description)}</p>
${message ? `<p class="msg" role="alert">${esc(message)}</p>` : ''}
${
  done
    ? `<p>This payment is ${esc(session.payment_status)}.</p>`
    : `<form method="post">
<button class="main" name="action" value="card" data-pay="card">Pay by card</button>
<button name="action" value="declined" data-pay="declined">Use a card that is declined</button>
<button name="action" value="debit" data-pay="debit">Pay by bank debit (settles in a moment)</button>
<button name="action" value="debit_fails" data-pay="debit_fails">Bank debit that fails</button>
</form>${session.cancel_url ? `<p><a href="${esc(session.cancel_url)}">Back without paying</a></p>` : ''}`
}
</body></html>`);
  }

  function redirect(res, url) {
    res.writeHead(303, { Location: url });
    res.end();
  }

  const server = http.createServer(async (req, res) => {
    try {
      const url = new URL(req.url ?? '/', base);
      const api = url.pathname.startsWith('/v1/');
      if (api && req.headers.authorization !== `Bearer ${secretKey}`) return apiError(res, 401, 'Invalid API key provided.', 'authentication_error');
      if (req.method === 'POST' && url.pathname === '/v1/checkout/sessions') {
        const session = createSession(qs.parse(await body(req)));
        return session ? json(res, session) : apiError(res, 400, 'A payment session needs mode=payment, a positive amount, a currency and a success_url.');
      }
      const read = /^\/v1\/checkout\/sessions\/([A-Za-z0-9_]+)$/.exec(url.pathname);
      if (req.method === 'GET' && read) {
        const session = sessions.get(read[1]);
        return session ? json(res, session) : apiError(res, 404, `No such checkout.session: '${read[1]}'`);
      }
      const page = /^\/pay\/([A-Za-z0-9_]+)$/.exec(url.pathname);
      const session = page && sessions.get(page[1]);
      if (page && !session) {
        res.writeHead(404, { 'Content-Type': 'text/plain' });
        return res.end('No such payment.');
      }
      if (req.method === 'GET' && session) return payPage(res, session);
      if (req.method === 'POST' && session) {
        if (session.status !== 'open') return payPage(res, session, 'This payment is finished already.');
        const action = new URLSearchParams(await body(req)).get('action');
        const back = session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id);
        if (action === 'declined') return payPage(res, session, 'Your card was declined. Try another way to pay.');
        session.status = 'complete';
        session.payment_intent = id('pi');
        if (action === 'card') {
          session.payment_status = 'paid';
          await deliver('checkout.session.completed', session);
          return redirect(res, back);
        }
        if (action === 'debit' || action === 'debit_fails') {
          await deliver('checkout.session.completed', session); // still unpaid: the debit settles later
          setTimeout(() => {
            session.payment_status = action === 'debit' ? 'paid' : 'unpaid';
            void deliver(action === 'debit' ? 'checkout.session.async_payment_succeeded' : 'checkout.session.async_payment_failed', session);
          }, 500);
          return redirect(res, back);
        }
        return payPage(res, session, 'Choose one of the ways to pay.');
      }
      if (api) return apiError(res, 404, `Unrecognized request URL (${req.method}: ${url.pathname}).`);
      res.writeHead(404, { 'Content-Type': 'text/plain' });
      res.end('Not found');
    } catch (err) {
      apiError(res, 500, String(err?.message ?? err), 'api_error');
    }
  });
  await new Promise((resolve) => server.listen(port, '127.0.0.1', resolve));
  const address = server.address();
  base = `http://127.0.0.1:${address.port}`;
  return { port: address.port, base, sent, deliveries, sessions, close: () => new Promise((r) => server.close(r)) };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.LOOPFOLD_PAY_FAKE_PORT ?? 4410);
  const target = process.env.PAY_FAKE_WEBHOOK_URL;
  if (!target || !process.env.PAYMENTS_SECRET_KEY || !process.env.PAYMENTS_WEBHOOK_SECRET) {
    console.error('[pay] PAY_FAKE_WEBHOOK_URL, PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET must be set');
    process.exit(1);
  }
  const fake = await startPayFake({
    port,
    secretKey: process.env.PAYMENTS_SECRET_KEY,
    webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET,
    webhookUrl: () => target,
    log: (m) => console.log(m),
  });
  console.log(`[pay] local payment provider on ${fake.base}, events to ${target}`);
}
