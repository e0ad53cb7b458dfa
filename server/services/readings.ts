import { and, desc, eq, inArray, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type { JobStatus } from '../../shared/api/jobs';
import type {
  CreateReadingInput,
  Quantity,
  Reading,
  ReadingJudgement,
  ReadingListQuery,
} from '../../shared/api/readings';
import { evaluateFlowVolume } from '../../shared/evaluators/flow-volume';
import { evaluateRunningPressure } from '../../shared/evaluators/running-pressure';
import { resolveSpec, type MachineSpec } from '../../shared/procedures/specs';
import {
  DIMENSION_OF,
  findUnit,
  readingToCanonical,
  UnitError,
  UNITS,
  type UnitId,
} from '../../shared/units';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, scoped } from './scope';

/** Anything that can run a select: the database or a transaction inside it. */
export type Reader = Pick<Db, 'select'>;

/** A job the actor may see, with its machine's service-manual limits (null: generic). */
export interface JobInScope {
  id: number;
  businessId: number;
  customerId: number;
  machineId: number;
  status: JobStatus;
  spec: MachineSpec;
}

/**
 * Loads a job for its readings, checks and line items, scoped like every job query: another
 * business's job, or another customer's for a customer sign-in, is a 404.
 */
export async function jobInScope(db: Reader, actor: Actor, jobId: number): Promise<JobInScope> {
  const [row] = await db
    .select({
      id: t.jobs.id,
      businessId: t.jobs.businessId,
      customerId: t.jobs.customerId,
      machineId: t.jobs.machineId,
      status: t.jobs.status,
      fuelPressureMinKpa: t.machines.fuelPressureMinKpa,
      fuelPressureMaxKpa: t.machines.fuelPressureMaxKpa,
      holdMaxDropKpa: t.machines.holdMaxDropKpa,
      holdMinutes: t.machines.holdMinutes,
      flowMinLph: t.machines.flowMinLph,
    })
    .from(t.jobs)
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .where(
      scoped(actor, { businessId: t.jobs.businessId, customerId: t.jobs.customerId }, eq(t.jobs.id, jobId)),
    );
  const { id, businessId, customerId, machineId, status, ...spec } = found(row, 'job');
  return { id, businessId, customerId, machineId, status, spec };
}

/**
 * One reading against the machine's limits, by the shared evaluators: a pressure as a single
 * point against the running band (so in band still warns that the other throttle phases are
 * unmeasured), a flow rate as the volume it delivers in one minute against the minimum flow.
 * Other quantities have no per-machine limit to judge against.
 */
export function judgeReading(quantity: Quantity, value: number, spec: MachineSpec): ReadingJudgement | null {
  const limits = resolveSpec(spec);
  if (quantity === 'pressure') {
    const judged = evaluateRunningPressure({
      points: [{ phase: 'idle', kpa: value }],
      minKpa: limits.fuelPressureMinKpa,
      maxKpa: limits.fuelPressureMaxKpa,
      specSource: limits.sources.fuelPressureMinKpa,
    });
    return {
      verdict: judged.verdict,
      reason: judged.reason,
      specSource: judged.figures.specSource,
      basis: 'reading',
    };
  }
  if (quantity === 'flow') {
    const judged = evaluateFlowVolume({
      ml: (value * 1000) / 60,
      seconds: 60,
      minLph: limits.flowMinLph,
      specSource: limits.sources.flowMinLph,
    });
    return {
      verdict: judged.verdict,
      reason: judged.reason,
      specSource: judged.figures.specSource,
      basis: 'reading',
    };
  }
  return null;
}

type Row = typeof t.readings.$inferSelect;

const stepKeyOf = (checkRunId: number, stepKey: string) => `${checkRunId}:${stepKey}`;

/** The verdict of the check step each run reading was taken in, as stored from the server's walk. */
async function stepJudgements(db: Reader, businessId: number, rows: Row[]) {
  const runIds = [...new Set(rows.flatMap((r) => (r.checkRunId === null ? [] : [r.checkRunId])))];
  const judgements = new Map<string, ReadingJudgement>();
  if (runIds.length === 0) return judgements;
  const steps = await db
    .select()
    .from(t.checkSteps)
    .where(and(eq(t.checkSteps.businessId, businessId), inArray(t.checkSteps.checkRunId, runIds)))
    .orderBy(t.checkSteps.seq);
  for (const step of steps) {
    if (step.verdict === null || step.reason === null) continue;
    const source = (step.figures as Record<string, unknown> | null)?.specSource;
    judgements.set(stepKeyOf(step.checkRunId, step.stepKey), {
      verdict: step.verdict,
      reason: step.reason,
      specSource: source === 'manual' || source === 'generic' ? source : null,
      basis: 'step',
    });
  }
  return judgements;
}

function toReading(row: Row, judgement: ReadingJudgement | null): Reading {
  return {
    id: row.id,
    jobId: row.jobId,
    quantity: row.quantity,
    value: row.value,
    unit: row.unit,
    enteredValue: row.enteredValue,
    enteredUnit: row.enteredUnit,
    takenAt: row.takenAt.toISOString(),
    note: row.note,
    stepKey: row.stepKey,
    checkRunId: row.checkRunId,
    clientId: row.clientId,
    judgement,
    createdAt: row.createdAt.toISOString(),
  };
}

/** Readings with their judgements: a run's by its step, the rest against the machine's limits. */
async function present(db: Reader, job: JobInScope, rows: Row[]): Promise<Map<number, Reading>> {
  const byStep = await stepJudgements(db, job.businessId, rows);
  return new Map(
    rows.map((row) => {
      const judgement =
        row.checkRunId === null || row.stepKey === null
          ? judgeReading(row.quantity, row.value, job.spec)
          : (byStep.get(stepKeyOf(row.checkRunId, row.stepKey)) ?? null);
      return [row.id, toReading(row, judgement)];
    }),
  );
}

