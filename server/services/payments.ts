import { and, desc, eq, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreatePaymentInput,
  InvoiceStatus,
  Payment,
  PaymentListQuery,
  RecordedPayment,
} from '../../shared/api/invoices';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { dayIn, findInvoice, loadBusiness, moveJob, toPayment } from './invoices';
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
  if (paidCents === 0) return 'issued';
  return paidCents < totalCents ? 'part_paid' : 'paid';
}

/**
 * Records money in (or, negative, a refund out) against an invoice, under the invoice's row lock
 * so two payments at once cannot both fit a balance only one of them fits. Paid in full moves
 * the job to paid; a refund that reopens a balance moves it back to invoiced.
 */
export async function recordPayment(
  db: Db,
  actor: Actor,
  invoiceId: number,
  input: CreatePaymentInput,
  now: Date,
): Promise<RecordedPayment> {
  return db.transaction(async (tx) => {
    const business = await loadBusiness(tx, actor.businessId);
    const [row] = await tx
      .select()
      .from(t.invoices)
      .where(scoped(actor, invoiceScope, eq(t.invoices.id, invoiceId)))
      .for('update');
    const invoice = found(row, 'invoice');
    if (invoice.status === 'void') {
      throw new ConflictError(`Invoice ${invoice.number} is void: it takes no payments.`);
    }
    const paidCents = invoice.paidCents + input.amountCents;
    if (paidCents > invoice.totalCents) {
      throw new ConflictError(
        `That is more than the ${invoice.balanceCents} cents left to pay on invoice ${invoice.number}.`,
        { balanceCents: invoice.balanceCents },
      );
    }
    if (paidCents < 0) {
      throw new ConflictError(
        `A refund of ${-input.amountCents} cents is more than the ${invoice.paidCents} cents paid on invoice ${invoice.number}.`,
        { paidCents: invoice.paidCents },
      );
    }
    const status = statusForPaid(paidCents, invoice.totalCents);
    const [payment] = await tx
      .insert(t.payments)
      .values({
        businessId: actor.businessId,
        invoiceId,
        method: input.method,
        amountCents: input.amountCents,
        receivedAt: input.receivedAt ? new Date(input.receivedAt) : now,
        reference: input.reference ?? null,
        recordedBy: actor.userId,
        createdAt: now,
      })
      .returning();
    await tx
      .update(t.invoices)
      .set({ paidCents, balanceCents: invoice.totalCents - paidCents, status, updatedAt: now })
      .where(eq(t.invoices.id, invoiceId));
    if (status === 'paid' && invoice.status !== 'paid') {
      await moveJob(tx, actor, {
        jobId: invoice.jobId,
        from: 'invoiced',
        to: 'paid',
        note: `Invoice ${invoice.number} paid in full`,
        at: now,
      });
    } else if (status !== 'paid' && invoice.status === 'paid') {
      await moveJob(tx, actor, {
        jobId: invoice.jobId,
        from: 'paid',
        to: 'invoiced',
        note: `Refund on invoice ${invoice.number} reopened its balance`,
        at: now,
      });
    }
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: input.amountCents < 0 ? 'payment.refunded' : 'payment.recorded',
      entityType: 'payment',
      entityId: payment!.id,
      details: {
        invoiceId,
        number: invoice.number,
        method: input.method,
        amountCents: input.amountCents,
        paidCents,
      },
      at: now,
    });
    return {
      payment: toPayment(payment!),
      invoice: await findInvoice(tx, actor, invoiceId, dayIn(business.timezone, now)),
    };
  });
}
