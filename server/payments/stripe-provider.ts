/**
 * The payment provider over the official `stripe` Node SDK: Checkout Sessions for the link an
 * invoice carries, and the SDK's own signature check (`webhooks.constructEvent`, HMAC-SHA256 over
 * the raw body) for what comes back. `apiBase` points the same SDK at the local fake
 * (./fake-payment-server.ts) in development and tests; left out, it talks to the real service.
 */
import Stripe from 'stripe';
import {
  PaymentProviderError,
  WebhookSignatureError,
  type CheckoutRequest,
  type CheckoutSession,
  type PaymentEvent,
  type PaymentProvider,
} from './provider';

/** Metadata keys Vanbay sets on every checkout, and reads back from every event. */
export const METADATA = { businessId: 'vanbay_business_id', invoiceId: 'vanbay_invoice_id' } as const;

export interface StripeProviderOptions {
  secretKey: string;
  webhookSecret: string;
  /** `http://127.0.0.1:PORT` for the local fake; the real API when left out. */
  apiBase?: string;
  /** Where the customer lands after paying (the dashboard's invoice page). */
  successUrl: (invoiceId: number) => string;
  /** The SDK's retries of a failed request (2 unless told; tests of a dead service say 0). */
  maxNetworkRetries?: number;
}

/** Short enough that a dead service fails the request instead of holding it the SDK's 80 s. */
const TIMEOUT_MS = 15_000;

export function createStripeProvider(options: StripeProviderOptions): PaymentProvider {
  const base = options.apiBase ? new URL(options.apiBase) : null;
  if (base && base.protocol !== 'http:' && base.protocol !== 'https:') {
    throw new Error(`STRIPE_API_BASE must be an http(s) URL, not "${options.apiBase}"`);
  }
  const stripe = new Stripe(options.secretKey, {
    timeout: TIMEOUT_MS,
    // POSTs retried by the SDK carry an idempotency key it adds, so a retry makes no second session.
    maxNetworkRetries: options.maxNetworkRetries ?? 2,
    ...(base
      ? {
          host: base.hostname,
          port: base.port || (base.protocol === 'http:' ? 80 : 443),
          protocol: base.protocol === 'http:' ? ('http' as const) : ('https' as const),
          telemetry: false,
        }
      : {}),
  });

  return {
    available: true,
    target: base ? `stripe API at ${base.origin}` : 'stripe API',

    async createCheckout(request: CheckoutRequest): Promise<CheckoutSession> {
      const metadata = {
        [METADATA.businessId]: String(request.businessId),
        [METADATA.invoiceId]: String(request.invoiceId),
      };
      const session = await call(() =>
        stripe.checkout.sessions.create({
          mode: 'payment',
          client_reference_id: `${request.businessId}:${request.invoiceId}`,
          line_items: [
            {
              quantity: 1,
              price_data: {
                currency: request.currency.toLowerCase(),
                unit_amount: request.amountCents,
                product_data: { name: request.title },
              },
            },
          ],
          metadata,
          // The charge (and so every refund event) carries these too.
          payment_intent_data: { metadata },
          ...(request.customerEmail ? { customer_email: request.customerEmail } : {}),
          success_url: options.successUrl(request.invoiceId),
        }),
      );
      return toSession(session);
    },

    async findCheckout(sessionId: string): Promise<CheckoutSession | null> {
      try {
        return toSession(await stripe.checkout.sessions.retrieve(sessionId));
      } catch (error) {
        if (error instanceof Stripe.errors.StripeError && error.statusCode === 404) return null;
        throw asProviderError(error);
      }
    },

    async expireCheckout(sessionId: string): Promise<void> {
      await call(() => stripe.checkout.sessions.expire(sessionId));
    },

    verifyWebhook(rawBody: Buffer, signatureHeader: string | undefined): PaymentEvent {
      if (!signatureHeader) throw new WebhookSignatureError('no Stripe-Signature header');
      let event: Stripe.Event;
      try {
        event = stripe.webhooks.constructEvent(rawBody, signatureHeader, options.webhookSecret);
      } catch (error) {
        const reason = error instanceof Error ? error.message.split('\n')[0]! : 'unreadable';
        throw new WebhookSignatureError(reason);
      }
      return toPaymentEvent(event);
    },
  };
}

async function call<T>(request: () => Promise<T>): Promise<T> {
  try {
    return await request();
  } catch (error) {
    throw asProviderError(error);
  }
}

function asProviderError(error: unknown): PaymentProviderError {
  if (error instanceof Stripe.errors.StripeError) return new PaymentProviderError(error.message);
  return new PaymentProviderError(error instanceof Error ? error.message : String(error));
}

function toSession(session: Stripe.Checkout.Session): CheckoutSession {
  if (!session.url && session.status === 'open') {
    throw new PaymentProviderError(`checkout ${session.id} came back without a payment page URL`);
  }
  return {
    sessionId: session.id,
    url: session.url ?? '',
    amountCents: session.amount_total ?? 0,
    currency: (session.currency ?? '').toUpperCase(),
    open: session.status === 'open',
    expiresAt: session.expires_at ? new Date(session.expires_at * 1000) : null,
  };
}

function targetOf(metadata: Stripe.Metadata | null | undefined) {
  const businessId = Number(metadata?.[METADATA.businessId]);
  const invoiceId = Number(metadata?.[METADATA.invoiceId]);
  if (!Number.isSafeInteger(businessId) || businessId <= 0) return null;
  if (!Number.isSafeInteger(invoiceId) || invoiceId <= 0) return null;
  return { businessId, invoiceId };
}

const idOf = (value: string | { id: string } | null) =>
  typeof value === 'string' ? value : (value?.id ?? null);

/**
 * The events acted on: a checkout paid (at once, or later for a delayed payment method) and a
 * charge refunded (its running refunded total). Everything else is seen and ignored.
 */
function toPaymentEvent(event: Stripe.Event): PaymentEvent {
  const base = { eventId: event.id, type: event.type };
  if (
    event.type === 'checkout.session.completed' ||
    event.type === 'checkout.session.async_payment_succeeded'
  ) {
    const session = event.data.object;
    const target = targetOf(session.metadata);
    // A delayed method completes the session unpaid; its async_payment_succeeded event follows.
    if (!target || session.payment_status !== 'paid' || !session.amount_total) {
      return { ...base, kind: 'ignored', target };
    }
    return {
      ...base,
      kind: 'paid',
      ...target,
      amountCents: session.amount_total,
      paymentRef: idOf(session.payment_intent) ?? session.id,
      sessionId: session.id,
    };
  }
  if (event.type === 'charge.refunded') {
    const charge = event.data.object;
    const target = targetOf(charge.metadata);
    if (!target) return { ...base, kind: 'ignored', target };
    return {
      ...base,
      kind: 'refunded',
      ...target,
      refundedTotalCents: charge.amount_refunded,
      paymentRef: idOf(charge.payment_intent) ?? charge.id,
    };
  }
  const object = event.data.object as { metadata?: Stripe.Metadata | null };
  return { ...base, kind: 'ignored', target: targetOf(object.metadata) };
}
