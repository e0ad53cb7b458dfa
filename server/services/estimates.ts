/**
 * Estimates: the job's line items quoted to the customer (snapshotted with totals by
 * shared/money.ts, as a PDF, by mail), and the customer's answer, recorded with the time and the
 * signed-in person. Sending moves a job being diagnosed to "awaiting approval"; an approval moves
 * it on to "repairing" (shared/api/jobs.ts JOB_TRANSITIONS); a decline leaves it where it is for
 * the owner to decide what comes next (more diagnosis, or cancelling).
 */
import { and, asc, desc, eq, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreateEstimateInput,
  DecideEstimateInput,
  Estimate,
  EstimateCreated,
  EstimateLine,
  EstimateListQuery,
} from '../../shared/api/estimates';
import { machineDisplayName } from '../../shared/api/machines';
import { invoiceTotals, lineTotalCents } from '../../shared/money';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import type { Mailer } from '../mail/mailer';
import { formatCents } from '../pdf/invoice-pdf';
import { recordAudit } from './audit';
import { estimateInScope, estimatePdf, linesOf } from './estimate-documents';
import { loadBusiness, moveJob } from './invoices';
import { requireMailer } from './mail';
import { jobInScope } from './readings';
import { mailJobDocument } from './report-mail';
import { found, iso } from './scope';

type Row = typeof t.estimates.$inferSelect;

function toEstimate(row: Row, customerId: number, decidedByName: string | null): Estimate {
  return {
    id: row.id,
    jobId: row.jobId,
    customerId,
    status: row.status,
    lines: linesOf(row),
    subtotalCents: row.subtotalCents,
    taxCents: row.taxCents,
    totalCents: row.totalCents,
    taxRatePpm: row.taxRatePpm,
    taxRounding: row.taxRounding,
    note: row.note,
    sentAt: iso(row.sentAt),
    decidedAt: iso(row.decidedAt),
    decidedById: row.decidedBy,
    decidedByName,
    decidedVia: row.decidedVia,
    decisionNote: row.decisionNote,
    createdAt: row.createdAt.toISOString(),
  };
}

export async function getEstimate(db: Db, actor: Actor, id: number): Promise<Estimate> {
  const { estimate, job, decidedByName } = await estimateInScope(db, actor, id);
  return toEstimate(estimate, job.customerId, decidedByName);
}

