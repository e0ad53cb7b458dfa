/**
 * What Vanbay needs from a hosted card payment service, and nothing more: a hosted checkout for
 * an amount owed on an invoice, and signed notices (webhooks) when money moves. The one
 * implementation is ./stripe-provider.ts (the official SDK), pointed in development and tests at
 * ./fake-payment-server.ts; routes only ever see this interface.
 */
import { HttpError } from '../errors';

export interface CheckoutRequest {
  businessId: number;
  invoiceId: number;
  /** What the customer sees on the payment page: "Invoice 0042 from Ridgeback Mobile Moto". */
  title: string;
  amountCents: number;
  /** ISO 4217, as the business keeps it (`USD`). */
  currency: string;
  customerEmail: string | null;
}

export interface CheckoutSession {
  sessionId: string;
  url: string;
  amountCents: number;
  currency: string;
  /** Still taking payment: neither paid nor expired. */
  open: boolean;
  expiresAt: Date | null;
}

/** Where an event points in Vanbay: set by us as metadata when the checkout was made. */
interface EventTarget {
  businessId: number;
  invoiceId: number;
}

/** A verified webhook, in Vanbay's terms. `type` is the service's own event type, for the log. */
export type PaymentEvent =
  | ({
      kind: 'paid';
      eventId: string;
      type: string;
      amountCents: number;
      /** The service's id for the payment (its payment intent): refunds name it too. */
      paymentRef: string;
      sessionId: string;
    } & EventTarget)
  | ({
      kind: 'refunded';
      eventId: string;
      type: string;
      /** All refunded so far on this payment: the service reports a running total. */
      refundedTotalCents: number;
      paymentRef: string;
    } & EventTarget)
  | {
      kind: 'ignored';
      eventId: string;
      type: string;
      /** Set when the event names one of our invoices (kept as seen), null otherwise. */
      target: EventTarget | null;
    };

export interface PaymentProvider {
  /** False for the stand-in used when payments are not set up: routes answer 503. */
  readonly available: boolean;
  /** Where payments go, without keys, for logs. */
  readonly target: string;
  createCheckout(request: CheckoutRequest): Promise<CheckoutSession>;
  /** The session as the service knows it now; null when it knows no such session. */
  findCheckout(sessionId: string): Promise<CheckoutSession | null>;
  /** Stops an open session taking payment (its amount is out of date). */
  expireCheckout(sessionId: string): Promise<void>;
  /** Checks the signature over the raw body; throws WebhookSignatureError when it does not hold. */
  verifyWebhook(rawBody: Buffer, signatureHeader: string | undefined): PaymentEvent;
}

/**
 * Once a change that drops an invoice's card link has committed (a void, money taken by hand):
 * the session is expired at the service so its old amount cannot be paid. A session the service
 * will not expire (paid already, the service down) is no failure of the change: money that still
 * arrives on it is handled as it lands (card-payments.ts).
 */
export async function expireDroppedCheckout(
  provider: PaymentProvider,
  sessionId: string | null,
): Promise<void> {
  if (!sessionId || !provider.available) return;
  await provider.expireCheckout(sessionId).catch(() => {});
}

export class WebhookSignatureError extends HttpError {
  constructor(reason: string) {
    super(400, 'bad_signature', `The webhook signature does not verify: ${reason}`);
  }
}

/** The payment service refused or did not answer; nothing was changed here. */
export class PaymentProviderError extends HttpError {
  constructor(reason: string) {
    super(502, 'payment_provider_error', `The card payment service did not accept the request: ${reason}`);
  }
}

export class PaymentsNotSetUpError extends HttpError {
  constructor() {
    super(
      503,
      'payments_not_set_up',
      'Card payments are not set up on this server (set STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET).',
    );
  }
}

const notSetUp = (): never => {
  throw new PaymentsNotSetUpError();
};

/** The stand-in when the app was given no provider: the payment routes say 503. */
export const paymentsNotSetUp: PaymentProvider = {
  available: false,
  target: 'none',
  createCheckout: notSetUp,
  findCheckout: notSetUp,
  expireCheckout: notSetUp,
  verifyWebhook: notSetUp,
};
