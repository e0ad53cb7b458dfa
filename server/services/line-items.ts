/**
 * A job's line items: labour, parts, trip and supplies in integer cents and thousandths of a
 * unit, totalled by shared/money.ts. Once the job is invoiced or paid the invoice holds the
 * lines, so they no longer change. Every change of money is audited.
 */
import { and, asc, eq, sql } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type { LineItemKind } from '../../shared/api/jobs';
import {
  quantityToMilli,
  type AppliedLines,
  type CreateLineItemInput,
  type LineItem,
  type LineItemListQuery,
  type UpdateLineItemInput,
} from '../../shared/api/line-items';
import { lineTotalCents } from '../../shared/money';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { runOfJob, walkStoredRun } from './checks';
import { jobInScope, type JobInScope, type Reader } from './readings';
import { found } from './scope';

type Row = typeof t.lineItems.$inferSelect;

/** Labour and the trip fee are services; parts and supplies are goods (taxed by default). */
const TAXABLE_BY_DEFAULT: Record<LineItemKind, boolean> = {
  labour: false,
  trip: false,
  part: true,
  supplies: true,
  other: true,
};

const PRICE_NEEDED: readonly LineItemKind[] = ['part', 'supplies'];

function toLineItem(row: Row): LineItem {
  return {
    id: row.id,
    jobId: row.jobId,
    kind: row.kind,
    description: row.description,
    partNumber: row.partNumber,
    quantity: row.quantityMilli / 1000,
    quantityMilli: row.quantityMilli,
    unitPriceCents: row.unitPriceCents,
    markupBps: row.markupBps,
    taxable: row.taxable,
    position: row.position,
    checkRunId: row.checkRunId,
    lineTotalCents: lineTotalCents(row),
    needsPrice: PRICE_NEEDED.includes(row.kind) && row.unitPriceCents === 0,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** What the audit log keeps of a line: enough to see what the money was before and after. */
const moneyOf = (row: Row) => ({
  kind: row.kind,
  description: row.description,
  quantityMilli: row.quantityMilli,
  unitPriceCents: row.unitPriceCents,
  markupBps: row.markupBps,
  taxable: row.taxable,
  lineTotalCents: lineTotalCents(row),
});

async function businessRates(db: Reader, businessId: number) {
  const [row] = await db
    .select({
      labourRateCents: t.businesses.labourRateCents,
      partsMarkupBps: t.businesses.partsMarkupBps,
    })
    .from(t.businesses)
    .where(eq(t.businesses.id, businessId));
  return found(row, 'business');
}

/** Locks the job for the transaction and refuses once an invoice holds its lines. */
async function lockUnbilledJob(tx: Reader, job: JobInScope) {
  const [row] = await tx
    .select({ status: t.jobs.status })
    .from(t.jobs)
    .where(eq(t.jobs.id, job.id))
    .for('update');
  const status = found(row, 'job').status;
  if (status === 'invoiced' || status === 'paid') {
    throw new ConflictError(
      `Job ${job.id} is ${status}: its line items are on the invoice and stay as billed.`,
    );
  }
}

async function nextPosition(tx: Reader, jobId: number): Promise<number> {
  const [row] = await tx
    .select({ last: sql<number | null>`max(${t.lineItems.position})` })
    .from(t.lineItems)
    .where(eq(t.lineItems.jobId, jobId));
  return row?.last === null || row?.last === undefined ? 0 : row.last + 1;
}

const inJob = (job: JobInScope, ...more: Parameters<typeof and>) =>
  and(eq(t.lineItems.businessId, job.businessId), eq(t.lineItems.jobId, job.id), ...more);

/** In invoice order (position, then id); the cursor is the last line's id. */
export async function listLineItems(
  db: Db,
  actor: Actor,
  jobId: number,
  query: LineItemListQuery,
): Promise<ListResponse<LineItem>> {
  const job = await jobInScope(db, actor, jobId);
  const after = decodeCursor(query.cursor);
  let from: { position: number; id: number } | null = null;
  if (after) {
    const [row] = await db
      .select({ position: t.lineItems.position, id: t.lineItems.id })
      .from(t.lineItems)
      .where(inJob(job, eq(t.lineItems.id, after)));
    if (!row) throw new BadRequestError('Invalid cursor');
    from = row;
  }
  const rows = await db
    .select()
    .from(t.lineItems)
    .where(
      inJob(
        job,
        from ? sql`(${t.lineItems.position}, ${t.lineItems.id}) > (${from.position}, ${from.id})` : undefined,
      ),
    )
    .orderBy(asc(t.lineItems.position), asc(t.lineItems.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toLineItem);
}

/**
 * Adds a line. Labour without a price takes the business's labour rate; a part without a markup
 * takes the business's parts markup.
 */
export async function createLineItem(
  db: Db,
  actor: Actor,
  jobId: number,
  input: CreateLineItemInput,
  now: Date,
): Promise<LineItem> {
  const job = await jobInScope(db, actor, jobId);
  return db.transaction(async (tx) => {
    await lockUnbilledJob(tx, job);
    const rates = await businessRates(tx, job.businessId);
    const [row] = await tx
      .insert(t.lineItems)
      .values({
        businessId: job.businessId,
        jobId: job.id,
        kind: input.kind,
        description: input.description,
        partNumber: input.partNumber ?? null,
        quantityMilli: quantityToMilli(input.quantity)!,
        unitPriceCents: input.unitPriceCents ?? rates.labourRateCents,
        markupBps: input.markupBps ?? (input.kind === 'part' ? rates.partsMarkupBps : 0),
        taxable: input.taxable ?? TAXABLE_BY_DEFAULT[input.kind],
        position: input.position ?? (await nextPosition(tx, job.id)),
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await recordAudit(tx, {
      businessId: job.businessId,
      actorId: actor.userId,
      action: 'line_item.created',
      entityType: 'line_item',
      entityId: row!.id,
      details: { jobId: job.id, ...moneyOf(row!) },
      at: now,
    });
    return toLineItem(row!);
  });
}

export async function updateLineItem(
  db: Db,
  actor: Actor,
  jobId: number,
  itemId: number,
  input: UpdateLineItemInput,
  now: Date,
): Promise<LineItem> {
  const job = await jobInScope(db, actor, jobId);
  return db.transaction(async (tx) => {
    await lockUnbilledJob(tx, job);
    const [before] = await tx
      .select()
      .from(t.lineItems)
      .where(inJob(job, eq(t.lineItems.id, itemId)));
    found(before, 'line item');
    const { quantity, ...rest } = input;
    const [after] = await tx
      .update(t.lineItems)
      .set({
        ...rest,
        ...(quantity === undefined ? {} : { quantityMilli: quantityToMilli(quantity)! }),
        updatedAt: now,
      })
      .where(eq(t.lineItems.id, itemId))
      .returning();
    const was = moneyOf(before!);
    const is = moneyOf(after!);
    if (JSON.stringify(was) !== JSON.stringify(is)) {
      await recordAudit(tx, {
        businessId: job.businessId,
        actorId: actor.userId,
        action: 'line_item.updated',
        entityType: 'line_item',
        entityId: itemId,
        details: { jobId: job.id, before: was, after: is },
        at: now,
      });
    }
    return toLineItem(after!);
  });
}

export async function deleteLineItem(db: Db, actor: Actor, jobId: number, itemId: number, now: Date) {
  const job = await jobInScope(db, actor, jobId);
  await db.transaction(async (tx) => {
    await lockUnbilledJob(tx, job);
    const [row] = await tx
      .delete(t.lineItems)
      .where(inJob(job, eq(t.lineItems.id, itemId)))
      .returning();
    found(row, 'line item');
    await recordAudit(tx, {
      businessId: job.businessId,
      actorId: actor.userId,
      action: 'line_item.deleted',
      entityType: 'line_item',
      entityId: itemId,
      details: { jobId: job.id, ...moneyOf(row!) },
      at: now,
    });
  });
}

const PRICE_NOTE =
  'Parts and supplies were added at price 0: enter each price before the estimate goes out (Vanbay does not guess part prices).';

/**
 * Adds a finished run's suggested lines to its job: labour at the business's rate, parts and
 * supplies at 0 for the owner to price. The lines come from the server's walk of the stored
 * answers. Applying a run whose lines are already on the job is refused (409), so nothing is
 * added twice.
 */
export async function applyCheckLines(
  db: Db,
  actor: Actor,
  jobId: number,
  runId: number,
  now: Date,
): Promise<AppliedLines> {
  const job = await jobInScope(db, actor, jobId);
  return db.transaction(async (tx) => {
    await lockUnbilledJob(tx, job);
    const run = await runOfJob(tx, job, runId, true);
    if (run.status !== 'finished')
      throw new ConflictError(
        `Check run ${run.id} is not finished: its suggested lines come with its findings.`,
      );
    const [applied] = await tx
      .select({ id: t.lineItems.id })
      .from(t.lineItems)
      .where(inJob(job, eq(t.lineItems.checkRunId, run.id)))
      .limit(1);
    if (applied) throw new ConflictError(`The lines of check run ${run.id} are already on job ${job.id}.`);
    const { view } = await walkStoredRun(tx, job, run);
    const suggested = view.outcome?.lines ?? [];
    if (suggested.length === 0) return { checkRunId: run.id, items: [], note: null };
    const rates = await businessRates(tx, job.businessId);
    const first = await nextPosition(tx, job.id);
    const rows = await tx
      .insert(t.lineItems)
      .values(
        suggested.map((line, i) => {
          const quantityMilli = quantityToMilli(line.quantity);
          if (quantityMilli === null)
            throw new Error(`suggested line "${line.description}" has a bad quantity`);
          return {
            businessId: job.businessId,
            jobId: job.id,
            kind: line.kind,
            description: line.description,
            quantityMilli,
            unitPriceCents: line.kind === 'labour' ? rates.labourRateCents : 0,
            markupBps: line.kind === 'part' ? rates.partsMarkupBps : 0,
            taxable: TAXABLE_BY_DEFAULT[line.kind],
            position: first + i,
            checkRunId: run.id,
            createdAt: now,
            updatedAt: now,
          };
        }),
      )
      .returning();
    await recordAudit(tx, {
      businessId: job.businessId,
      actorId: actor.userId,
      action: 'line_items.applied_from_check',
      entityType: 'check_run',
      entityId: run.id,
      details: { jobId: job.id, lines: rows.map((row) => ({ id: row.id, ...moneyOf(row) })) },
      at: now,
    });
    const items = rows.map(toLineItem);
    return { checkRunId: run.id, items, note: items.some((i) => i.needsPrice) ? PRICE_NOTE : null };
  });
}
