import { and, asc, desc, eq, ilike, inArray, isNotNull, isNull, lt, or, sql } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreateMachineInput,
  Machine,
  MachineHistory,
  MachineListQuery,
  MachineSpecKey,
  MachineSpecValue,
  UpdateMachineInput,
} from '../../shared/api/machines';
import { GENERIC_FUEL_SPEC, resolveSpec } from '../../shared/procedures/specs';
import { modelYearsFromVin } from '../../shared/vin';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, iso, scoped } from './scope';

type Row = typeof t.machines.$inferSelect;
const columns = { businessId: t.machines.businessId, customerId: t.machines.customerId };

export function toMachine(row: Row, actor: Actor): Machine {
  const resolved = resolveSpec(row);
  const spec = (key: MachineSpecKey): MachineSpecValue => ({
    value: resolved[key],
    source: resolved.sources[key],
    genericValue: GENERIC_FUEL_SPEC[key],
  });
  return {
    id: row.id,
    customerId: row.customerId,
    kind: row.kind,
    year: row.year,
    make: row.make,
    model: row.model,
    vin: row.vin,
    otherId: row.otherId,
    modelYears: row.vin ? modelYearsFromVin(row.vin) : [],
    meterUnit: row.meterUnit,
    meterReading: row.meterReading,
    meterReadAt: iso(row.meterReadAt),
    fuelPressureMinKpa: row.fuelPressureMinKpa,
    fuelPressureMaxKpa: row.fuelPressureMaxKpa,
    holdMaxDropKpa: row.holdMaxDropKpa,
    holdMinutes: row.holdMinutes,
    flowMinLph: row.flowMinLph,
    specs: {
      fuelPressureMinKpa: spec('fuelPressureMinKpa'),
      fuelPressureMaxKpa: spec('fuelPressureMaxKpa'),
      holdMaxDropKpa: spec('holdMaxDropKpa'),
      holdMinutes: spec('holdMinutes'),
      flowMinLph: spec('flowMinLph'),
    },
    specsNote: row.specsNote,
    notes: actor.role === 'customer' ? null : row.notes,
    archivedAt: iso(row.archivedAt),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

type MachineFacts = Pick<Row, 'vin' | 'year' | 'fuelPressureMinKpa' | 'fuelPressureMaxKpa'>;

/**
 * Rules across fields, checked on the record as it will be saved (a patch merged over the row):
 * the year must be one the VIN's position 10 allows (49 CFR 565.15), and the pressure band must
 * not be upside down.
 */
function checkMachineFacts(machine: MachineFacts) {
  if (machine.vin && machine.year !== null) {
    const years = modelYearsFromVin(machine.vin);
    if (years.length > 0 && !years.includes(machine.year)) {
      throw new BadRequestError(
        `Year ${machine.year} does not match the VIN, whose model year code stands for ${years.join(' or ')}`,
      );
    }
  }
  const min = machine.fuelPressureMinKpa;
  const max = machine.fuelPressureMaxKpa;
  if (min !== null && max !== null && min > max) {
    throw new BadRequestError('fuelPressureMinKpa is above fuelPressureMaxKpa: the band is upside down');
  }
}

/** Null for what was not given, so the merged record can be checked before it is written. */
const orNull = <T>(value: T | null | undefined): T | null => value ?? null;

export async function listMachines(
  db: Db,
  actor: Actor,
  query: MachineListQuery,
): Promise<ListResponse<Machine>> {
  const after = decodeCursor(query.cursor);
  const pattern = query.q ? `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null;
  const rows = await db
    .select()
    .from(t.machines)
    .where(
      scoped(
        actor,
        columns,
        query.archived === 'true' ? undefined : isNull(t.machines.archivedAt),
        query.customerId ? eq(t.machines.customerId, query.customerId) : undefined,
        after ? lt(t.machines.id, after) : undefined,
        pattern
          ? or(
              ilike(t.machines.make, pattern),
              ilike(t.machines.model, pattern),
              ilike(t.machines.vin, pattern),
              ilike(t.machines.otherId, pattern),
            )
          : undefined,
      ),
    )
    .orderBy(desc(t.machines.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, (row) => toMachine(row, actor));
}

async function loadMachine(db: Db, actor: Actor, id: number): Promise<Row> {
  const [row] = await db
    .select()
    .from(t.machines)
    .where(scoped(actor, columns, eq(t.machines.id, id)));
  return found(row, 'machine');
}

export async function getMachine(db: Db, actor: Actor, id: number): Promise<Machine> {
  return toMachine(await loadMachine(db, actor, id), actor);
}

export async function createMachine(db: Db, actor: Actor, input: CreateMachineInput, now: Date) {
  const [customer] = await db
    .select({ id: t.customers.id, archivedAt: t.customers.archivedAt })
    .from(t.customers)
    .where(and(eq(t.customers.id, input.customerId), eq(t.customers.businessId, actor.businessId)));
  if (!customer) throw new BadRequestError('No such customer');
  if (customer.archivedAt) throw new BadRequestError('That customer is archived');
  const values = {
    ...input,
    year: orNull(input.year),
    vin: orNull(input.vin),
    fuelPressureMinKpa: orNull(input.fuelPressureMinKpa),
    fuelPressureMaxKpa: orNull(input.fuelPressureMaxKpa),
  };
  checkMachineFacts(values);
  const [row] = await db
    .insert(t.machines)
    .values({
      ...values,
      businessId: actor.businessId,
      meterReadAt: input.meterReading != null ? now : null,
      createdAt: now,
      updatedAt: now,
    })
    .returning();
  return toMachine(row!, actor);
}

export async function updateMachine(
  db: Db,
  actor: Actor,
  id: number,
  input: UpdateMachineInput,
  now: Date,
): Promise<Machine> {
  return db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(t.machines)
      .where(scoped(actor, columns, eq(t.machines.id, id)))
      .for('update');
    const machine = found(current, 'machine');
    checkMachineFacts({
      vin: input.vin !== undefined ? input.vin : machine.vin,
      year: input.year !== undefined ? input.year : machine.year,
      fuelPressureMinKpa:
        input.fuelPressureMinKpa !== undefined ? input.fuelPressureMinKpa : machine.fuelPressureMinKpa,
      fuelPressureMaxKpa:
        input.fuelPressureMaxKpa !== undefined ? input.fuelPressureMaxKpa : machine.fuelPressureMaxKpa,
    });
    if (input.meterUnit !== undefined && input.meterUnit !== machine.meterUnit) {
      await refuseMeterUnitChange(tx, machine);
    }
    const meterChanged = input.meterReading !== undefined && input.meterReading !== machine.meterReading;
    const [row] = await tx
      .update(t.machines)
      .set({ ...input, ...(meterChanged ? { meterReadAt: now } : {}), updatedAt: now })
      .where(eq(t.machines.id, id))
      .returning();
    return toMachine(row!, actor);
  });
}

/**
 * Job meter readings and service intervals' last-done meters are kept in the machine's unit;
 * changing it under them would silently turn 300 h into 300 mi. Before any are recorded it is a
 * correction and allowed.
 */
async function refuseMeterUnitChange(db: Pick<Db, 'select'>, machine: Row) {
  const [jobReading] = await db
    .select({ id: t.jobs.id })
    .from(t.jobs)
    .where(and(eq(t.jobs.machineId, machine.id), isNotNull(t.jobs.meterReading)))
    .limit(1);
  const [intervalReading] = jobReading
    ? [jobReading]
    : await db
        .select({ id: t.serviceIntervals.id })
        .from(t.serviceIntervals)
        .where(and(eq(t.serviceIntervals.machineId, machine.id), isNotNull(t.serviceIntervals.lastDoneMeter)))
        .limit(1);
  if (intervalReading) {
    throw new ConflictError(
      `Meter readings in ${machine.meterUnit} are already recorded for this machine; its meter unit cannot change`,
    );
  }
}

/** Archived, not deleted: the machine's jobs and history must outlive it. */
export async function archiveMachine(db: Db, actor: Actor, id: number, now: Date) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(t.machines)
      .set({ archivedAt: now, updatedAt: now })
      .where(scoped(actor, columns, eq(t.machines.id, id), isNull(t.machines.archivedAt)))
      .returning({ id: t.machines.id, customerId: t.machines.customerId });
    const archived = found(row, 'machine');
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'machine.archived',
      entityType: 'machine',
      entityId: id,
      details: { customerId: archived.customerId },
      at: now,
    });
  });
}

/**
 * The machine's whole service record, newest job first, in three queries however long it is:
 * the machine (scope), its jobs, and every check run of those jobs at once.
 */
export async function machineHistory(db: Db, actor: Actor, id: number): Promise<MachineHistory> {
  const machine = await loadMachine(db, actor, id);
  const jobs = await db
    .select()
    .from(t.jobs)
    .where(
      scoped(
        actor,
        { businessId: t.jobs.businessId, customerId: t.jobs.customerId },
        eq(t.jobs.machineId, id),
      ),
    )
    .orderBy(desc(sql`coalesce(${t.jobs.scheduledAt}, ${t.jobs.createdAt})`), desc(t.jobs.id));
  const runs =
    jobs.length === 0
      ? []
      : await db
          .select({
            id: t.checkRuns.id,
            jobId: t.checkRuns.jobId,
            procedureKey: t.checkRuns.procedureKey,
            status: t.checkRuns.status,
            verdict: t.checkRuns.verdict,
            startedAt: t.checkRuns.startedAt,
            finishedAt: t.checkRuns.finishedAt,
          })
          .from(t.checkRuns)
          .where(
            and(
              eq(t.checkRuns.businessId, actor.businessId),
              inArray(
                t.checkRuns.jobId,
                jobs.map((job) => job.id),
              ),
            ),
          )
          .orderBy(asc(t.checkRuns.startedAt), asc(t.checkRuns.id));
  const runsByJob = new Map<number, typeof runs>();
  for (const run of runs) runsByJob.set(run.jobId, [...(runsByJob.get(run.jobId) ?? []), run]);
  return {
    machineId: machine.id,
    meterUnit: machine.meterUnit,
    jobs: jobs.map((job) => ({
      id: job.id,
      status: job.status,
      complaint: job.complaint,
      diagnosis: job.diagnosis,
      workDone: job.workDone,
      scheduledAt: iso(job.scheduledAt),
      completedAt: iso(job.completedAt),
      meterReading: job.meterReading,
      checks: (runsByJob.get(job.id) ?? []).map((run) => ({
        id: run.id,
        procedureKey: run.procedureKey,
        status: run.status,
        verdict: run.verdict,
        startedAt: run.startedAt.toISOString(),
        finishedAt: iso(run.finishedAt),
      })),
    })),
  };
}
