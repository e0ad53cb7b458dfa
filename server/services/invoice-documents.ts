/**
 * Documents made from an invoice: the PDF the customer reads and the mail attaches. The figures
 * are the stored ones (the invoice and its lines as issued); nothing is priced again here.
 */
import { and, eq } from 'drizzle-orm';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { renderInvoicePdf, type InvoiceDocument, type Paper } from '../pdf/invoice-pdf';
import { dayIn } from './business-calendar';
import { getInvoice, loadBusiness } from './invoices';
import { found } from './scope';

export interface InvoicePdfOptions {
  paper?: Paper;
  /** The clock reading that decides "today" (the overdue line) and the PDF's creation date. */
  now?: Date;
}

/**
 * Everything the invoice PDF prints, read in the actor's scope: an invoice outside it is a 404
 * before anything else is read.
 */
export async function invoiceDocument(
  db: Db,
  actor: Actor,
  invoiceId: number,
  now: Date,
): Promise<InvoiceDocument> {
  const invoice = await getInvoice(db, actor, invoiceId, now);
  const business = await loadBusiness(db, actor.businessId);
  const [extra] = await db
    .select({ paymentLinkUrl: t.invoices.paymentLinkUrl })
    .from(t.invoices)
    .where(and(eq(t.invoices.businessId, actor.businessId), eq(t.invoices.id, invoice.id)));
  const [job] = await db
    .select()
    .from(t.jobs)
    .where(and(eq(t.jobs.businessId, actor.businessId), eq(t.jobs.id, invoice.jobId)));
  const { machineId, meterReading, complaint, workDone } = found(job, 'job');
  const [machine] = await db
    .select()
    .from(t.machines)
    .where(and(eq(t.machines.businessId, actor.businessId), eq(t.machines.id, machineId)));
  const [customer] = await db
    .select()
    .from(t.customers)
    .where(and(eq(t.customers.businessId, actor.businessId), eq(t.customers.id, invoice.customerId)));
  const { year, make, model, vin, otherId, meterUnit } = found(machine, 'machine');
  const { name, addressLines, town, email } = found(customer, 'customer');

  return {
    business: {
      name: business.name,
      ownerName: business.ownerName,
      addressLines: business.addressLines,
      phone: business.phone,
      email: business.email,
      currency: business.currency,
      invoiceTermsDays: business.invoiceTermsDays,
      invoiceFooter: business.invoiceFooter,
    },
    invoice: { ...invoice, paymentLinkUrl: extra?.paymentLinkUrl ?? null },
    customer: { name, addressLines, town, email },
    machine: { year, make, model, vin, otherId, meterUnit },
    job: { meterReading, complaint, workDone },
    lines: invoice.lines,
    payments: invoice.payments.map((payment) => ({
      receivedOn: dayIn(business.timezone, new Date(payment.receivedAt)),
      method: payment.method,
      amountCents: payment.amountCents,
      reference: payment.reference,
    })),
    generatedAt: now,
  };
}

/**
 * The invoice as a PDF, for the route and for the mail that attaches it. `now` should be the
 * caller's clock (RouteDeps.now); without one the wall clock stands in, for callers that have none.
 */
export async function invoicePdf(
  db: Db,
  actor: Actor,
  invoiceId: number,
  options: InvoicePdfOptions = {},
): Promise<{ filename: string; bytes: Buffer }> {
  const now = options.now ?? new Date();
  const document = await invoiceDocument(db, actor, invoiceId, now);
  const bytes = await renderInvoicePdf(document, options.paper ?? 'letter');
  return { filename: `invoice-${document.invoice.number}.pdf`, bytes };
}
