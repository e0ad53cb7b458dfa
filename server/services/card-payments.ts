/**
 * Card payments through the hosted payment service (server/payments/): the link an invoice
 * carries, and what the service's webhooks do to the books. Each event lands once: its id goes
 * into `webhook_events` in the same transaction as its payment (and `payments.provider_event_id`
 * is unique too), under the invoice's row lock, so a redelivery — or two at once — changes nothing.
 */
import { and, eq, gt, lt, sql } from 'drizzle-orm';
import type { CreatePaymentLinkInput, PaymentLink, WebhookReceipt } from '../../shared/api/payments';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { ConflictError, NotFoundError } from '../errors';
import {
  PaymentProviderError,
  PaymentsNotSetUpError,
  type CheckoutSession,
  type PaymentEvent,
  type PaymentProvider,
} from '../payments/provider';
import { recordAudit } from './audit';
import { loadBusiness } from './invoices';
import { applyPayment, lockInvoice } from './payments';
import { found, scoped } from './scope';

const invoiceScope = { businessId: t.invoices.businessId, customerId: t.invoices.customerId };
const invoiceNumber = (n: number) => String(n).padStart(4, '0');

function toLink(invoiceId: number, session: CheckoutSession, created: boolean): PaymentLink {
  return {
    invoiceId,
    url: session.url,
    sessionId: session.sessionId,
    amountCents: session.amountCents,
    currency: session.currency,
    expiresAt: session.expiresAt ? session.expiresAt.toISOString() : null,
    created,
  };
}

/**
 * The card link for an invoice's balance (or, with `amountCents`, part of it). The stored link is
 * handed back while the service still takes payment on it for that amount; otherwise it is
 * dropped (and, if still open, expired so the old amount cannot be paid) and a new one made.
 * The service is called outside any transaction: a slow answer holds no lock.
 */
export async function ensurePaymentLink(
  db: Db,
  provider: PaymentProvider,
  actor: Actor,
  invoiceId: number,
  input: CreatePaymentLinkInput,
  now: Date,
): Promise<PaymentLink> {
  if (!provider.available) throw new PaymentsNotSetUpError();
  const [target] = await db
    .select({ invoice: t.invoices, customer: t.customers })
    .from(t.invoices)
    .innerJoin(t.customers, eq(t.customers.id, t.invoices.customerId))
    .where(scoped(actor, invoiceScope, eq(t.invoices.id, invoiceId)));
  const { invoice, customer } = found(target, 'invoice');
  const label = invoiceNumber(invoice.number);
  if (invoice.status === 'void') {
    throw new ConflictError(`Invoice ${label} is void: it takes no payments.`);
  }
  if (invoice.balanceCents <= 0) {
    throw new ConflictError(`Invoice ${label} has nothing left to pay.`, {
      balanceCents: invoice.balanceCents,
    });
  }
  const amountCents = input.amountCents ?? invoice.balanceCents;
  if (amountCents > invoice.balanceCents) {
    throw new ConflictError(
      `That is more than the ${invoice.balanceCents} cents left to pay on invoice ${label}.`,
      { balanceCents: invoice.balanceCents },
    );
  }
  const business = await loadBusiness(db, actor.businessId);
  const currency = business.currency.toUpperCase();
  const here = and(eq(t.invoices.businessId, actor.businessId), eq(t.invoices.id, invoice.id));

  if (invoice.paymentSessionId) {
    const existing = await provider.findCheckout(invoice.paymentSessionId);
    if (existing?.open && existing.amountCents === amountCents && existing.currency === currency) {
      if (invoice.paymentLinkUrl !== existing.url) {
        await db.update(t.invoices).set({ paymentLinkUrl: existing.url }).where(here);
      }
      return toLink(invoice.id, existing, false);
    }
    // Forgotten first, so a failure below leaves no out-of-date link for the PDF to print.
    await db
      .update(t.invoices)
      .set({ paymentLinkUrl: null, paymentSessionId: null, updatedAt: now })
      .where(and(here, eq(t.invoices.paymentSessionId, invoice.paymentSessionId)));
    if (existing?.open) await provider.expireCheckout(existing.sessionId);
  }

  const session = await provider.createCheckout({
    businessId: actor.businessId,
    invoiceId: invoice.id,
    title: `Invoice ${label} from ${business.name}`,
    amountCents,
    currency,
    customerEmail: customer.email,
  });
  if (session.amountCents !== amountCents) {
    throw new PaymentProviderError(
      `checkout ${session.sessionId} is for ${session.amountCents} cents, not the ${amountCents} asked for`,
    );
  }
  await db.transaction(async (tx) => {
    await tx
      .update(t.invoices)
      .set({ paymentLinkUrl: session.url, paymentSessionId: session.sessionId, updatedAt: now })
      .where(here);
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'payment_link.created',
      entityType: 'invoice',
      entityId: invoice.id,
      details: { number: invoice.number, sessionId: session.sessionId, amountCents },
      at: now,
    });
  });
  return toLink(invoice.id, session, true);
}

