/**
 * A local stand-in for the hosted payment service, speaking the REST paths and JSON shapes the
 * official stripe SDK uses for Checkout Sessions, refunds and events; serving a minimal hosted
 * payment page with test cards; and posting signed webhooks to the app. Loopback only: the SDK is
 * pointed here by STRIPE_API_URL in development and tests, and at the real service otherwise.
 */
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import express from 'express';
import Stripe from 'stripe';

export const TEST_CARDS = {
  succeeds: '4242 4242 4242 4242',
  declined: '4000 0000 0000 0002',
} as const;

interface Session {
  id: string;
  object: 'checkout.session';
  mode: string;
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  success_url: string;
  cancel_url: string;
  payment_intent: string | null;
  url: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  line_items_description: string;
}

export interface StripeStandin {
  url: string;
  port: number;
  close(): Promise<void>;
}

const newId = (prefix: string) => `${prefix}_test_${randomBytes(12).toString('hex')}`;
const now = () => Math.floor(Date.now() / 1000);
const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function stripeError(res: express.Response, status: number, message: string, param?: string) {
  res.status(status).json({ error: { type: 'invalid_request_error', message, ...(param ? { param } : {}) } });
}

/** `webhookUrl` may be a function when the app's address is known only after the stand-in starts. */
export async function startStripeStandin(options: { port: number; webhookUrl: string | (() => string); webhookSecret: string; host?: string }): Promise<StripeStandin> {
  const sessions = new Map<string, Session>();
  const refunded = new Map<string, number>(); // payment intent → amount refunded
  const events = new Map<string, unknown>();
  const app = express();
  app.use(express.urlencoded({ extended: true, limit: '100kb' }));
  let baseUrl = '';

  // Idempotent requests, as the hosted service keeps them: a POST carrying an Idempotency-Key that
  // was seen before gets the first answer again, or an error when its parameters differ.
  const idempotent = new Map<string, { request: string; status: number; body: unknown }>();
  app.post('/v1/{*path}', (req, res, next) => {
    const key = req.get('idempotency-key');
    if (!key) return next();
    const request = `${req.path} ${JSON.stringify(req.body)}`;
    const seen = idempotent.get(key);
    if (seen && seen.request !== request) {
      res.status(400).json({ error: { type: 'idempotency_error', message: 'Keys for idempotent requests can only be used with the same parameters they were first used with.' } });
      return;
    }
    if (seen) {
      res.set('idempotent-replayed', 'true').status(seen.status).json(seen.body);
      return;
    }
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      // Like the hosted service: a request refused for its parameters leaves no result to replay.
      if (res.statusCode < 400 || res.statusCode >= 500) idempotent.set(key, { request, status: res.statusCode, body });
      return json(body);
    };
    next();
  });

  async function deliver(type: string, object: unknown) {
    const event = { id: newId('evt'), object: 'event', api_version: Stripe.API_VERSION, created: now(), type, livemode: false, pending_webhooks: 1, data: { object } };
    events.set(event.id, event);
    const payload = JSON.stringify(event);
    const signature = Stripe.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
    for (let attempt = 0; attempt < 3; attempt++) {
      try {
        const target = typeof options.webhookUrl === 'function' ? options.webhookUrl() : options.webhookUrl;
        const res = await fetch(target, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': signature }, body: payload });
        if (res.ok) return;
      } catch {
        // the app may be restarting; try again
      }
      await new Promise((r) => setTimeout(r, 200 * (attempt + 1)));
    }
  }

  app.post('/v1/checkout/sessions', (req, res) => {
    interface LineItem {
      quantity?: string;
      price_data?: { currency?: string; unit_amount?: string; product_data?: { name?: string } };
    }
    const body = req.body as { line_items?: LineItem[]; mode?: string; success_url?: string; cancel_url?: string; client_reference_id?: string; customer_email?: string; metadata?: Record<string, string> };
    const items = Array.isArray(body.line_items) ? body.line_items : [];
    if (!body.success_url || !body.cancel_url) return stripeError(res, 400, 'Missing required param: success_url.', 'success_url');
    if (items.length === 0) return stripeError(res, 400, 'Missing required param: line_items.', 'line_items');
    let amount = 0;
    let currency = '';
    const names: string[] = [];
    for (const item of items) {
      const quantity = Number(item.quantity);
      const unit = Number(item.price_data?.unit_amount);
      if (!Number.isInteger(quantity) || quantity < 1 || !Number.isInteger(unit) || unit < 1) return stripeError(res, 400, 'Invalid line item.', 'line_items');
      amount += quantity * unit;
      currency = String(item.price_data?.currency ?? '');
      names.push(`${quantity} × ${item.price_data?.product_data?.name ?? 'item'}`);
    }
    const id = newId('cs');
    const session: Session = {
      id,
      object: 'checkout.session',
      mode: String(body.mode ?? 'payment'),
      status: 'open',
      payment_status: 'unpaid',
      amount_total: amount,
      currency,
      client_reference_id: body.client_reference_id ?? null,
      customer_email: body.customer_email ?? null,
      metadata: body.metadata ?? {},
      success_url: String(body.success_url),
      cancel_url: String(body.cancel_url),
      payment_intent: null,
      url: `${baseUrl}/pay/${id}`,
      created: now(),
      expires_at: now() + 24 * 3600,
      livemode: false,
      line_items_description: names.join(', '),
    };
    sessions.set(id, session);
    res.json(session);
  });

  app.get('/v1/checkout/sessions/:id', (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return stripeError(res, 404, `No such checkout.session: '${req.params.id}'`);
    res.json(session);
  });

  app.post('/v1/checkout/sessions/:id/expire', async (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return stripeError(res, 404, `No such checkout.session: '${req.params.id}'`);
    if (session.status !== 'open') return stripeError(res, 400, `Only open sessions can be expired; this one is ${session.status}.`);
    session.status = 'expired';
    session.url = null;
    res.json(session);
    void deliver('checkout.session.expired', session);
  });

  app.post('/v1/refunds', (req, res) => {
    const { payment_intent: paymentIntent, amount } = req.body as Record<string, string>;
    const session = [...sessions.values()].find((s) => s.payment_intent === paymentIntent);
    if (!session) return stripeError(res, 404, `No such payment_intent: '${paymentIntent}'`, 'payment_intent');
    const value = amount === undefined ? session.amount_total - (refunded.get(paymentIntent) ?? 0) : Number(amount);
    if (!Number.isInteger(value) || value < 1 || value + (refunded.get(paymentIntent) ?? 0) > session.amount_total) {
      return stripeError(res, 400, 'Refund amount is greater than the unrefunded amount.', 'amount');
    }
    refunded.set(paymentIntent, (refunded.get(paymentIntent) ?? 0) + value);
    res.json({ id: newId('re'), object: 'refund', amount: value, currency: session.currency, payment_intent: paymentIntent, status: 'succeeded', created: now() });
  });

  app.get('/v1/events/:id', (req, res) => {
    const event = events.get(req.params.id);
    if (!event) return stripeError(res, 404, `No such event: '${req.params.id}'`);
    res.json(event);
  });

  // The hosted payment page.
  const page = (session: Session, message = '') => `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Test payment</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>body{font-family:system-ui,sans-serif;background:#eef2f1;color:#1c2b33;margin:0}main{max-width:420px;margin:48px auto;background:#fff;padding:28px;border-radius:10px;box-shadow:0 2px 12px #0002}
label{display:block;font-weight:600;margin:16px 0 6px}input{width:100%;box-sizing:border-box;padding:10px;font-size:16px;border:1px solid #8a9a9f;border-radius:6px}
button{margin-top:18px;width:100%;padding:12px;font-size:16px;border:0;border-radius:6px;background:#0d5c63;color:#fff;cursor:pointer}.note{font-size:13px;color:#4d5d63}.error{color:#a12a1a;font-weight:600}</style></head>
<body><main><p class="note">Local payment stand-in · test mode · no real money</p><h1 style="font-size:22px">Pay ${(session.amount_total / 100).toFixed(2)} ${escape(session.currency.toUpperCase())}</h1>
<p>${escape(session.line_items_description)}</p>${message ? `<p class="error" role="alert">${escape(message)}</p>` : ''}
${session.status === 'open' ? `<form method="post"><label for="card">Card number</label><input id="card" name="card" autocomplete="off" inputmode="numeric" required>
<p class="note">Test cards: ${TEST_CARDS.succeeds} succeeds; ${TEST_CARDS.declined} is declined.</p><button type="submit">Pay</button></form>
<p><a href="${escape(session.cancel_url)}">Cancel and go back</a></p>` : `<p>This payment session is ${session.status}.</p>`}</main></body></html>`;

  app.get('/pay/:id', (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return res.status(404).send('No such payment session.');
    res.type('html').send(page(session));
  });

  app.post('/pay/:id', async (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return res.status(404).send('No such payment session.');
    if (session.status !== 'open') return res.type('html').send(page(session));
    const card = String((req.body as { card?: string }).card ?? '').replace(/\s+/g, '');
    if (card !== TEST_CARDS.succeeds.replace(/\s+/g, '')) {
      return res.status(402).type('html').send(page(session, card === TEST_CARDS.declined.replace(/\s+/g, '') ? 'Your card was declined.' : 'That card number is not a test card here.'));
    }
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = newId('pi');
    session.url = null;
    await deliver('checkout.session.completed', session);
    res.redirect(303, session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id));
  });

  const server = await new Promise<import('node:http').Server>((resolve, reject) => {
    const s = app.listen(options.port, options.host ?? '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  baseUrl = `http://${options.host ?? '127.0.0.1'}:${port}`;
  return {
    url: baseUrl,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
