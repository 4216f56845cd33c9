import Stripe from 'stripe';
import { loadConfig, type Config, type Env } from '../config/settings';
import { AppError } from '../errors';

/** What the rest of the server learns from a provider's webhook, in our own words. */
export type PaymentEvent =
  | {
      kind: 'paid';
      eventId: string;
      checkoutId: string;
      paymentIntentId: string | null;
      metadata: Record<string, string>;
    }
  | {
      kind: 'failed';
      eventId: string;
      paymentIntentId: string;
      reason: string;
      metadata: Record<string, string>;
    }
  | {
      kind: 'refunded';
      eventId: string;
      paymentIntentId: string;
      amountRefunded: number;
      fullyRefunded: boolean;
    }
  | { kind: 'expired'; eventId: string; checkoutId: string }
  | { kind: 'ignored'; eventId: string; type: string };

export type CheckoutRequest = {
  amountCents: number;
  currency: string;
  description: string;
  reference: string;
  customerEmail?: string | null;
  metadata: Record<string, string>;
  successUrl: string;
  cancelUrl: string;
};

/** The one interface for card payments; the provider's official SDK sits behind it. */
export interface PaymentsService {
  createCheckout(request: CheckoutRequest): Promise<{ checkoutId: string; url: string }>;
  refund(paymentIntentId: string, idempotencyKey: string): Promise<{ refundId: string }>;
  /** Verifies the signature over the raw body; throws AppError `bad_signature` when it does not match. */
  parseWebhook(rawBody: Buffer | string, signatureHeader: string | undefined): PaymentEvent;
  /** Tells the provider where to post events (the local fake needs this; a live account is configured once). */
  registerWebhook(url: string): Promise<void>;
}

export type PaymentsOptions = {
  secretKey: string;
  webhookSecret: string;
  /** Set for the local fake: host 127.0.0.1, its port, plain http. */
  api?: { host: string; port: number; protocol: 'http' | 'https' };
};

export function createStripePaymentsService(options: PaymentsOptions): PaymentsService {
  const stripe = new Stripe(options.secretKey, {
    ...(options.api ?? {}),
    maxNetworkRetries: 2,
    timeout: 15_000,
    telemetry: false,
  });
  const registered = new Set<string>();

  const providerError = (error: unknown): AppError => {
    const e = error as { type?: string; message?: string };
    if (e.type === 'StripeConnectionError') {
      return new AppError(
        'payments_unavailable',
        'The payment provider cannot be reached right now; try again shortly.',
        503,
      );
    }
    return new AppError(
      'payments_refused',
      `The payment provider refused the request: ${e.message ?? 'unknown error'}`,
      502,
    );
  };

  return {
    async createCheckout(request) {
      try {
        const session = await stripe.checkout.sessions.create({
          mode: 'payment',
          line_items: [
            {
              quantity: 1,
              price_data: {
                currency: request.currency,
                unit_amount: request.amountCents,
                product_data: { name: request.description },
              },
            },
          ],
          client_reference_id: request.reference,
          customer_email: request.customerEmail ?? undefined,
          metadata: request.metadata,
          payment_intent_data: { metadata: request.metadata },
          success_url: request.successUrl,
          cancel_url: request.cancelUrl,
        });
        if (!session.url)
          throw new AppError('payments_refused', 'The payment provider returned no payment page.', 502);
        return { checkoutId: session.id, url: session.url };
      } catch (error) {
        if (error instanceof AppError) throw error;
        throw providerError(error);
      }
    },
    async refund(paymentIntentId, idempotencyKey) {
      try {
        const refund = await stripe.refunds.create({ payment_intent: paymentIntentId }, { idempotencyKey });
        return { refundId: refund.id };
      } catch (error) {
        throw providerError(error);
      }
    },
    parseWebhook(rawBody, signatureHeader) {
      if (!signatureHeader) throw new AppError('bad_signature', 'The webhook has no signature header.', 400);
      let event: Stripe.Event;
      try {
        event = stripe.webhooks.constructEvent(rawBody, signatureHeader, options.webhookSecret);
      } catch {
        throw new AppError('bad_signature', 'The webhook signature does not match.', 400);
      }
      const object = event.data.object as unknown as Record<string, unknown>;
      const metadata = (object.metadata as Record<string, string> | undefined) ?? {};
      const ref = (value: unknown) =>
        typeof value === 'string' ? value : ((value as { id?: string } | null)?.id ?? null);
      switch (event.type) {
        case 'checkout.session.completed':
          if (object.payment_status !== 'paid')
            return { kind: 'ignored', eventId: event.id, type: event.type };
          return {
            kind: 'paid',
            eventId: event.id,
            checkoutId: String(object.id),
            paymentIntentId: ref(object.payment_intent),
            metadata,
          };
        case 'payment_intent.payment_failed': {
          const lastError = object.last_payment_error as { message?: string } | null;
          return {
            kind: 'failed',
            eventId: event.id,
            paymentIntentId: String(object.id),
            reason: lastError?.message ?? 'The payment failed.',
            metadata,
          };
        }
        case 'charge.refunded':
          return {
            kind: 'refunded',
            eventId: event.id,
            paymentIntentId: String(ref(object.payment_intent)),
            amountRefunded: Number(object.amount_refunded),
            fullyRefunded: object.refunded === true,
          };
        case 'checkout.session.expired':
          return { kind: 'expired', eventId: event.id, checkoutId: String(object.id) };
        default:
          return { kind: 'ignored', eventId: event.id, type: event.type };
      }
    },
    async registerWebhook(url) {
      if (registered.has(url)) return;
      try {
        const existing = await stripe.webhookEndpoints.list({ limit: 100 });
        if (!existing.data.some((e) => e.url === url)) {
          await stripe.webhookEndpoints.create({
            url,
            enabled_events: [
              'checkout.session.completed',
              'checkout.session.expired',
              'payment_intent.payment_failed',
              'charge.refunded',
            ],
          });
        }
        registered.add(url);
      } catch (error) {
        throw providerError(error);
      }
    },
  };
}

/** Settings from the configuration; with no provider host and no live key, the SDK talks to the local fake. */
export function paymentsServiceFrom(config: Config): PaymentsService & { usesFake: boolean } {
  const { secretKey, webhookSecret } = config.secrets.payments;
  const usesFake = !config.PAYMENTS_API_HOST && !secretKey.startsWith('sk_live_');
  const service = createStripePaymentsService({
    secretKey,
    webhookSecret,
    api: usesFake ? { host: '127.0.0.1', port: config.PAYMENTS_FAKE_PORT, protocol: 'http' } : undefined,
  });
  return Object.assign(service, { usesFake });
}

/** The same, from an environment object of its own (tests/server/repository-secrets.test.ts). */
export const paymentsServiceFromEnv = (env: Env) => paymentsServiceFrom(loadConfig(env));
