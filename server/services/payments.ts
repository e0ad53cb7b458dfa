import { and, desc, eq, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreatePaymentInput,
  InvoiceStatus,
  Payment,
  PaymentListQuery,
  PaymentMethod,
  RecordedPayment,
} from '../../shared/api/invoices';
import type { JobStatus } from '../../shared/api/jobs';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { expireDroppedCheckout, type PaymentProvider } from '../payments/provider';
import { recordAudit } from './audit';
import { dayIn } from './business-calendar';
import { findInvoice, loadBusiness, toPayment } from './invoices';
import { found, scoped } from './scope';

const invoiceScope = { businessId: t.invoices.businessId, customerId: t.invoices.customerId };

export async function listPayments(
  db: Db,
  actor: Actor,
  invoiceId: number,
  query: PaymentListQuery,
): Promise<ListResponse<Payment>> {
  const after = decodeCursor(query.cursor);
  const [invoice] = await db
    .select({ id: t.invoices.id })
    .from(t.invoices)
    .where(scoped(actor, invoiceScope, eq(t.invoices.id, invoiceId)));
  found(invoice, 'invoice');
  const rows = await db
    .select()
    .from(t.payments)
    .where(
      and(
        eq(t.payments.businessId, actor.businessId),
        eq(t.payments.invoiceId, invoiceId),
        after ? lt(t.payments.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.payments.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toPayment);
}

/** Nothing paid, some paid, all paid: the status a paid amount leaves an invoice in. */
function statusForPaid(paidCents: number, totalCents: number): InvoiceStatus {
  if (paidCents <= 0) return 'issued';
  return paidCents < totalCents ? 'part_paid' : 'paid';
}

/** Who records a payment: a signed-in person, or (userId null) the payment service's webhook. */
export interface PaymentRecorder {
  businessId: number;
  userId: number | null;
}

export type LockedInvoice = typeof t.invoices.$inferSelect;

/** The invoice row under `for update`, in the recorder's business; null when there is none. */
export async function lockInvoice(
  tx: Db,
  businessId: number,
  invoiceId: number,
): Promise<LockedInvoice | null> {
  const [row] = await tx
    .select()
    .from(t.invoices)
    .where(and(eq(t.invoices.businessId, businessId), eq(t.invoices.id, invoiceId)))
    .for('update');
  return row ?? null;
}

export interface PaymentEntry {
  method: PaymentMethod;
  /** Integer cents; negative is a refund. */
  amountCents: number;
  receivedAt?: Date;
  reference?: string | null;
  /** The payment service's event id: at most one payment per event (a unique index). */
  providerEventId?: string | null;
}

/**
 * Applies money in (or, negative, a refund out) to an invoice already locked by the caller's
 * transaction, so two payments at once cannot both fit a balance only one of them fits. Paid in
 * full moves the job to paid; a refund that reopens a balance moves it back to invoiced.
 * By hand, more than the balance (or a refund of more than was paid) is refused. From the
 * payment service the money has already moved, so it is recorded as it is: an overpayment leaves
 * a negative balance (money owed back to the customer), kept in the audit log as such.
 */
export async function applyPayment(
  tx: Db,
  who: PaymentRecorder,
  invoice: LockedInvoice,
  entry: PaymentEntry,
  now: Date,
  options: { fromProvider?: boolean } = {},
): Promise<typeof t.payments.$inferSelect> {
  if (invoice.status === 'void') {
    throw new ConflictError(`Invoice ${invoice.number} is void: it takes no payments.`);
  }
  const paidCents = invoice.paidCents + entry.amountCents;
  if (!options.fromProvider && paidCents > invoice.totalCents) {
    throw new ConflictError(
      `That is more than the ${invoice.balanceCents} cents left to pay on invoice ${invoice.number}.`,
      { balanceCents: invoice.balanceCents },
    );
  }
  if (!options.fromProvider && paidCents < 0) {
    throw new ConflictError(
      `A refund of ${-entry.amountCents} cents is more than the ${invoice.paidCents} cents paid on invoice ${invoice.number}.`,
      { paidCents: invoice.paidCents },
    );
  }
  const status = statusForPaid(paidCents, invoice.totalCents);
  const [payment] = await tx
    .insert(t.payments)
    .values({
      businessId: who.businessId,
      invoiceId: invoice.id,
      method: entry.method,
      amountCents: entry.amountCents,
      receivedAt: entry.receivedAt ?? now,
      reference: entry.reference ?? null,
      providerEventId: entry.providerEventId ?? null,
      recordedBy: who.userId,
      createdAt: now,
    })
    .returning();
  await tx
    .update(t.invoices)
    .set({ paidCents, balanceCents: invoice.totalCents - paidCents, status, updatedAt: now })
    .where(and(eq(t.invoices.businessId, who.businessId), eq(t.invoices.id, invoice.id)));
  if (status === 'paid' && invoice.status !== 'paid') {
    await moveJobStatus(tx, who, {
      jobId: invoice.jobId,
      from: 'invoiced',
      to: 'paid',
      note: `Invoice ${invoice.number} paid in full`,
      at: now,
    });
  } else if (status !== 'paid' && invoice.status === 'paid') {
    await moveJobStatus(tx, who, {
      jobId: invoice.jobId,
      from: 'paid',
      to: 'invoiced',
      note: `Refund on invoice ${invoice.number} reopened its balance`,
      at: now,
    });
  }
  const overpaid = paidCents > invoice.totalCents;
  await recordAudit(tx, {
    businessId: who.businessId,
    actorId: who.userId,
    action: entry.amountCents < 0 ? 'payment.refunded' : overpaid ? 'payment.overpaid' : 'payment.recorded',
    entityType: 'payment',
    entityId: payment!.id,
    details: {
      invoiceId: invoice.id,
      number: invoice.number,
      method: entry.method,
      amountCents: entry.amountCents,
      paidCents,
      ...(entry.providerEventId ? { providerEventId: entry.providerEventId } : {}),
    },
    at: now,
  });
  return payment!;
}

/**
 * A job status move and its timeline row, only when the job is where the move starts from
 * (as services/invoices.ts moveJob, with no person behind it for the payment service).
 */
async function moveJobStatus(
  tx: Db,
  who: PaymentRecorder,
  move: { jobId: number; from: JobStatus; to: JobStatus; note: string; at: Date },
): Promise<void> {
  const [moved] = await tx
    .update(t.jobs)
    .set({ status: move.to, updatedAt: move.at })
    .where(
      and(eq(t.jobs.businessId, who.businessId), eq(t.jobs.id, move.jobId), eq(t.jobs.status, move.from)),
    )
    .returning({ id: t.jobs.id });
  if (!moved) return;
  await tx.insert(t.jobEvents).values({
    businessId: who.businessId,
    jobId: move.jobId,
    fromStatus: move.from,
    toStatus: move.to,
    note: move.note,
    actorId: who.userId,
    at: move.at,
  });
}

/**
 * Cash, cheque, transfer or a card slip, recorded by hand by the owner (CreatePaymentInput). What
 * is owed changes, so the invoice's card link, made for the balance before, is dropped with it and,
 * once the payment has committed, expired at the payment service: the customer cannot pay the old
 * amount on top. The next send (or `POST …/payment-link`) makes one for what is left. A link the
 * service will not expire (paid already, or the service down) changes nothing here: money that
 * arrives on it anyway is recorded as owed back (applyPayment, fromProvider).
 */
export async function recordPayment(
  db: Db,
  payments: PaymentProvider,
  actor: Actor,
  invoiceId: number,
  input: CreatePaymentInput,
  now: Date,
): Promise<RecordedPayment> {
  const { recorded, sessionId } = await db.transaction(async (tx) => {
    const business = await loadBusiness(tx, actor.businessId);
    const [row] = await tx
      .select()
      .from(t.invoices)
      .where(scoped(actor, invoiceScope, eq(t.invoices.id, invoiceId)))
      .for('update');
    const invoice = found(row, 'invoice');
    const payment = await applyPayment(
      tx,
      { businessId: actor.businessId, userId: actor.userId },
      invoice,
      {
        method: input.method,
        amountCents: input.amountCents,
        ...(input.receivedAt ? { receivedAt: new Date(input.receivedAt) } : {}),
        reference: input.reference ?? null,
      },
      now,
    );
    if (invoice.paymentSessionId) {
      await tx
        .update(t.invoices)
        .set({ paymentLinkUrl: null, paymentSessionId: null })
        .where(and(eq(t.invoices.businessId, actor.businessId), eq(t.invoices.id, invoice.id)));
    }
    return {
      recorded: {
        payment: toPayment(payment),
        invoice: await findInvoice(tx, actor, invoiceId, dayIn(business.timezone, now)),
      },
      sessionId: invoice.paymentSessionId,
    };
  });
  await expireDroppedCheckout(payments, sessionId);
  return recorded;
}
