/**
 * Documents made from an estimate: the PDF the customer reads and the mail attaches, from the
 * stored estimate (its lines as quoted, its totals as figured then); nothing is priced again here.
 * Kept apart from the estimate service, which mails, so the outbox's retry pass can render an
 * estimate without importing the mail code back.
 */
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { EstimateLine } from '../../shared/api/estimates';
import { LineItemKindSchema } from '../../shared/api/jobs';
import { machineDisplayName } from '../../shared/api/machines';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { renderEstimatePdf, type EstimateDocument } from '../pdf/estimate-pdf';
import type { Paper } from '../pdf/invoice-pdf';
import { loadBusiness } from './invoices';
import { found, scoped } from './scope';

type Row = typeof t.estimates.$inferSelect;

/**
 * Stored lines, read leniently: the demo seed's estimates keep only kind, description, quantity
 * and unit price, so the rest is null rather than guessed.
 */
const StoredLineSchema = z.object({
  kind: LineItemKindSchema,
  description: z.string(),
  partNumber: z.string().nullish(),
  quantityMilli: z.number().int(),
  unitPriceCents: z.number().int(),
  markupBps: z.number().int().nullish(),
  taxable: z.boolean().nullish(),
  lineTotalCents: z.number().int().nullish(),
});

export function linesOf(row: Row): EstimateLine[] {
  return z
    .array(StoredLineSchema)
    .parse(row.lines)
    .map((line) => ({
      kind: line.kind,
      description: line.description,
      partNumber: line.partNumber ?? null,
      quantityMilli: line.quantityMilli,
      unitPriceCents: line.unitPriceCents,
      markupBps: line.markupBps ?? null,
      taxable: line.taxable ?? null,
      lineTotalCents: line.lineTotalCents ?? null,
    }));
}

/** One estimate in the actor's scope (a customer's only their own jobs'); another's is a 404. */
export async function estimateInScope(db: Pick<Db, 'select'>, actor: Actor, id: number, lock = false) {
  const query = db
    .select({ estimate: t.estimates, job: t.jobs, decidedByName: t.users.name })
    .from(t.estimates)
    .innerJoin(t.jobs, eq(t.jobs.id, t.estimates.jobId))
    .leftJoin(t.users, eq(t.users.id, t.estimates.decidedBy))
    .where(
      scoped(
        actor,
        { businessId: t.estimates.businessId, customerId: t.jobs.customerId },
        eq(t.estimates.id, id),
      ),
    );
  const [row] = lock ? await query.for('update', { of: [t.estimates, t.jobs] }) : await query;
  return found(row, 'estimate');
}

function dayLabel(timezone: string, instant: Date): string {
  return format(new TZDate(instant, timezone), 'd MMM yyyy');
}

/** Everything the estimate PDF prints, read in the actor's scope. */
export async function estimateDocument(
  db: Db,
  actor: Actor,
  id: number,
  now: Date,
): Promise<EstimateDocument> {
  const { estimate, job, decidedByName } = await estimateInScope(db, actor, id);
  const business = await loadBusiness(db, estimate.businessId);
  const [target] = await db
    .select({ customer: t.customers, machine: t.machines })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(and(eq(t.jobs.businessId, estimate.businessId), eq(t.jobs.id, job.id)));
  const { customer, machine } = found(target, 'job');
  const identity = machine.vin
    ? `VIN ${machine.vin}`
    : machine.otherId
      ? `Serial ${machine.otherId}`
      : 'No VIN or serial on file';
  return {
    business: {
      name: business.name,
      ownerName: business.ownerName,
      addressLines: business.addressLines,
      phone: business.phone,
      email: business.email,
      currency: business.currency,
    },
    estimate: {
      id: estimate.id,
      status: estimate.status,
      issuedOn: dayLabel(business.timezone, estimate.sentAt ?? estimate.createdAt),
      subtotalCents: estimate.subtotalCents,
      taxCents: estimate.taxCents,
      totalCents: estimate.totalCents,
      taxRatePpm: estimate.taxRatePpm,
      taxRounding: estimate.taxRounding,
      note: estimate.note,
      decision: estimate.decidedAt
        ? {
            on: dayLabel(business.timezone, estimate.decidedAt),
            by: decidedByName,
            via: estimate.decidedVia,
            note: estimate.decisionNote,
          }
        : null,
    },
    customer: { name: customer.name, email: customer.email },
    machine: { title: machineDisplayName(machine), identity, meterUnit: machine.meterUnit },
    job: { id: job.id, complaint: job.complaint, diagnosis: job.diagnosis },
    lines: linesOf(estimate),
    generatedAt: now,
  };
}

export const estimateFilename = (id: number) => `estimate-${id}.pdf`;

export async function estimatePdf(
  db: Db,
  actor: Actor,
  id: number,
  options: { paper?: Paper; now?: Date } = {},
): Promise<{ filename: string; bytes: Buffer }> {
  const now = options.now ?? new Date();
  const document = await estimateDocument(db, actor, id, now);
  return {
    filename: estimateFilename(id),
    bytes: await renderEstimatePdf(document, options.paper ?? 'letter'),
  };
}
