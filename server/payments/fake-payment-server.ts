/**
 * A local stand-in for the hosted card payment service, for development and tests: a small
 * Express app on 127.0.0.1 that answers the few API endpoints the official SDK calls
 * (Checkout Sessions: create, retrieve, expire) in the service's own shapes, serves a test
 * payment page at each session's URL, and, when a session is "paid" or refunded, POSTs a signed
 * webhook to the app. No money moves and nothing leaves the machine.
 *
 * Signatures follow the service's published scheme (header `t=<unix seconds>,v1=<hex>` where the
 * hex is HMAC-SHA256 over `<t>.<raw body>` with the webhook secret), computed here with
 * node:crypto, so the app's check with the SDK proves the two agree.
 */
import { createHmac, randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Request, type Response } from 'express';

export interface FakeSession {
  id: string;
  object: 'checkout.session';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  metadata: Record<string, string>;
  mode: 'payment';
  payment_intent: string | null;
  payment_status: 'paid' | 'unpaid';
  status: 'open' | 'complete' | 'expired';
  success_url: string;
  url: string | null;
  /** The product name shown on the payment page. */
  title: string;
}

export interface FakeCharge {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  currency: string;
  created: number;
  livemode: false;
  metadata: Record<string, string>;
  paid: true;
  payment_intent: string;
  refunded: boolean;
  status: 'succeeded';
}

export interface FakeEvent {
  id: string;
  object: 'event';
  api_version: string | null;
  created: number;
  livemode: false;
  pending_webhooks: number;
  request: { id: null; idempotency_key: null };
  type: string;
  data: { object: unknown };
}

export interface Delivery {
  eventId: string;
  type: string;
  /** The app's HTTP status; null when it could not be reached. */
  status: number | null;
  body: string;
  error: string | null;
}

export interface FakePaymentServer {
  host: string;
  port: number;
  /** `http://127.0.0.1:PORT`: the SDK's API base (STRIPE_API_BASE). */
  url: string;
  /** The only secret key the fake accepts. */
  apiKey: string;
  /** The secret webhooks are signed with. */
  webhookSecret: string;
  /** Where webhooks go; set once the app listens. Null: events are kept but not delivered. */
  webhookUrl: string | null;
  readonly sessions: ReadonlyMap<string, FakeSession>;
  /** Every webhook delivery attempt, oldest first. */
  readonly deliveries: readonly Delivery[];
  /** Pays an open session in full, as a customer at the payment page would. */
  pay(sessionId: string): Promise<{ session: FakeSession; event: FakeEvent; delivery: Delivery }>;
  /** Refunds part (or, left out, the rest) of a paid session's charge. */
  refund(
    sessionId: string,
    amountCents?: number,
  ): Promise<{ charge: FakeCharge; event: FakeEvent; delivery: Delivery }>;
  /** Sends an event again with the same id, as the service does when it retries. */
  resend(eventId: string): Promise<Delivery>;
  close(): Promise<void>;
}

export interface FakePaymentOptions {
  port?: number;
  webhookUrl?: string | null;
  apiKey?: string;
  webhookSecret?: string;
}

/** The service's API version the fake says it answers with: the SDK's own pinned version. */
const API_VERSION = '2026-10-28.endive';
/** Checkout sessions stay payable this long unless paid or expired first (the service's default). */
const SESSION_LIFETIME_S = 24 * 60 * 60;
/** The smallest charge in US dollars the service accepts: 50 cents (the service's published minimum). */
const MINIMUM_CHARGE_CENTS = 50;

class FakeError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code?: string,
  ) {
    super(message);
  }
}

const nowSeconds = () => Math.floor(Date.now() / 1000);
const newId = (prefix: string) => `${prefix}_test_${randomBytes(12).toString('hex')}`;