/** The bound the engine puts on any one answer, kept for loose readings too. */
const MAX_MAGNITUDE = 1_000_000;

/** A bare number is unambiguous only where its quantity has one unit (an air-fuel ratio). */
function soleUnitOf(quantity: Quantity): UnitId | undefined {
  const units = (Object.keys(UNITS) as UnitId[]).filter((u) => UNITS[u].dimension === DIMENSION_OF[quantity]);
  return units.length === 1 ? units[0] : undefined;
}

function canonicalValue(input: CreateReadingInput) {
  try {
    let converted;
    if (typeof input.value === 'number') {
      const unit = findUnit(input.unit ?? '');
      if (!unit) throw new UnitError(`unknown unit "${input.unit}"`);
      converted = readingToCanonical(input.quantity, String(input.value), unit);
    } else {
      converted = readingToCanonical(input.quantity, input.value, soleUnitOf(input.quantity));
    }
    // Temperatures go below zero; every other reading is a magnitude (as in the check engine).
    if (converted.enteredValue < 0 && input.quantity !== 'temperature')
      throw new UnitError(`a ${input.quantity} reading cannot be negative`);
    if (Math.abs(converted.enteredValue) > MAX_MAGNITUDE) throw new UnitError('the value is out of range');
    return converted;
  } catch (error) {
    if (error instanceof UnitError) throw new BadRequestError(`Invalid value: ${error.message}`);
    throw error;
  }
}

async function readingByClientId(db: Reader, businessId: number, clientId: string) {
  const [row] = await db
    .select()
    .from(t.readings)
    .where(and(eq(t.readings.businessId, businessId), eq(t.readings.clientId, clientId)));
  return row;
}

async function replayed(db: Reader, job: JobInScope, row: Row) {
  if (row.jobId !== job.id)
    throw new ConflictError(`clientId ${row.clientId} was already used for a reading on job ${row.jobId}`);
  return { reading: (await present(db, job, [row])).get(row.id)!, created: false };
}

/**
 * Records a reading in its canonical unit, keeping what was typed. A repeat of a `clientId` (an
 * offline queue sent twice) returns the reading stored the first time, whatever the body says.
 */
export async function createReading(
  db: Db,
  actor: Actor,
  jobId: number,
  input: CreateReadingInput,
  now: Date,
): Promise<{ reading: Reading; created: boolean }> {
  const job = await jobInScope(db, actor, jobId);
  if (input.clientId) {
    const existing = await readingByClientId(db, job.businessId, input.clientId);
    if (existing) return replayed(db, job, existing);
  }
  const converted = canonicalValue(input);
  const [row] = await db
    .insert(t.readings)
    .values({
      businessId: job.businessId,
      jobId: job.id,
      quantity: input.quantity,
      ...converted,
      note: input.note ?? null,
      stepKey: input.stepKey ?? null,
      takenAt: input.takenAt ? new Date(input.takenAt) : now,
      clientId: input.clientId ?? null,
      createdBy: actor.userId,
      createdAt: now,
    })
    .onConflictDoNothing({ target: [t.readings.businessId, t.readings.clientId] })
    .returning();
  if (!row) {
    // The same clientId landed from a concurrent replay between the look-up and the insert.
    return replayed(db, job, (await readingByClientId(db, job.businessId, input.clientId!))!);
  }
  return { reading: (await present(db, job, [row])).get(row.id)!, created: true };
}

export async function listReadings(
  db: Db,
  actor: Actor,
  jobId: number,
  query: ReadingListQuery,
): Promise<ListResponse<Reading>> {
  const job = await jobInScope(db, actor, jobId);
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.readings)
    .where(
      and(
        eq(t.readings.businessId, job.businessId),
        eq(t.readings.jobId, job.id),
        query.quantity ? eq(t.readings.quantity, query.quantity) : undefined,
        query.checkRunId ? eq(t.readings.checkRunId, query.checkRunId) : undefined,
        after ? lt(t.readings.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.readings.id))
    .limit(query.limit + 1);
  const readings = await present(db, job, rows);
  return toPage(rows, query.limit, (row) => readings.get(row.id)!);
}

/**
 * Deletes a loose reading. A reading taken in a check step is part of that run's record: it goes
 * only with its step (`back`), so a run's readings always match its answers.
 */
export async function deleteReading(db: Db, actor: Actor, jobId: number, readingId: number, now: Date) {
  const job = await jobInScope(db, actor, jobId);
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(t.readings)
      .where(
        and(
          eq(t.readings.businessId, job.businessId),
          eq(t.readings.jobId, job.id),
          eq(t.readings.id, readingId),
        ),
      )
      .for('update');
    const reading = found(row, 'reading');
    if (reading.checkRunId !== null) {
      throw new ConflictError(
        `Reading ${reading.id} was taken in check run ${reading.checkRunId}: it goes only with its step.`,
      );
    }
    await tx.delete(t.readings).where(eq(t.readings.id, reading.id));
    await recordAudit(tx, {
      businessId: job.businessId,
      actorId: actor.userId,
      action: 'reading.deleted',
      entityType: 'reading',
      entityId: reading.id,
      details: {
        jobId: job.id,
        quantity: reading.quantity,
        value: reading.value,
        unit: reading.unit,
        enteredValue: reading.enteredValue,
        enteredUnit: reading.enteredUnit,
        takenAt: reading.takenAt.toISOString(),
      },
      at: now,
    });
  });
}
