// A local stand-in for the card payment provider's HTTP API: the part of it our flow uses (webhook endpoints,
// Checkout Sessions, PaymentIntents, refunds), a hosted payment page where the test card is typed (so no card
// number ever reaches our server), and webhooks signed the way the provider signs them (`Stripe-Signature`).
// The official SDK talks to it unchanged when configured with host/port/protocol.
import crypto from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Request, type Response } from 'express';
import { readSecrets } from '../src/config/secrets';

const API_VERSION = '2026-10-28.endive';

/** Test cards of the fake (common practice of card test modes, no source): one succeeds, one is declined. */
export const TEST_CARDS = { success: '4242424242424242', declined: '4000000000000002' } as const;

type Metadata = Record<string, string>;
type CheckoutSession = {
  id: string;
  object: 'checkout.session';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  cancel_url: string | null;
  success_url: string;
  client_reference_id: string | null;
  customer_email: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  metadata: Metadata;
  mode: 'payment';
  payment_intent: string | null;
  payment_status: 'unpaid' | 'paid';
  status: 'open' | 'complete' | 'expired';
  url: string | null;
  line_items_description: string;
};
type PaymentIntent = {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_received: number;
  currency: string;
  created: number;
  livemode: false;
  metadata: Metadata;
  status: 'succeeded' | 'requires_payment_method' | 'canceled';
  latest_charge: string | null;
  last_payment_error: { code: string; decline_code?: string; message: string } | null;
};
type Charge = {
  id: string;
  object: 'charge';
  amount: number;
  amount_refunded: number;
  currency: string;
  payment_intent: string;
  refunded: boolean;
  status: 'succeeded' | 'failed';
  metadata: Metadata;
  payment_method_details: { type: 'card'; card: { brand: string; last4: string } };
};
type Refund = {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  charge: string;
  payment_intent: string;
  status: 'succeeded';
  created: number;
  metadata: Metadata;
};
type WebhookEndpoint = {
  id: string;
  object: 'webhook_endpoint';
  url: string;
  enabled_events: string[];
  status: 'enabled';
  secret?: string;
};
export type FakeEvent = {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  type: string;
  livemode: false;
  pending_webhooks: number;
  request: { id: null; idempotency_key: null };
  data: { object: unknown };
};
export type Delivery = { eventId: string; url: string; status: number | null; attempt: number; at: string };

export type PaymentsFakeOptions = {
  /** Default: the server's own (PAYMENTS_WEBHOOK_SECRET, see src/config/secrets.ts), so its webhooks verify. */
  webhookSecret?: string;
  /** Default: the server's PAYMENTS_SECRET_KEY; the API answers only that key. */
  secretKey?: string;
  /** Endpoints to post events to from the start (tests); the server may also register them through the API. */
  webhookUrls?: string[];
  /** Delay between delivery retries; tests shorten it. */
  retryDelayMs?: number;
};

export type PaymentsFake = {
  url: string;
  port: number;
  events: FakeEvent[];
  deliveries: Delivery[];
  /** Posts an already-sent event again, as the provider does when it is not sure it was received. */
  redeliver: (eventId: string) => Promise<number | null>;
  /** Completes a hosted payment without the browser, as the payer would by typing the card. */
  pay: (sessionId: string, cardNumber: string) => Promise<{ ok: boolean; message?: string }>;
  close: () => Promise<void>;
};

const randomId = (prefix: string) => `${prefix}_test_${crypto.randomBytes(12).toString('hex')}`;
const nowSeconds = () => Math.floor(Date.now() / 1000);

export function signPayload(payload: string, secret: string, timestamp = nowSeconds()): string {
  const signature = crypto.createHmac('sha256', secret).update(`${timestamp}.${payload}`).digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

function luhnValid(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i += 1) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return digits.length >= 12 && sum % 10 === 0;
}

function apiError(
  res: Response,
  status: number,
  message: string,
  param?: string,
  type = 'invalid_request_error',
) {
  res.status(status).json({ error: { type, message, param, code: param ? 'parameter_invalid' : undefined } });
}

function escapeHtml(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
  );
}

function money(amount: number, currency: string): string {
  return new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() }).format(
    amount / 100,
  );
}