export async function startFakePaymentServer(options: FakePaymentOptions = {}): Promise<FakePaymentServer> {
  const apiKey = options.apiKey ?? `sk_test_${randomBytes(16).toString('hex')}`;
  const webhookSecret = options.webhookSecret ?? `whsec_${randomBytes(24).toString('hex')}`;
  const sessions = new Map<string, FakeSession>();
  /** Per session: the metadata its charge carries, and the charge once paid. */
  const sessionExtras = new Map<
    string,
    { chargeMetadata: Record<string, string>; charge: FakeCharge | null }
  >();
  const events = new Map<string, FakeEvent>();
  const deliveries: Delivery[] = [];
  let baseUrl = '';

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: true, limit: '64kb' }));
  app.use(express.json({ limit: '64kb' }));

  // ---- The service's API, as the SDK calls it ----------------------------------------------
  const api = express.Router();
  api.use((req, _res, next) => {
    const key = /^Bearer\s+(\S+)$/i.exec(req.get('authorization') ?? '')?.[1];
    if (key !== apiKey) return next(new FakeError(401, 'Invalid API Key provided.'));
    next();
  });
  api.post('/checkout/sessions', (req, res) => {
    res.json(createSession(req.body as Record<string, unknown>));
  });
  api.get('/checkout/sessions/:id', (req, res) => {
    res.json(view(sessionOf(req.params.id!)));
  });
  api.post('/checkout/sessions/:id/expire', (req, res) => {
    const session = sessionOf(req.params.id!);
    if (session.status !== 'open') {
      throw new FakeError(400, 'Only Checkout Sessions with a status in [open] can be expired.');
    }
    session.status = 'expired';
    session.url = null;
    res.json(view(session));
  });
  app.use('/v1', api);

  // ---- The customer's side: the payment page, and triggers for development -----------------
  app.get('/pay/:id', (req, res) => {
    res.type('html').send(payPage(sessionOf(req.params.id!)));
  });
  app.post('/pay/:id', async (req, res) => {
    const result = await pay(req.params.id!);
    if (req.is('application/x-www-form-urlencoded')) {
      res.type('html').send(paidPage(result.session, result.delivery));
    } else {
      res.json({ session: view(result.session), event: brief(result.event), delivery: result.delivery });
    }
  });
  app.post('/refund/:id', async (req, res) => {
    const raw = (req.body as { amountCents?: unknown } | undefined)?.amountCents;
    const amount = raw === undefined || raw === '' ? undefined : Number(raw);
    const result = await refund(req.params.id!, amount);
    res.json({ charge: result.charge, event: brief(result.event), delivery: result.delivery });
  });
  app.post('/events/:id/resend', async (req, res) => {
    res.json(await resend(req.params.id!));
  });

  app.use((_req, _res, next) => next(new FakeError(404, 'Unrecognized request URL.')));
  app.use((err: unknown, _req: Request, res: Response, _next: () => void) => {
    const status = err instanceof FakeError ? err.status : 500;
    const message = err instanceof Error ? err.message : String(err);
    res.status(status).json({
      error: {
        type: status >= 500 ? 'api_error' : 'invalid_request_error',
        message,
        ...(err instanceof FakeError && err.code ? { code: err.code } : {}),
      },
    });
  });

  function sessionOf(id: string): FakeSession {
    const session = sessions.get(id);
    if (!session) throw new FakeError(404, `No such checkout.session: '${id}'`, 'resource_missing');
    if (session.status === 'open' && session.expires_at <= nowSeconds()) {
      session.status = 'expired';
      session.url = null;
    }
    return session;
  }

  function createSession(body: Record<string, unknown>): FakeSession {
    if (body.mode !== 'payment') throw new FakeError(400, 'This fake takes mode=payment only.');
    if (typeof body.success_url !== 'string' || !/^https?:\/\//.test(body.success_url)) {
      throw new FakeError(400, 'Missing required param: success_url.');
    }
    const lines = Array.isArray(body.line_items) ? (body.line_items as Record<string, unknown>[]) : [];
    if (lines.length === 0) throw new FakeError(400, 'Missing required param: line_items.');
    let total = 0;
    let currency: string | null = null;
    let title = '';
    for (const line of lines) {
      const quantity = Number(line.quantity);
      const price = (line.price_data ?? {}) as Record<string, unknown>;
      const unit = Number(price.unit_amount);
      const lineCurrency = String(price.currency ?? '');
      if (!Number.isInteger(quantity) || quantity < 1) throw new FakeError(400, 'Invalid quantity.');
      if (!Number.isInteger(unit) || unit < 0) throw new FakeError(400, 'Invalid unit_amount.');
      if (!/^[a-z]{3}$/.test(lineCurrency)) throw new FakeError(400, 'Invalid currency.');
      if (currency && currency !== lineCurrency)
        throw new FakeError(400, 'Line items must share one currency.');
      currency = lineCurrency;
      total += quantity * unit;
      title ||= String((price.product_data as Record<string, unknown> | undefined)?.name ?? '');
    }
    if (currency === 'usd' && total < MINIMUM_CHARGE_CENTS) {
      throw new FakeError(
        400,
        "The Checkout Session's total amount due must add up to at least $0.50 usd",
        'amount_too_small',
      );
    }
    const id = newId('cs');
    const created = nowSeconds();
    const session: FakeSession = {
      id,
      object: 'checkout.session',
      amount_subtotal: total,
      amount_total: total,
      currency: currency!,
      client_reference_id: typeof body.client_reference_id === 'string' ? body.client_reference_id : null,
      customer_email: typeof body.customer_email === 'string' ? body.customer_email : null,
      created,
      expires_at: created + SESSION_LIFETIME_S,
      livemode: false,
      metadata: stringRecord(body.metadata),
      mode: 'payment',
      payment_intent: null,
      payment_status: 'unpaid',
      status: 'open',
      success_url: body.success_url,
      url: `${baseUrl}/pay/${id}`,
      title,
    };
    sessions.set(id, session);
    const intentData = (body.payment_intent_data ?? {}) as Record<string, unknown>;
    sessionExtras.set(id, { chargeMetadata: stringRecord(intentData.metadata), charge: null });
    return view(session);
  }

  async function pay(sessionId: string) {
    const session = sessionOf(sessionId);
    if (session.status !== 'open') throw new FakeError(400, `This checkout session is ${session.status}.`);
    const extras = sessionExtras.get(sessionId)!;
    const intent = newId('pi');
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = intent;
    session.url = null;
    extras.charge = {
      id: newId('ch'),
      object: 'charge',
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      currency: session.currency,
      created: nowSeconds(),
      livemode: false,
      metadata: extras.chargeMetadata,
      paid: true,
      payment_intent: intent,
      refunded: false,
      status: 'succeeded',
    };
    const event = record('checkout.session.completed', view(session));
    return { session, event, delivery: await deliver(event) };
  }

  async function refund(sessionId: string, amountCents?: number) {
    const session = sessionOf(sessionId);
    const charge = sessionExtras.get(sessionId)?.charge;
    if (!charge) throw new FakeError(400, 'This checkout session has no charge to refund.');
    const left = charge.amount - charge.amount_refunded;
    const amount = amountCents ?? left;
    if (!Number.isInteger(amount) || amount < 1 || amount > left) {
      throw new FakeError(
        400,
        `Refund amount must be a whole number of cents from 1 to ${left} for ${session.id}.`,
      );
    }
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    const event = record('charge.refunded', { ...charge });
    return { charge: { ...charge }, event, delivery: await deliver(event) };
  }

  async function resend(eventId: string): Promise<Delivery> {
    const event = events.get(eventId);
    if (!event) throw new FakeError(404, `No such event: '${eventId}'`, 'resource_missing');
    return deliver(event);
  }

  function record(type: string, object: unknown): FakeEvent {
    const event: FakeEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: API_VERSION,
      created: nowSeconds(),
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
      type,
      data: { object },
    };
    events.set(event.id, event);
    return event;
  }

  /** One delivery; a failure is recorded, not retried (resend does that by hand). */
  async function deliver(event: FakeEvent): Promise<Delivery> {
    const delivery: Delivery = { eventId: event.id, type: event.type, status: null, body: '', error: null };
    if (!server.webhookUrl) {
      delivery.error = 'no webhook URL set';
    } else {
      const payload = JSON.stringify(event);
      try {
        const response = await fetch(server.webhookUrl, {
          method: 'POST',
          headers: {
            'content-type': 'application/json; charset=utf-8',
            'stripe-signature': signatureHeader(payload, webhookSecret, nowSeconds()),
          },
          body: payload,
          signal: AbortSignal.timeout(10_000),
        });
        delivery.status = response.status;
        delivery.body = await response.text();
      } catch (error) {
        delivery.error = error instanceof Error ? error.message : String(error);
      }
    }
    deliveries.push(delivery);
    return delivery;
  }

  const listening: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port ?? 0, '127.0.0.1', (error?: Error) =>
      error ? reject(error) : resolve(s),
    );
  });
  const { port } = listening.address() as AddressInfo;
  baseUrl = `http://127.0.0.1:${port}`;
  let closing: Promise<void> | undefined;
  const server: FakePaymentServer = {
    host: '127.0.0.1',
    port,
    url: baseUrl,
    apiKey,
    webhookSecret,
    webhookUrl: options.webhookUrl ?? null,
    sessions,
    deliveries,
    pay,
    refund,
    resend,
    close: () =>
      (closing ??= new Promise<void>((resolve) => {
        listening.close(() => resolve());
        listening.closeAllConnections();
      })),
  };
  return server;
}

