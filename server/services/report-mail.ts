/**
 * Mailing a job's documents (the diagnostic report, and the estimate) to its customer through the
 * outbox, the same way invoices go (server/services/mail.ts): one outbox row per send under an
 * idempotency key, the PDF rendered and attached, a repeat refused unless `again`, a failed send
 * kept for the retry pass.
 */
import { and, asc, eq, like } from 'drizzle-orm';
import type { OutboxItem } from '../../shared/api/outbox';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError } from '../errors';
import type { Mailer, OutgoingAttachment } from '../mail/mailer';
import { loadBusiness } from './invoices';
import { deliverMail, requireMailer, resendGate } from './mail';
import { toOutboxItem } from './outbox';
import { reportPdf } from './report-documents';
import { jobInScope } from './readings';
import { found } from './scope';

type Row = typeof t.outbox.$inferSelect;

export interface JobDocumentMail {
  /** The outbox `kind`: what the mail is for. */
  kind: 'report' | 'estimate';
  jobId: number;
  /** The estimate an `estimate` mail carries, kept on the outbox row for a retry to render it. */
  estimateId?: number;
  /** Unique to the document: `report:12:`; each send appends its count. */
  keyPrefix: string;
  /** How a refusal names it: "The report for job 12". */
  what: string;
  /** True when the document records a send already (an estimate's `sentAt`). */
  markedSent: boolean;
  subject: string;
  bodyText: string;
  render: () => Promise<{ filename: string; bytes: Buffer }>;
}

/**
 * Writes the outbox row for this key, or finds the one an earlier or racing call wrote.
 * Written here rather than with mail.ts's `enqueueMail`, whose mail kinds are typed as invoice and
 * reminder only; the row is the same one that function writes.
 */
async function enqueue(
  db: Db,
  mail: Omit<typeof t.outbox.$inferInsert, 'status' | 'attempts' | 'createdAt'>,
  now: Date,
): Promise<{ row: Row; inserted: boolean }> {
  const [written] = await db
    .insert(t.outbox)
    .values({ ...mail, status: 'queued', attempts: 0, createdAt: now })
    .onConflictDoNothing({ target: [t.outbox.businessId, t.outbox.idempotencyKey] })
    .returning();
  if (written) return { row: written, inserted: true };
  const [existing] = await db
    .select()
    .from(t.outbox)
    .where(and(eq(t.outbox.businessId, mail.businessId), eq(t.outbox.idempotencyKey, mail.idempotencyKey)));
  return { row: found(existing, 'outbox mail'), inserted: false };
}

/** Mails one of a job's documents to its customer with the PDF attached; 202 with the outbox row. */
export async function mailJobDocument(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  document: JobDocumentMail,
  options: { again: boolean },
  now: Date,
): Promise<OutboxItem> {
  requireMailer(mailer);
  const job = await jobInScope(db, actor, document.jobId);
  const [customer] = await db
    .select()
    .from(t.customers)
    .where(and(eq(t.customers.businessId, job.businessId), eq(t.customers.id, job.customerId)));
  const { name, email } = found(customer, 'customer');
  if (!email) throw new BadRequestError(`${name} has no e-mail address; add one to the customer first.`);

  const earlier = await db
    .select()
    .from(t.outbox)
    .where(
      and(
        eq(t.outbox.businessId, job.businessId),
        eq(t.outbox.kind, document.kind),
        like(t.outbox.idempotencyKey, `${document.keyPrefix}%`),
      ),
    )
    .orderBy(asc(t.outbox.id));
  const waiting = resendGate(earlier, document.markedSent, options.again, document.what, now);
  const pdf = await document.render();
  const rendered: OutgoingAttachment[] = [
    { filename: pdf.filename, contentType: 'application/pdf', content: pdf.bytes },
  ];
  // A failed send still waiting is tried again now, with the document as it stands today.
  if (waiting) return toOutboxItem(await deliverMail(db, mailer, waiting, now, { actor, rendered }));

  const { row, inserted } = await enqueue(
    db,
    {
      businessId: job.businessId,
      kind: document.kind,
      to: email,
      subject: document.subject,
      bodyText: document.bodyText,
      attachments: rendered.map((a) => ({
        filename: a.filename,
        contentType: a.contentType,
        sizeBytes: a.content.length,
      })),
      idempotencyKey: `${document.keyPrefix}${earlier.length + 1}`,
      jobId: job.id,
      estimateId: document.estimateId ?? null,
    },
    now,
  );
  // A racing request wrote this key first: its attempt is the one; this one sends nothing.
  if (!inserted) return toOutboxItem(row);
  return toOutboxItem(await deliverMail(db, mailer, row, now, { actor, rendered }));
}

/**
 * Mails the job's diagnostic report to its customer. Sent once; `again` sends it once more (after
 * more work on the job, say), or tries a failed send again.
 */
export async function sendReportMail(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  jobId: number,
  options: { again: boolean },
  now: Date,
): Promise<OutboxItem> {
  const job = await jobInScope(db, actor, jobId);
  const [row] = await db
    .select({ customer: t.customers, machine: t.machines })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(and(eq(t.jobs.businessId, job.businessId), eq(t.jobs.id, job.id)));
  const { customer, machine } = found(row, 'job');
  const business = await loadBusiness(db, job.businessId);
  const machineName = [machine.year, machine.make, machine.model]
    .filter((x) => x !== null && x !== '')
    .join(' ');
  return mailJobDocument(
    db,
    mailer,
    actor,
    {
      kind: 'report',
      jobId: job.id,
      keyPrefix: `report:${job.id}:`,
      what: `The report for job ${job.id}`,
      markedSent: false,
      subject: `Diagnostic report for your ${machineName} from ${business.name}`,
      bodyText: [
        `Hello ${customer.name},`,
        '',
        `The diagnostic report for your ${machineName} (job ${job.id}) is attached as a PDF:`,
        'what was measured, against which limit, what each result means, and the work done.',
        '',
        'Thank you,',
        business.ownerName,
        business.name,
        ...(business.phone ? [business.phone] : []),
      ].join('\n'),
      render: () => reportPdf(db, actor, job.id, { now }),
    },
    options,
    now,
  );
}
