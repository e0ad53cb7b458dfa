import type { Command } from 'commander';
import { z } from 'zod';
import { InvoiceListSchema, InvoiceSchema, INVOICES_PATH, type Invoice } from '../../shared/api/invoices';
import type { OutboxItem } from '../../shared/api/outbox';
import { InvoiceSentSchema, type InvoiceSent } from '../../shared/api/payments';
import { createApi } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { theme } from '../ui/theme';

const GlobalSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });
const money = (cents: number) => `$${(cents / 100).toFixed(2)}`;

function line(invoice: Invoice) {
  const state = invoice.overdue
    ? theme.fail(`overdue ${invoice.daysOverdue} d`)
    : invoice.status.replace('_', ' ');
  return `#${String(invoice.number).padStart(4, '0')}  ${invoice.issuedOn}  ${invoice.customerName.padEnd(20)}  ${money(invoice.totalCents).padStart(10)}  due ${money(invoice.balanceCents).padStart(10)}  ${state}`;
}

export async function invoiceCreateAction(deps: CliDeps, jobText: string, raw: unknown, command: Command) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  if (!/^\d+$/.test(jobText)) throw new UsageError(`JOB must be a job number, got "${jobText}"`);
  const created = await createApi(deps, options.server).request('POST', INVOICES_PATH, InvoiceSchema, {
    body: { jobId: Number(jobText) },
  });
  deps.stdout.write(options.json ? `${JSON.stringify(created)}\n` : `${line(created)}\n`);
}

export async function invoiceListAction(
  deps: CliDeps,
  raw: { unpaid?: boolean; overdue?: boolean },
  command: Command,
) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const page = await createApi(deps, options.server).request('GET', INVOICES_PATH, InvoiceListSchema, {
    query: {
      unpaid: raw.unpaid ? 'true' : undefined,
      status: raw.overdue ? 'overdue' : undefined,
      limit: 100,
    },
  });
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(page.items)}\n`);
    return;
  }
  if (page.items.length === 0) deps.stdout.write('no invoices\n');
  for (const item of page.items) deps.stdout.write(`${line(item)}\n`);
}

export async function invoiceSendAction(
  deps: CliDeps,
  invoiceText: string,
  raw: { again?: boolean },
  command: Command,
) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  if (!/^\d+$/.test(invoiceText)) throw new UsageError(`INVOICE must be an invoice id, got "${invoiceText}"`);
  const mail = await createApi(deps, options.server).request(
    'POST',
    `${INVOICES_PATH}/${invoiceText}/send`,
    InvoiceSentSchema,
    { query: { again: raw.again ? 'true' : undefined } },
  );
  // The server keeps a failed mail and retries it: accepted, so not an error, but said plainly.
  if (mail.status !== 'sent') deps.stderr.write(`${notSentYet(mail)}\n`);
  if (mail.paymentLinkError) deps.stderr.write(`no card link on this invoice: ${mail.paymentLinkError}\n`);
  deps.stdout.write(options.json ? `${JSON.stringify(mail)}\n` : `${sentLines(mail)}\n`);
}

function sentLines(mail: InvoiceSent) {
  const files = mail.attachments.map((a) => a.filename).join(', ');
  const state = mail.status === 'sent' ? theme.pass('sent') : theme.warn(mail.status);
  const line = `${state}  ${mail.subject}  to ${mail.to}${files ? `  (${files})` : ''}`;
  return mail.paymentLinkUrl ? `${line}\npay by card: ${mail.paymentLinkUrl}` : line;
}

function notSentYet(mail: OutboxItem) {
  return `not sent yet (${mail.lastError ?? mail.status}); the server will try again`;
}