/**
 * Before an invoice is mailed: make sure its PDF carries a card link for the balance. A link is
 * a convenience, not a condition: when the service fails, the mail still goes (cash and cheque
 * still work) and the reason comes back; nothing owed, void or missing is the send's to report.
 */
export async function linkForSending(
  db: Db,
  provider: PaymentProvider,
  actor: Actor,
  invoiceId: number,
  now: Date,
): Promise<{ error: string | null }> {
  if (!provider.available) return { error: null };
  try {
    await ensurePaymentLink(db, provider, actor, invoiceId, {}, now);
    return { error: null };
  } catch (error) {
    if (error instanceof ConflictError || error instanceof NotFoundError) return { error: null };
    if (error instanceof PaymentProviderError) return { error: error.message };
    throw error;
  }
}

/** The link an invoice's PDF carries now, for the send's answer. */
export async function storedPaymentLink(db: Db, actor: Actor, invoiceId: number): Promise<string | null> {
  const [row] = await db
    .select({ url: t.invoices.paymentLinkUrl })
    .from(t.invoices)
    .where(scoped(actor, invoiceScope, eq(t.invoices.id, invoiceId)));
  return row?.url ?? null;
}

/**
 * One verified webhook. Money paid is a card payment for the session's amount; a refund is the
 * part of the service's running refunded total not yet recorded for that payment, as a negative
 * payment (so events arriving out of order still add up). Events for invoices this database does
 * not hold are answered but not kept: they belong to some other install on the same account.
 */
export async function applyPaymentEvent(db: Db, event: PaymentEvent, now: Date): Promise<WebhookReceipt> {
  const receipt = (outcome: WebhookReceipt['outcome'], paymentId: number | null = null): WebhookReceipt => ({
    received: true,
    eventId: event.eventId,
    outcome,
    paymentId,
  });
  const target =
    event.kind === 'ignored' ? event.target : { businessId: event.businessId, invoiceId: event.invoiceId };
  if (!target) return receipt('ignored');

  return db.transaction(async (tx) => {
    const invoice = await lockInvoice(tx, target.businessId, target.invoiceId);
    if (!invoice) return receipt('ignored');
    const [seen] = await tx
      .insert(t.webhookEvents)
      .values({ eventId: event.eventId, businessId: target.businessId, type: event.type, receivedAt: now })
      .onConflictDoNothing()
      .returning({ eventId: t.webhookEvents.eventId });
    if (!seen) return receipt('duplicate');
    if (event.kind === 'ignored') return receipt('ignored');

    if (invoice.status === 'void') {
      // The money moved anyway: the owner refunds it at the service; the log says so.
      await recordAudit(tx, {
        businessId: target.businessId,
        actorId: null,
        action: 'payment.unapplied',
        entityType: 'invoice',
        entityId: invoice.id,
        details: {
          number: invoice.number,
          eventId: event.eventId,
          type: event.type,
          paymentRef: event.paymentRef,
          reason: 'invoice is void',
        },
        at: now,
      });
      return receipt('unapplied');
    }

    const card = and(
      eq(t.payments.businessId, target.businessId),
      eq(t.payments.invoiceId, invoice.id),
      eq(t.payments.method, 'card'),
      eq(t.payments.reference, event.paymentRef),
    );
    let amountCents: number;
    if (event.kind === 'paid') {
      // One payment per payment at the service, whichever of its events reports it.
      const [earlier] = await tx
        .select({ id: t.payments.id })
        .from(t.payments)
        .where(and(card, gt(t.payments.amountCents, 0)))
        .limit(1);
      if (earlier) return receipt('nothing_new');
      amountCents = event.amountCents;
    } else {
      const [refunded] = await tx
        .select({ cents: sql<number>`coalesce(-sum(${t.payments.amountCents}), 0)`.mapWith(Number) })
        .from(t.payments)
        .where(and(card, lt(t.payments.amountCents, 0)));
      const newlyRefunded = event.refundedTotalCents - (refunded?.cents ?? 0);
      if (newlyRefunded <= 0) return receipt('nothing_new');
      amountCents = -newlyRefunded;
    }
    const payment = await applyPayment(
      tx,
      { businessId: target.businessId, userId: null },
      invoice,
      { method: 'card', amountCents, reference: event.paymentRef, providerEventId: event.eventId },
      now,
      { fromProvider: true },
    );
    return receipt('recorded', payment.id);
  });
}
