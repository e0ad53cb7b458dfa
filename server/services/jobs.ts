import { TZDate } from '@date-fns/tz';
import { and, asc, desc, eq, gte, ilike, inArray, isNotNull, isNull, lt, or, type SQL } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import {
  canTransition,
  JOB_TRANSITIONS,
  transitionRefusal,
  type CreateJobInput,
  type CreateJobNoteInput,
  type Job,
  type JobDetail,
  type JobEvent,
  type JobListQuery,
  type JobStatus,
  type JobStatusChangeInput,
  type JobSummary,
  type UpdateJobInput,
} from '../../shared/api/jobs';
import { machineDisplayName } from '../../shared/api/machines';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, iso, scoped } from './scope';

type Row = typeof t.jobs.$inferSelect;
type EventRow = typeof t.jobEvents.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
const columns = { businessId: t.jobs.businessId, customerId: t.jobs.customerId };

export function toJob(row: Row): Job {
  return {
    id: row.id,
    status: row.status,
    customerId: row.customerId,
    machineId: row.machineId,
    complaint: row.complaint,
    location: row.location,
    scheduledAt: iso(row.scheduledAt),
    arrivedAt: iso(row.arrivedAt),
    completedAt: iso(row.completedAt),
    cancelledAt: iso(row.cancelledAt),
    meterReading: row.meterReading,
    diagnosis: row.diagnosis,
    workDone: row.workDone,
    clientId: row.clientId,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** Notes are the workshop's own words: a customer's timeline shows the status moves only. */
function toJobEvent(row: EventRow, actorName: string | null, actor: Actor): JobEvent {
  return {
    id: row.id,
    kind: row.toStatus === null ? 'note' : 'status',
    fromStatus: row.fromStatus,
    toStatus: row.toStatus,
    note: actor.role === 'customer' ? null : row.note,
    actorName,
    at: row.at.toISOString(),
  };
}

/**
 * The instant a calendar day begins on the business's wall clock. A day is not always 24 hours
 * (DST), so the end of a range is the start of the day after, never start + 24 h.
 */
function startOfBusinessDay(day: string, timeZone: string, addDays = 0): Date {
  const [year, month, date] = day.split('-').map(Number) as [number, number, number];
  return new Date(new TZDate(year, month - 1, date + addDays, timeZone).getTime());
}

async function scheduledRange(db: Db, actor: Actor, query: JobListQuery): Promise<SQL[]> {
  if (!query.from && !query.to) return [];
  const [business] = await db
    .select({ timezone: t.businesses.timezone })
    .from(t.businesses)
    .where(eq(t.businesses.id, actor.businessId));
  const timeZone = found(business, 'business').timezone;
  const range: SQL[] = [];
  if (query.from) range.push(gte(t.jobs.scheduledAt, startOfBusinessDay(query.from, timeZone)));
  if (query.to) range.push(lt(t.jobs.scheduledAt, startOfBusinessDay(query.to, timeZone, 1)));
  return range;
}

export async function listJobs(db: Db, actor: Actor, query: JobListQuery): Promise<ListResponse<JobSummary>> {
  const after = decodeCursor(query.cursor);
  const range = await scheduledRange(db, actor, query);
  const pattern = query.q ? `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null;
  const rows = await db
    .select({
      job: t.jobs,
      customerName: t.customers.name,
      machine: { year: t.machines.year, make: t.machines.make, model: t.machines.model },
    })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(
      scoped(
        actor,
        columns,
        query.status ? inArray(t.jobs.status, query.status) : undefined,
        query.customerId ? eq(t.jobs.customerId, query.customerId) : undefined,
        query.machineId ? eq(t.jobs.machineId, query.machineId) : undefined,
        ...range,
        after ? lt(t.jobs.id, after) : undefined,
        pattern
          ? or(
              ilike(t.jobs.complaint, pattern),
              ilike(t.customers.name, pattern),
              ilike(t.machines.make, pattern),
              ilike(t.machines.model, pattern),
              ilike(t.machines.vin, pattern),
            )
          : undefined,
      ),
    )
    .orderBy(desc(t.jobs.id))
    .limit(query.limit + 1);
  const keyed = rows.map((row) => ({ id: row.job.id, ...row }));
  return toPage(keyed, query.limit, ({ job, customerName, machine }) => ({
    ...toJob(job),
    customerName,
    machineName: machineDisplayName(machine),
  }));
}

async function jobEvents(db: Db, actor: Actor, jobId: number): Promise<JobEvent[]> {
  const rows = await db
    .select({ event: t.jobEvents, actorName: t.users.name })
    .from(t.jobEvents)
    .leftJoin(t.users, eq(t.users.id, t.jobEvents.actorId))
    .where(
      and(
        eq(t.jobEvents.businessId, actor.businessId),
        eq(t.jobEvents.jobId, jobId),
        actor.role === 'customer' ? isNotNull(t.jobEvents.toStatus) : undefined,
      ),
    )
    .orderBy(asc(t.jobEvents.at), asc(t.jobEvents.id));
  return rows.map(({ event, actorName }) => toJobEvent(event, actorName, actor));
}

export async function getJob(db: Db, actor: Actor, id: number): Promise<JobDetail> {
  const [row] = await db
    .select({ job: t.jobs, customerName: t.customers.name, machine: t.machines })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(scoped(actor, columns, eq(t.jobs.id, id)));
  const { job, customerName, machine } = found(row, 'job');
  return {
    ...toJob(job),
    customerName,
    machineName: machineDisplayName(machine),
    events: await jobEvents(db, actor, id),
  };
}

/**
 * The machine's meter only moves forward: a visit's reading raises it, and a late-entered older
 * visit leaves it alone, so due-by-distance and due-by-hours work from the latest figure.
 */
async function raiseMachineMeter(tx: Tx, machineId: number, reading: number, now: Date) {
  await tx
    .update(t.machines)
    .set({ meterReading: reading, meterReadAt: now, updatedAt: now })
    .where(
      and(
        eq(t.machines.id, machineId),
        or(isNull(t.machines.meterReading), lt(t.machines.meterReading, reading)),
      ),
    );
}

async function jobByClientId(db: Db | Tx, actor: Actor, clientId: string): Promise<Row | undefined> {
  const [row] = await db
    .select()
    .from(t.jobs)
    .where(and(eq(t.jobs.businessId, actor.businessId), eq(t.jobs.clientId, clientId)));
  return row;
}

/** `created` is false when the clientId was seen before: the offline queue replayed an entry. */
export async function createJob(
  db: Db,
  actor: Actor,
  input: CreateJobInput,
  now: Date,
): Promise<{ job: Job; created: boolean }> {
  // Before any other check: a replay must answer with its job even if the machine was archived since.
  const replayed = input.clientId ? await jobByClientId(db, actor, input.clientId) : undefined;
  if (replayed) return { job: toJob(replayed), created: false };

  const [target] = await db
    .select({
      customerId: t.machines.customerId,
      machineArchivedAt: t.machines.archivedAt,
      customerArchivedAt: t.customers.archivedAt,
    })
    .from(t.machines)
    .innerJoin(t.customers, eq(t.customers.id, t.machines.customerId))
    .where(and(eq(t.machines.id, input.machineId), eq(t.machines.businessId, actor.businessId)));
  if (!target || target.customerId !== input.customerId) {
    throw new BadRequestError("That machine is not one of this customer's");
  }
  if (target.customerArchivedAt) throw new BadRequestError('That customer is archived');
  if (target.machineArchivedAt) throw new BadRequestError('That machine is archived');

  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(t.jobs)
      .values({
        businessId: actor.businessId,
        customerId: input.customerId,
        machineId: input.machineId,
        status: 'booked',
        complaint: input.complaint,
        location: input.location ?? null,
        scheduledAt: input.scheduledAt ? new Date(input.scheduledAt) : null,
        meterReading: input.meterReading ?? null,
        clientId: input.clientId ?? null,
        createdBy: actor.userId,
        createdAt: now,
        updatedAt: now,
      })
      .onConflictDoNothing({ target: [t.jobs.businessId, t.jobs.clientId] })
      .returning();
    if (!row) {
      // The same entry arrived twice at once; the other request made it.
      return { job: toJob(found(await jobByClientId(tx, actor, input.clientId!), 'job')), created: false };
    }
    await tx.insert(t.jobEvents).values({
      businessId: actor.businessId,
      jobId: row.id,
      fromStatus: null,
      toStatus: 'booked',
      actorId: actor.userId,
      at: now,
    });
    if (input.meterReading != null) await raiseMachineMeter(tx, row.machineId, input.meterReading, now);
    return { job: toJob(row), created: true };
  });
}

export async function updateJob(db: Db, actor: Actor, id: number, input: UpdateJobInput, now: Date) {
  return db.transaction(async (tx) => {
    const { scheduledAt, ...rest } = input;
    const [row] = await tx
      .update(t.jobs)
      .set({
        ...rest,
        ...(scheduledAt !== undefined ? { scheduledAt: scheduledAt ? new Date(scheduledAt) : null } : {}),
        updatedAt: now,
      })
      .where(scoped(actor, columns, eq(t.jobs.id, id)))
      .returning();
    const job = found(row, 'job');
    if (input.meterReading != null) await raiseMachineMeter(tx, job.machineId, input.meterReading, now);
    return toJob(job);
  });
}

/** The timestamps a move sets: arrival, completion (cleared again when a job is reopened), cancellation. */
function stampsFor(from: JobStatus, to: JobStatus, now: Date): Partial<Row> {
  if (to === 'on_site') return { arrivedAt: now };
  if (to === 'complete') return { completedAt: now };
  if (to === 'cancelled') return { cancelledAt: now };
  if (from === 'complete') return { completedAt: null };
  return {};
}

async function lockJob(tx: Tx, actor: Actor, id: number): Promise<Row> {
  const [row] = await tx
    .select()
    .from(t.jobs)
    .where(scoped(actor, columns, eq(t.jobs.id, id)))
    .for('update');
  return found(row, 'job');
}

async function eventByClientId(tx: Tx, actor: Actor, clientId: string) {
  const [row] = await tx
    .select({ event: t.jobEvents, actorName: t.users.name })
    .from(t.jobEvents)
    .leftJoin(t.users, eq(t.users.id, t.jobEvents.actorId))
    .where(and(eq(t.jobEvents.businessId, actor.businessId), eq(t.jobEvents.clientId, clientId)));
  return row;
}

function clientIdElsewhere(): ConflictError {
  return new ConflictError('That clientId was already used for an entry on another job');
}

/**
 * Moves a job along JOB_TRANSITIONS (shared/api/jobs.ts) and writes the move to its timeline. A
 * replay of a move already recorded under the same clientId answers with the job as it is now.
 */
export async function changeJobStatus(
  db: Db,
  actor: Actor,
  id: number,
  input: JobStatusChangeInput,
  now: Date,
): Promise<Job> {
  return db.transaction(async (tx) => {
    const job = await lockJob(tx, actor, id);
    if (input.clientId) {
      const seen = await eventByClientId(tx, actor, input.clientId);
      if (seen && seen.event.jobId !== id) throw clientIdElsewhere();
      if (seen) return toJob(job);
    }
    if (!canTransition(job.status, input.status)) {
      throw new ConflictError(transitionRefusal(job.status, input.status), {
        from: job.status,
        to: input.status,
        allowed: JOB_TRANSITIONS[job.status],
      });
    }
    const [row] = await tx
      .update(t.jobs)
      .set({ status: input.status, ...stampsFor(job.status, input.status, now), updatedAt: now })
      .where(eq(t.jobs.id, id))
      .returning();
    await tx.insert(t.jobEvents).values({
      businessId: actor.businessId,
      jobId: id,
      fromStatus: job.status,
      toStatus: input.status,
      note: input.note ?? null,
      actorId: actor.userId,
      clientId: input.clientId ?? null,
      at: now,
    });
    return toJob(row!);
  });
}

/** A note on the timeline with no status change; `created` is false for a replayed clientId. */
export async function addJobNote(
  db: Db,
  actor: Actor,
  id: number,
  input: CreateJobNoteInput,
  now: Date,
): Promise<{ event: JobEvent; created: boolean }> {
  return db.transaction(async (tx) => {
    await lockJob(tx, actor, id);
    const [row] = await tx
      .insert(t.jobEvents)
      .values({
        businessId: actor.businessId,
        jobId: id,
        note: input.note,
        actorId: actor.userId,
        clientId: input.clientId ?? null,
        at: now,
      })
      .onConflictDoNothing({ target: [t.jobEvents.businessId, t.jobEvents.clientId] })
      .returning();
    if (row) return { event: toJobEvent(row, actor.name, actor), created: true };
    const seen = found(await eventByClientId(tx, actor, input.clientId!), 'note');
    if (seen.event.jobId !== id) throw clientIdElsewhere();
    return { event: toJobEvent(seen.event, seen.actorName, actor), created: false };
  });
}

/** What counts as work recorded against a job: any of these keeps it from being deleted. */
const RECORDS = [
  { label: 'readings', table: t.readings, jobId: t.readings.jobId, id: t.readings.id },
  { label: 'check runs', table: t.checkRuns, jobId: t.checkRuns.jobId, id: t.checkRuns.id },
  { label: 'line items', table: t.lineItems, jobId: t.lineItems.jobId, id: t.lineItems.id },
  { label: 'estimates', table: t.estimates, jobId: t.estimates.jobId, id: t.estimates.id },
  { label: 'invoices', table: t.invoices, jobId: t.invoices.jobId, id: t.invoices.id },
  { label: 'attachments', table: t.attachments, jobId: t.attachments.jobId, id: t.attachments.id },
] as const;

/**
 * Deleting is for a booking made by mistake: only a job still booked with nothing recorded
 * against it goes. Anything that happened stays on the record; such a job is cancelled instead.
 */
export async function deleteJob(db: Db, actor: Actor, id: number, now: Date) {
  return db.transaction(async (tx) => {
    const job = await lockJob(tx, actor, id);
    const cancelInstead = 'cancel it instead (status cancelled)';
    if (job.status !== 'booked') {
      throw new ConflictError(`Only a booked job can be deleted; this one is past that: ${cancelInstead}`);
    }
    const held: string[] = [];
    for (const record of RECORDS) {
      const [any] = await tx
        .select({ id: record.id })
        .from(record.table)
        .where(eq(record.jobId, id))
        .limit(1);
      if (any) held.push(record.label);
    }
    if (held.length > 0) {
      throw new ConflictError(`This job has ${held.join(', ')} recorded against it: ${cancelInstead}`);
    }
    await tx.delete(t.jobs).where(eq(t.jobs.id, id));
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'job.deleted',
      entityType: 'job',
      entityId: id,
      details: { customerId: job.customerId, machineId: job.machineId, complaint: job.complaint },
      at: now,
    });
  });
}
