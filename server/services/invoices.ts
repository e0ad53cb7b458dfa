import { TZDate } from '@date-fns/tz';
import { and, asc, desc, eq, getTableColumns, gt, gte, lt, lte, ne, or, sql, type SQL } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreateInvoiceInput,
  Invoice,
  InvoiceDetail,
  InvoiceLine,
  InvoiceListQuery,
  Payment,
} from '../../shared/api/invoices';
import type { JobStatus } from '../../shared/api/jobs';
import { invoiceTotals } from '../../shared/money';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { expireDroppedCheckout, type PaymentProvider } from '../payments/provider';
import { recordAudit } from './audit';
import { businessToday, dayIn } from './business-calendar';
import { found, iso, scoped } from './scope';

const invoiceScope = { businessId: t.invoices.businessId, customerId: t.invoices.customerId };
const jobScope = { businessId: t.jobs.businessId, customerId: t.jobs.customerId };

/** A calendar day moved by whole days; read as UTC so no daylight-saving change can shift it. */
export function addCalendarDays(day: string, days: number): string {
  const date = new Date(`${day}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

/** The instant a calendar day begins in a time zone (00:00 local, daylight saving included). */
export function startOfDayIn(timezone: string, day: string): Date {
  const [year, month, date] = day.split('-').map(Number) as [number, number, number];
  return new Date(new TZDate(year, month - 1, date, 0, 0, 0, timezone).getTime());
}

export type Business = typeof t.businesses.$inferSelect;

export async function loadBusiness(db: Db, businessId: number): Promise<Business> {
  const [business] = await db.select().from(t.businesses).where(eq(t.businesses.id, businessId));
  return found(business, 'business');
}

/**
 * The one overdue rule, used both to show the flag and to filter by it: an open balance on an
 * invoice that is not void, past its due date on the business's calendar.
 */
export function overdueSql(today: string): SQL<boolean> {
  return sql<boolean>`(${t.invoices.status} <> 'void' and ${t.invoices.balanceCents} > 0 and ${t.invoices.dueOn} < ${today}::date)`;
}

/** An open balance: something left to pay on an invoice that still stands. */
export function unpaidSql(): SQL {
  return and(ne(t.invoices.status, 'void'), gt(t.invoices.balanceCents, 0))!;
}

function invoiceColumns(today: string) {
  return {
    ...getTableColumns(t.invoices),
    customerName: t.customers.name,
    overdue: overdueSql(today),
    daysOverdue:
      sql<number>`case when ${overdueSql(today)} then (${today}::date - ${t.invoices.dueOn}) else 0 end`.mapWith(
        Number,
      ),
  };
}

type InvoiceRow = typeof t.invoices.$inferSelect & {
  customerName: string;
  overdue: boolean;
  daysOverdue: number;
};

export function toInvoice(row: InvoiceRow): Invoice {
  return {
    id: row.id,
    number: row.number,
    customerId: row.customerId,
    customerName: row.customerName,
    jobId: row.jobId,
    status: row.status,
    issuedOn: row.issuedOn,
    dueOn: row.dueOn,
    subtotalCents: row.subtotalCents,
    taxCents: row.taxCents,
    totalCents: row.totalCents,
    paidCents: row.paidCents,
    balanceCents: row.balanceCents,
    taxRatePpm: row.taxRatePpm,
    taxRounding: row.taxRounding,
    terms: row.terms,
    paymentLinkUrl: row.paymentLinkUrl,
    overdue: row.overdue === true,
    daysOverdue: row.daysOverdue,
    sentAt: iso(row.sentAt),
    voidedAt: iso(row.voidedAt),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

export function toPayment(row: typeof t.payments.$inferSelect): Payment {
  return {
    id: row.id,
    invoiceId: row.invoiceId,
    method: row.method,
    amountCents: row.amountCents,
    receivedAt: row.receivedAt.toISOString(),
    reference: row.reference,
    recordedBy: row.recordedBy,
    createdAt: row.createdAt.toISOString(),
  };
}

function toLine(row: typeof t.invoiceLines.$inferSelect): InvoiceLine {
  return {
    id: row.id,
    position: row.position,
    kind: row.kind,
    description: row.description,
    quantityMilli: row.quantityMilli,
    unitPriceCents: row.unitPriceCents,
    lineTotalCents: row.lineTotalCents,
    taxCents: row.taxCents,
  };
}

function statusFilter(status: InvoiceListQuery['status'], today: string): SQL | undefined {
  if (status === undefined) return undefined;
  return status === 'overdue' ? overdueSql(today) : eq(t.invoices.status, status);
}

function unpaidFilter(unpaid: InvoiceListQuery['unpaid']): SQL | undefined {
  if (unpaid === undefined) return undefined;
  return unpaid === 'true' ? unpaidSql() : or(eq(t.invoices.status, 'void'), eq(t.invoices.balanceCents, 0));
}

export async function listInvoices(
  db: Db,
  actor: Actor,
  query: InvoiceListQuery,
  now: Date,
): Promise<ListResponse<Invoice>> {
  const after = decodeCursor(query.cursor);
  const today = await businessToday(db, actor.businessId, now);
  const rows = await db
    .select(invoiceColumns(today))
    .from(t.invoices)
    .innerJoin(t.customers, eq(t.customers.id, t.invoices.customerId))
    .where(
      scoped(
        actor,
        invoiceScope,
        after ? lt(t.invoices.id, after) : undefined,
        statusFilter(query.status, today),
        query.customerId ? eq(t.invoices.customerId, query.customerId) : undefined,
        query.jobId ? eq(t.invoices.jobId, query.jobId) : undefined,
        unpaidFilter(query.unpaid),
        query.from ? gte(t.invoices.issuedOn, query.from) : undefined,
        query.to ? lte(t.invoices.issuedOn, query.to) : undefined,
      ),
    )
    .orderBy(desc(t.invoices.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toInvoice);
}

/** One invoice in the actor's scope (404 otherwise), as the list shows it. */
export async function findInvoice(db: Db, actor: Actor, id: number, today: string): Promise<Invoice> {
  const [row] = await db
    .select(invoiceColumns(today))
    .from(t.invoices)
    .innerJoin(t.customers, eq(t.customers.id, t.invoices.customerId))
    .where(scoped(actor, invoiceScope, eq(t.invoices.id, id)));
  return toInvoice(found(row, 'invoice'));
}

async function invoiceDetail(db: Db, actor: Actor, id: number, today: string): Promise<InvoiceDetail> {
  const invoice = await findInvoice(db, actor, id, today);
  const lines = await db
    .select()
    .from(t.invoiceLines)
    .where(eq(t.invoiceLines.invoiceId, id))
    .orderBy(asc(t.invoiceLines.position));
  const payments = await db
    .select()
    .from(t.payments)
    .where(eq(t.payments.invoiceId, id))
    .orderBy(asc(t.payments.receivedAt), asc(t.payments.id));
  return { ...invoice, lines: lines.map(toLine), payments: payments.map(toPayment) };
}

export async function getInvoice(db: Db, actor: Actor, id: number, now: Date): Promise<InvoiceDetail> {
  return invoiceDetail(db, actor, id, await businessToday(db, actor.businessId, now));
}

/** A job status move and its timeline row, only when the job is where the move starts from. */
export async function moveJob(
  db: Db,
  actor: Actor,
  move: { jobId: number; from: JobStatus; to: JobStatus; note: string; at: Date },
): Promise<boolean> {
  const [moved] = await db
    .update(t.jobs)
    .set({ status: move.to, updatedAt: move.at })
    .where(
      and(eq(t.jobs.businessId, actor.businessId), eq(t.jobs.id, move.jobId), eq(t.jobs.status, move.from)),
    )
    .returning({ id: t.jobs.id });
  if (!moved) return false;
  await db.insert(t.jobEvents).values({
    businessId: actor.businessId,
    jobId: move.jobId,
    fromStatus: move.from,
    toStatus: move.to,
    note: move.note,
    actorId: actor.userId,
    at: move.at,
  });
  return true;
}

/**
 * Issues the invoice for a complete job: its line items copied as they stand, totals by
 * shared/money.ts at the business's tax rate and rounding, the next number of the business.
 * The number is taken by incrementing the business's counter row inside this transaction: the
 * row lock makes concurrent issues wait their turn, and a rollback returns the number, so the
 * sequence has no gaps and no repeats.
 */
export async function createInvoice(
  db: Db,
  actor: Actor,
  input: CreateInvoiceInput,
  now: Date,
): Promise<InvoiceDetail> {
  return db.transaction(async (tx) => {
    const business = await loadBusiness(tx, actor.businessId);
    const [job] = await tx
      .select()
      .from(t.jobs)
      .where(scoped(actor, jobScope, eq(t.jobs.id, input.jobId)))
      .for('update');
    const { id: jobId, status, customerId } = found(job, 'job');
    const [standing] = await tx
      .select({ number: t.invoices.number })
      .from(t.invoices)
      .where(
        and(
          eq(t.invoices.businessId, actor.businessId),
          eq(t.invoices.jobId, jobId),
          ne(t.invoices.status, 'void'),
        ),
      )
      .limit(1);
    if (standing) throw new ConflictError(`Job ${jobId} is already billed on invoice ${standing.number}.`);
    if (status !== 'complete') {
      throw new ConflictError(`Only a complete job can be invoiced; job ${jobId} is ${status}.`);
    }
    const items = await tx
      .select()
      .from(t.lineItems)
      .where(and(eq(t.lineItems.businessId, actor.businessId), eq(t.lineItems.jobId, jobId)))
      .orderBy(asc(t.lineItems.position), asc(t.lineItems.id));
    if (items.length === 0) throw new ConflictError(`Job ${jobId} has no line items to bill.`);

    const totals = invoiceTotals(items, business.taxRatePpm, business.taxRounding);
    const [counter] = await tx
      .insert(t.invoiceCounters)
      .values({ businessId: actor.businessId, lastNumber: 1 })
      .onConflictDoUpdate({
        target: t.invoiceCounters.businessId,
        set: { lastNumber: sql`${t.invoiceCounters.lastNumber} + 1` },
      })
      .returning({ number: t.invoiceCounters.lastNumber });
    const number = counter!.number;
    const issuedOn = dayIn(business.timezone, now);
    const [invoice] = await tx
      .insert(t.invoices)
      .values({
        businessId: actor.businessId,
        number,
        jobId,
        customerId,
        status: 'issued',
        issuedOn,
        dueOn: addCalendarDays(issuedOn, business.invoiceTermsDays),
        subtotalCents: totals.subtotalCents,
        taxCents: totals.taxCents,
        totalCents: totals.totalCents,
        paidCents: 0,
        balanceCents: totals.totalCents,
        taxRatePpm: business.taxRatePpm,
        taxRounding: business.taxRounding,
        terms: `Due within ${business.invoiceTermsDays} days.`,
        createdAt: now,
        updatedAt: now,
      })
      .returning({ id: t.invoices.id });
    await tx.insert(t.invoiceLines).values(
      items.map((item, position) => ({
        businessId: actor.businessId,
        invoiceId: invoice!.id,
        position,
        kind: item.kind,
        description: item.description,
        quantityMilli: item.quantityMilli,
        unitPriceCents: item.unitPriceCents,
        lineTotalCents: totals.lines[position]!.totalCents,
        taxCents: totals.lines[position]!.taxCents,
      })),
    );
    await moveJob(tx, actor, {
      jobId,
      from: 'complete',
      to: 'invoiced',
      note: `Invoice ${number} issued`,
      at: now,
    });
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'invoice.issued',
      entityType: 'invoice',
      entityId: invoice!.id,
      details: { number, jobId, totalCents: totals.totalCents },
      at: now,
    });
    return invoiceDetail(tx, actor, invoice!.id, issuedOn);
  });
}

/**
 * Voids an invoice nobody has paid anything on (money received must be refunded first, so the
 * books never hold a payment against a void invoice); the job goes back to complete to be billed
 * again. Its card link is dropped with it and, once the void has committed, expired at the
 * payment service, so the customer cannot pay what is no longer owed. A link the service will not
 * expire (paid a moment before, its notice not yet here; the service down) is no loss: money for a
 * void invoice is kept out of the books and logged for the owner to refund (card-payments.ts,
 * "payment.unapplied").
 */
export async function voidInvoice(
  db: Db,
  payments: PaymentProvider,
  actor: Actor,
  id: number,
  now: Date,
): Promise<InvoiceDetail> {
  const { detail, sessionId } = await db.transaction(async (tx) => {
    const business = await loadBusiness(tx, actor.businessId);
    const [row] = await tx
      .select()
      .from(t.invoices)
      .where(scoped(actor, invoiceScope, eq(t.invoices.id, id)))
      .for('update');
    const invoice = found(row, 'invoice');
    if (invoice.status === 'void') throw new ConflictError(`Invoice ${invoice.number} is already void.`);
    if (invoice.paidCents !== 0) {
      throw new ConflictError(
        `Invoice ${invoice.number} has ${invoice.paidCents} cents paid on it; refund that before voiding.`,
        { paidCents: invoice.paidCents },
      );
    }
    await tx
      .update(t.invoices)
      .set({ status: 'void', voidedAt: now, updatedAt: now, paymentLinkUrl: null, paymentSessionId: null })
      .where(eq(t.invoices.id, id));
    await moveJob(tx, actor, {
      jobId: invoice.jobId,
      from: 'invoiced',
      to: 'complete',
      note: `Invoice ${invoice.number} voided`,
      at: now,
    });
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'invoice.voided',
      entityType: 'invoice',
      entityId: id,
      details: { number: invoice.number, totalCents: invoice.totalCents },
      at: now,
    });
    return {
      detail: await invoiceDetail(tx, actor, id, dayIn(business.timezone, now)),
      sessionId: invoice.paymentSessionId,
    };
  });
  await expireDroppedCheckout(payments, sessionId);
  return detail;
}