/** The job's estimates, newest first. */
export async function listEstimates(
  db: Db,
  actor: Actor,
  jobId: number,
  query: EstimateListQuery,
): Promise<ListResponse<Estimate>> {
  const job = await jobInScope(db, actor, jobId);
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select({ estimate: t.estimates, decidedByName: t.users.name })
    .from(t.estimates)
    .leftJoin(t.users, eq(t.users.id, t.estimates.decidedBy))
    .where(
      and(
        eq(t.estimates.businessId, job.businessId),
        eq(t.estimates.jobId, job.id),
        after ? lt(t.estimates.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.estimates.id))
    .limit(query.limit + 1);
  const page = toPage(
    rows.map((r) => ({ ...r, id: r.estimate.id })),
    query.limit,
    (r) => toEstimate(r.estimate, job.customerId, r.decidedByName),
  );
  return page;
}

/** A job can be quoted while it is being diagnosed, or again while an answer is awaited. */
const QUOTABLE = ['diagnosing', 'awaiting_approval'] as const;

/**
 * Quotes the job's lines as they stand: snapshot, totals at the business's tax rate and rounding,
 * the job moved to awaiting approval, then the PDF mailed to the customer (when they have an
 * e-mail address; otherwise `mail` is null and the estimate waits in their sign-in).
 */
export async function createEstimate(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  jobId: number,
  input: CreateEstimateInput,
  now: Date,
): Promise<EstimateCreated> {
  const job = await jobInScope(db, actor, jobId);
  const [customer] = await db
    .select()
    .from(t.customers)
    .where(and(eq(t.customers.businessId, job.businessId), eq(t.customers.id, job.customerId)));
  const { email } = found(customer, 'customer');
  // Checked before anything is written: an estimate that should go by mail is not made without it.
  if (email) requireMailer(mailer);

  const created = await db.transaction(async (tx) => {
    const [locked] = await tx
      .select()
      .from(t.jobs)
      .where(and(eq(t.jobs.businessId, job.businessId), eq(t.jobs.id, job.id)))
      .for('update');
    const { status } = found(locked, 'job');
    if (!(QUOTABLE as readonly string[]).includes(status)) {
      throw new ConflictError(
        `An estimate goes out while the job is diagnosing or awaiting approval; this job is ${status.replaceAll('_', ' ')}.`,
        { status },
      );
    }
    const [open] = await tx
      .select({ id: t.estimates.id })
      .from(t.estimates)
      .where(
        and(
          eq(t.estimates.businessId, job.businessId),
          eq(t.estimates.jobId, job.id),
          eq(t.estimates.status, 'sent'),
        ),
      );
    if (open) {
      throw new ConflictError(
        `Estimate ${open.id} is still waiting for the customer's answer: record it (approve or decline) before quoting again.`,
        { estimateId: open.id },
      );
    }
    const items = await tx
      .select()
      .from(t.lineItems)
      .where(and(eq(t.lineItems.businessId, job.businessId), eq(t.lineItems.jobId, job.id)))
      .orderBy(asc(t.lineItems.position), asc(t.lineItems.id));
    if (items.length === 0) throw new ConflictError('The job has no line items to quote: add them first.');
    const unpriced = items.filter((item) => item.kind !== 'labour' && item.unitPriceCents === 0);
    if (unpriced.length > 0) {
      throw new ConflictError(
        `Enter a price for ${unpriced.map((item) => item.description).join(', ')} before the estimate goes out.`,
        { lineItemIds: unpriced.map((item) => item.id) },
      );
    }
    const business = await loadBusiness(tx, job.businessId);
    const totals = invoiceTotals(items, business.taxRatePpm, business.taxRounding);
    const lines: EstimateLine[] = items.map((item) => ({
      kind: item.kind,
      description: item.description,
      partNumber: item.partNumber,
      quantityMilli: item.quantityMilli,
      unitPriceCents: item.unitPriceCents,
      markupBps: item.markupBps,
      taxable: item.taxable,
      lineTotalCents: lineTotalCents(item),
    }));
    const [row] = await tx
      .insert(t.estimates)
      .values({
        businessId: job.businessId,
        jobId: job.id,
        status: 'sent',
        subtotalCents: totals.subtotalCents,
        taxCents: totals.taxCents,
        totalCents: totals.totalCents,
        taxRatePpm: business.taxRatePpm,
        taxRounding: business.taxRounding,
        lines,
        note: input.note ?? null,
        sentAt: now,
        createdBy: actor.userId,
        createdAt: now,
      })
      .returning();
    if (status === 'diagnosing') {
      await moveJob(tx, actor, {
        jobId: job.id,
        from: 'diagnosing',
        to: 'awaiting_approval',
        note: `Estimate ${row!.id} sent: ${formatCents(totals.totalCents, business.currency)}`,
        at: now,
      });
    }
    await recordAudit(tx, {
      businessId: job.businessId,
      actorId: actor.userId,
      action: 'estimate.sent',
      entityType: 'estimate',
      entityId: row!.id,
      details: { jobId: job.id, totalCents: totals.totalCents, lines: lines.length },
      at: now,
    });
    return { row: row!, business };
  });

  const estimate = toEstimate(created.row, job.customerId, null);
  if (!email) return { ...estimate, mail: null };
  const mail = await mailEstimate(db, mailer, actor, created.row, { again: false }, now);
  return { ...estimate, mail };
}

/** Mails an estimate with its PDF (used when it is made; `again` sends it once more). */
async function mailEstimate(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  row: Row,
  options: { again: boolean },
  now: Date,
) {
  const business = await loadBusiness(db, row.businessId);
  const [target] = await db
    .select({ customer: t.customers, machine: t.machines })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(and(eq(t.jobs.businessId, row.businessId), eq(t.jobs.id, row.jobId)));
  const { customer, machine } = found(target, 'job');
  const machineName = machineDisplayName(machine);
  return mailJobDocument(
    db,
    mailer,
    actor,
    {
      kind: 'estimate',
      jobId: row.jobId,
      estimateId: row.id,
      keyPrefix: `estimate:${row.id}:`,
      what: `Estimate ${row.id}`,
      markedSent: false,
      subject: `Estimate ${row.id} for your ${machineName} from ${business.name}`,
      bodyText: [
        `Hello ${customer.name},`,
        '',
        `The estimate for the work on your ${machineName} (job ${row.jobId}) is attached as a PDF.`,
        '',
        `Estimated total: ${formatCents(row.totalCents, business.currency)}`,
        '',
        'Approve or decline it when you sign in to see your job, or reply to this e-mail with your answer.',
        '',
        'Thank you,',
        business.ownerName,
        business.name,
        ...(business.phone ? [business.phone] : []),
      ].join('\n'),
      render: () => estimatePdf(db, actor, row.id, { now }),
    },
    options,
    now,
  );
}

/**
 * The customer's answer: signed in as the customer of that job, or given by the owner on their
 * word, which is recorded as such and must say how the word was given (`note`). Only a sent
 * estimate is answered, once. An approval moves a job awaiting approval on to repairing.
 */
export async function decideEstimate(
  db: Db,
  actor: Actor,
  id: number,
  decision: 'approved' | 'declined',
  input: DecideEstimateInput,
  now: Date,
): Promise<Estimate> {
  const onTheirWord = actor.role !== 'customer';
  const note = input.note ?? null;
  if (onTheirWord && !note) {
    throw new BadRequestError(
      "Recording the customer's answer for them: say how they gave it in `note` (by phone, in person …).",
    );
  }
  return db.transaction(async (tx) => {
    const { estimate, job } = await estimateInScope(tx, actor, id, true);
    if (estimate.status !== 'sent') {
      throw new ConflictError(`Estimate ${estimate.id} is ${estimate.status}, not waiting for an answer.`, {
        status: estimate.status,
      });
    }
    const [row] = await tx
      .update(t.estimates)
      .set({
        status: decision,
        decidedAt: now,
        decidedBy: actor.userId,
        decidedVia: onTheirWord ? 'owner_for_customer' : 'customer',
        decisionNote: note,
      })
      .where(and(eq(t.estimates.businessId, estimate.businessId), eq(t.estimates.id, estimate.id)))
      .returning();
    const words = `Estimate ${estimate.id} ${decision}${onTheirWord ? ` on the customer's word (${note})` : ' by the customer'}`;
    const moved =
      decision === 'approved' && job.status === 'awaiting_approval'
        ? await moveJob(tx, actor, {
            jobId: job.id,
            from: 'awaiting_approval',
            to: 'repairing',
            note: words,
            at: now,
          })
        : false;
    if (!moved) {
      await tx.insert(t.jobEvents).values({
        businessId: estimate.businessId,
        jobId: job.id,
        note: words,
        actorId: actor.userId,
        at: now,
      });
    }
    await recordAudit(tx, {
      businessId: estimate.businessId,
      actorId: actor.userId,
      action: `estimate.${decision}`,
      entityType: 'estimate',
      entityId: estimate.id,
      details: { jobId: job.id, via: onTheirWord ? 'owner_for_customer' : 'customer', note, jobMoved: moved },
      at: now,
    });
    return toEstimate(row!, job.customerId, actor.name);
  });
}