export async function startPaymentsFake(port = 0, options: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  const webhookSecret = options.webhookSecret ?? readSecrets().payments.webhookSecret;
  const secretKey = options.secretKey ?? readSecrets().payments.secretKey;
  const retryDelayMs = options.retryDelayMs ?? 2000;
  const sessions = new Map<string, CheckoutSession>();
  const intents = new Map<string, PaymentIntent>();
  const charges = new Map<string, Charge>();
  const refunds = new Map<string, Refund>();
  const endpoints: WebhookEndpoint[] = (options.webhookUrls ?? []).map((url) => ({
    id: randomId('we'),
    object: 'webhook_endpoint',
    url,
    enabled_events: ['*'],
    status: 'enabled',
  }));
  const idempotent = new Map<string, { status: number; body: unknown }>();
  const events: FakeEvent[] = [];
  const deliveries: Delivery[] = [];
  let baseUrl = '';

  async function deliver(
    event: FakeEvent,
    endpoint: WebhookEndpoint,
    attempt: number,
  ): Promise<number | null> {
    const payload = JSON.stringify(event, null, 2);
    let status: number | null = null;
    try {
      const response = await fetch(endpoint.url, {
        method: 'POST',
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'stripe-signature': signPayload(payload, webhookSecret),
        },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      status = response.status;
    } catch {
      status = null;
    }
    deliveries.push({ eventId: event.id, url: endpoint.url, status, attempt, at: new Date().toISOString() });
    const failed = status === null || status >= 300;
    if (failed && attempt < 5) {
      setTimeout(() => void deliver(event, endpoint, attempt + 1), retryDelayMs * attempt).unref();
    }
    return status;
  }

  async function emit(type: string, object: unknown): Promise<void> {
    const event: FakeEvent = {
      id: randomId('evt'),
      object: 'event',
      api_version: API_VERSION,
      created: nowSeconds(),
      type,
      livemode: false,
      pending_webhooks: endpoints.length,
      request: { id: null, idempotency_key: null },
      data: { object: structuredClone(object) },
    };
    events.push(event);
    const targets = endpoints.filter(
      (e) => e.enabled_events.includes('*') || e.enabled_events.includes(type),
    );
    await Promise.all(targets.map((endpoint) => deliver(event, endpoint, 1)));
  }

  async function pay(sessionId: string, rawCard: string): Promise<{ ok: boolean; message?: string }> {
    const session = sessions.get(sessionId);
    if (!session) return { ok: false, message: 'This payment page does not exist.' };
    if (session.status !== 'open')
      return { ok: session.status === 'complete', message: 'This payment page is no longer open.' };
    const card = rawCard.replace(/[\s-]/g, '');
    if (!/^\d+$/.test(card) || !luhnValid(card))
      return { ok: false, message: 'Your card number is incomplete or invalid.' };
    const intent: PaymentIntent = intents.get(session.payment_intent ?? '') ?? {
      id: randomId('pi'),
      object: 'payment_intent',
      amount: session.amount_total,
      amount_received: 0,
      currency: session.currency,
      created: nowSeconds(),
      livemode: false,
      metadata: session.metadata,
      status: 'requires_payment_method',
      latest_charge: null,
      last_payment_error: null,
    };
    intents.set(intent.id, intent);
    session.payment_intent = intent.id;
    const charge: Charge = {
      id: randomId('ch'),
      object: 'charge',
      amount: intent.amount,
      amount_refunded: 0,
      currency: intent.currency,
      payment_intent: intent.id,
      refunded: false,
      status: 'succeeded',
      metadata: intent.metadata,
      payment_method_details: {
        type: 'card',
        card: { brand: card.startsWith('4') ? 'visa' : 'card', last4: card.slice(-4) },
      },
    };
    intent.latest_charge = charge.id;
    charges.set(charge.id, charge);
    if (card !== TEST_CARDS.success) {
      charge.status = 'failed';
      intent.status = 'requires_payment_method';
      intent.last_payment_error = {
        code: 'card_declined',
        decline_code: 'generic_decline',
        message: 'Your card was declined.',
      };
      await emit('payment_intent.payment_failed', intent);
      return { ok: false, message: 'Your card was declined.' };
    }
    intent.status = 'succeeded';
    intent.amount_received = intent.amount;
    intent.last_payment_error = null;
    session.status = 'complete';
    session.payment_status = 'paid';
    session.url = null;
    await emit('payment_intent.succeeded', intent);
    await emit('checkout.session.completed', session);
    return { ok: true };
  }

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: true }));

  const api = express.Router();
  api.use((req, res, next) => {
    const auth = req.header('authorization') ?? '';
    if (auth !== `Bearer ${secretKey}`) {
      apiError(res.status(401), 401, 'Invalid API Key provided.', undefined, 'authentication_error');
      return;
    }
    const key = req.method === 'POST' ? req.header('idempotency-key') : undefined;
    if (key && idempotent.has(key)) {
      const stored = idempotent.get(key)!;
      res.status(stored.status).json(stored.body);
      return;
    }
    if (key) {
      const json = res.json.bind(res);
      res.json = (body: unknown) => {
        idempotent.set(key, { status: res.statusCode, body });
        return json(body);
      };
    }
    next();
  });

  api.post('/webhook_endpoints', (req, res) => {
    const url = String(req.body?.url ?? '');
    if (!/^https?:\/\//.test(url)) return apiError(res, 400, 'Invalid URL: url', 'url');
    const enabled = Array.isArray(req.body?.enabled_events) ? (req.body.enabled_events as string[]) : ['*'];
    const existing = endpoints.find((e) => e.url === url);
    if (existing) return res.json({ ...existing, secret: webhookSecret });
    const endpoint: WebhookEndpoint = {
      id: randomId('we'),
      object: 'webhook_endpoint',
      url,
      enabled_events: enabled,
      status: 'enabled',
    };
    endpoints.push(endpoint);
    res.json({ ...endpoint, secret: webhookSecret });
  });
  api.get('/webhook_endpoints', (_req, res) => {
    res.json({ object: 'list', data: endpoints, has_more: false, url: '/v1/webhook_endpoints' });
  });

  api.post('/checkout/sessions', (req, res) => {
    const body = req.body ?? {};
    if (body.mode !== 'payment')
      return apiError(res, 400, 'Only mode=payment is supported by this fake.', 'mode');
    if (typeof body.success_url !== 'string')
      return apiError(res, 400, 'Missing required param: success_url.', 'success_url');
    const items = Array.isArray(body.line_items) ? body.line_items : [];
    if (items.length === 0) return apiError(res, 400, 'Missing required param: line_items.', 'line_items');
    let total = 0;
    let currency = '';
    const names: string[] = [];
    for (const item of items) {
      const price = item?.price_data;
      const amount = Number(price?.unit_amount);
      const quantity = Number(item?.quantity ?? 1);
      if (!price || !Number.isInteger(amount) || amount <= 0) {
        return apiError(
          res,
          400,
          'line_items[].price_data.unit_amount must be a positive integer.',
          'line_items',
        );
      }
      currency = String(price.currency ?? '').toLowerCase();
      total += amount * quantity;
      names.push(String(price.product_data?.name ?? 'Item'));
    }
    const id = randomId('cs');
    const session: CheckoutSession = {
      id,
      object: 'checkout.session',
      amount_subtotal: total,
      amount_total: total,
      currency,
      cancel_url: typeof body.cancel_url === 'string' ? body.cancel_url : null,
      success_url: body.success_url,
      client_reference_id: typeof body.client_reference_id === 'string' ? body.client_reference_id : null,
      customer_email: typeof body.customer_email === 'string' ? body.customer_email : null,
      created: nowSeconds(),
      expires_at: nowSeconds() + 24 * 3600,
      livemode: false,
      metadata: (body.metadata as Metadata) ?? {},
      mode: 'payment',
      payment_intent: null,
      payment_status: 'unpaid',
      status: 'open',
      url: `${baseUrl}/pay/${id}`,
      line_items_description: names.join(', '),
    };
    sessions.set(id, session);
    res.json(session);
  });
  api.get('/checkout/sessions/:id', (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return apiError(res, 404, `No such checkout.session: '${req.params.id}'`, 'id');
    res.json(session);
  });
  api.post('/checkout/sessions/:id/expire', async (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return apiError(res, 404, `No such checkout.session: '${req.params.id}'`, 'id');
    if (session.status !== 'open') return apiError(res, 400, 'Only open sessions can be expired.');
    session.status = 'expired';
    session.url = null;
    await emit('checkout.session.expired', session);
    res.json(session);
  });
  api.get('/payment_intents/:id', (req, res) => {
    const intent = intents.get(req.params.id);
    if (!intent) return apiError(res, 404, `No such payment_intent: '${req.params.id}'`, 'id');
    res.json(intent);
  });
  api.post('/refunds', async (req, res) => {
    const intent = intents.get(String(req.body?.payment_intent ?? ''));
    if (!intent) return apiError(res, 404, 'No such payment_intent.', 'payment_intent');
    const charge = intent.latest_charge ? charges.get(intent.latest_charge) : undefined;
    if (intent.status !== 'succeeded' || !charge)
      return apiError(res, 400, 'This PaymentIntent has no successful charge to refund.');
    const amount =
      req.body?.amount !== undefined ? Number(req.body.amount) : charge.amount - charge.amount_refunded;
    if (!Number.isInteger(amount) || amount <= 0 || amount > charge.amount - charge.amount_refunded) {
      return apiError(
        res,
        400,
        `Refund amount exceeds what is left on the charge.`,
        'amount',
        'invalid_request_error',
      );
    }
    const refund: Refund = {
      id: randomId('re'),
      object: 'refund',
      amount,
      currency: charge.currency,
      charge: charge.id,
      payment_intent: intent.id,
      status: 'succeeded',
      created: nowSeconds(),
      metadata: (req.body?.metadata as Metadata) ?? {},
    };
    refunds.set(refund.id, refund);
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    await emit('charge.refunded', charge);
    res.json(refund);
  });
  api.use((req, res) => apiError(res, 404, `Unrecognized request URL (${req.method}: ${req.originalUrl}).`));
  app.use('/v1', api);

  app.get('/pay/:id', (req, res) => {
    const session = sessions.get(req.params.id);
    res.type('html').send(payPage(session, req.query.error ? String(req.query.error) : undefined));
  });
  app.post('/pay/:id', async (req: Request, res: Response) => {
    const session = sessions.get(req.params.id as string);
    if (!session) return res.status(404).type('html').send(payPage(undefined));
    const result = await pay(session.id, String(req.body?.card_number ?? ''));
    if (!result.ok) return res.status(402).type('html').send(payPage(session, result.message));
    res.redirect(303, session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id));
  });

  app.get('/__fake/events', (_req, res) => res.json({ events, deliveries }));

  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  const actualPort = (server.address() as AddressInfo).port;
  baseUrl = `http://127.0.0.1:${actualPort}`;

  return {
    url: baseUrl,
    port: actualPort,
    events,
    deliveries,
    pay,
    redeliver: async (eventId) => {
      const event = events.find((e) => e.id === eventId);
      if (!event) throw new Error(`No event ${eventId}`);
      const results = await Promise.all(endpoints.map((endpoint) => deliver(event, endpoint, 1)));
      return results[0] ?? null;
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

function payPage(session: CheckoutSession | undefined, error?: string): string {
  const style = `body{font-family:system-ui,sans-serif;background:#f3f1ec;margin:0;color:#1f2328}
main{max-width:420px;margin:48px auto;background:#fff;border-radius:12px;padding:28px;box-shadow:0 2px 10px #0002}
h1{font-size:20px;margin:0 0 4px}p{margin:6px 0}.amount{font-size:28px;font-weight:700;margin:14px 0}
label{display:block;font-size:13px;margin-top:12px;color:#555}input{width:100%;box-sizing:border-box;padding:10px;font-size:16px;border:1px solid #bbb;border-radius:6px}
button{margin-top:20px;width:100%;padding:12px;font-size:16px;border:0;border-radius:6px;background:#3d4f9f;color:#fff;cursor:pointer}
.error{color:#a3231c;margin-top:12px}.row{display:flex;gap:10px}.row>div{flex:1}.note{font-size:12px;color:#666;margin-top:16px}`;
  const head = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Test payment</title><style>${style}</style></head><body><main>`;
  if (!session)
    return `${head}<h1>Payment page not found</h1><p>This link is not valid.</p></main></body></html>`;
  if (session.status !== 'open') {
    const done = session.status === 'complete';
    return `${head}<h1>${done ? 'Payment complete' : 'This payment page has expired'}</h1></main></body></html>`;
  }
  return `${head}<p>Local test payment page</p><h1>${escapeHtml(session.line_items_description)}</h1>
<div class="amount" data-testid="pay-amount">${escapeHtml(money(session.amount_total, session.currency))}</div>
<form method="post" action="/pay/${session.id}">
<label for="card_number">Card number</label><input id="card_number" name="card_number" inputmode="numeric" autocomplete="cc-number" placeholder="4242 4242 4242 4242" required>
<div class="row"><div><label for="exp">Expiry</label><input id="exp" name="exp" placeholder="MM / YY" required></div>
<div><label for="cvc">CVC</label><input id="cvc" name="cvc" placeholder="123" required></div></div>
<label for="name">Name on card</label><input id="name" name="name" required>
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ''}
<button type="submit">Pay ${escapeHtml(money(session.amount_total, session.currency))}</button>
</form>
${session.cancel_url ? `<p class="note"><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ''}
<p class="note">Test mode: card 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined.</p></main></body></html>`;
}

if (require.main === module) {
  const port = Number(process.env.PAYMENTS_FAKE_PORT ?? 12111);
  startPaymentsFake(port).then((fake) => console.log(`payments fake on ${fake.url}`));
}