/** The service's signature header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload">`. */
export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

/** A session as the API shows it: without the fake's own `title`. */
function view(session: FakeSession): FakeSession {
  const { title: _title, ...shown } = session;
  return { ...shown } as FakeSession;
}

const brief = (event: FakeEvent) => ({ id: event.id, type: event.type });

function stringRecord(value: unknown): Record<string, string> {
  if (!value || typeof value !== 'object') return {};
  return Object.fromEntries(Object.entries(value as Record<string, unknown>).map(([k, v]) => [k, String(v)]));
}

const escapeHtml = (text: string) =>
  text.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
const amountText = (cents: number, currency: string) =>
  `${(cents / 100).toFixed(2)} ${currency.toUpperCase()}`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title><style>body{font:16px/1.5 system-ui,sans-serif;max-width:28rem;margin:3rem auto;padding:0 1rem}p.note{color:#666;font-size:.85rem}button{font:inherit;padding:.6rem 1.2rem}</style></head><body>${body}<p class="note">Local test payment service: no card is charged and no money moves.</p></body></html>`;
}

function payPage(session: FakeSession): string {
  const heading = `<h1>${escapeHtml(session.title || 'Payment')}</h1>`;
  if (session.status !== 'open') {
    return page('Payment', `${heading}<p>This payment link is ${escapeHtml(session.status)}.</p>`);
  }
  return page(
    'Payment',
    `${heading}<p>Amount: <strong>${amountText(session.amount_total, session.currency)}</strong></p><form method="post" action="/pay/${encodeURIComponent(session.id)}"><button type="submit">Pay with a test card</button></form>`,
  );
}

function paidPage(session: FakeSession, delivery: Delivery): string {
  const told =
    delivery.status !== null
      ? `The shop's server answered ${delivery.status}.`
      : `The shop's server could not be told (${escapeHtml(delivery.error ?? 'unknown')}).`;
  return page(
    'Paid',
    `<h1>Paid ${amountText(session.amount_total, session.currency)}</h1><p>${told}</p><p><a href="${escapeHtml(session.success_url)}">Back to the invoice</a></p>`,
  );
}
