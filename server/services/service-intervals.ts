import { and, desc, eq, inArray, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import type {
  CreateServiceIntervalInput,
  IntervalState,
  ServiceInterval,
  ServiceIntervalListQuery,
  UpdateServiceIntervalInput,
} from '../../shared/api/service-intervals';
import { evaluateServiceInterval } from '../../shared/evaluators/service-interval';
import { clean } from '../../shared/evaluators/types';
import { convert } from '../../shared/units';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { businessToday } from './business-calendar';
import { found, scoped } from './scope';

type Reader = Pick<Db, 'select'>;
type IntervalRow = typeof t.serviceIntervals.$inferSelect;
/** What judging an interval needs to know about its machine. */
export interface MeterOf {
  meterUnit: 'mi' | 'km' | 'h';
  meterReading: number | null;
}

const machineColumns = { businessId: t.machines.businessId, customerId: t.machines.customerId };

function cannotJudge(asOf: string, reason: string): IntervalState {
  return {
    asOf,
    status: 'ok',
    verdict: 'warn',
    reason,
    dueBy: null,
    dueOn: null,
    dueAtMeter: null,
    remainingDays: null,
    remainingMeter: null,
  };
}

/** Where an interval stands on `asOf`: the evaluator decides; this only feeds it the stored row. */
export function judgeInterval(row: IntervalRow, machine: MeterOf, asOf: string): IntervalState {
  // Rows written by this API always have a last-done date; older rows may not.
  if (row.lastDoneOn === null) return cannotJudge(asOf, 'Cannot judge: record when this was last done');
  try {
    const { verdict, reason, figures } = evaluateServiceInterval({
      everyKm: row.everyKm,
      everyHours: row.everyHours,
      everyMonths: row.everyMonths,
      lastDoneOn: row.lastDoneOn,
      lastDoneMeter: row.lastDoneMeter,
      meterUnit: machine.meterUnit,
      currentMeter: machine.meterReading,
      today: asOf,
    });
    return { asOf, verdict, reason, ...figures };
  } catch (error) {
    // The evaluator refuses impossible stored values (a negative meter); one bad row must not sink a list.
    if (error instanceof RangeError) return cannotJudge(asOf, `Cannot judge: ${error.message}`);
    throw error;
  }
}

export function toServiceInterval(row: IntervalRow, machine: MeterOf, asOf: string): ServiceInterval {
  return {
    id: row.id,
    machineId: row.machineId,
    item: row.item,
    label: row.label,
    everyKm: row.everyKm,
    everyHours: row.everyHours,
    everyMonths: row.everyMonths,
    lastDoneOn: row.lastDoneOn,
    lastDoneMeter: row.lastDoneMeter,
    meterUnit: machine.meterUnit,
    source: row.source,
    state: judgeInterval(row, machine, asOf),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

async function loadMachine(db: Reader, actor: Actor, machineId: number) {
  const [machine] = await db
    .select({
      id: t.machines.id,
      meterUnit: t.machines.meterUnit,
      meterReading: t.machines.meterReading,
    })
    .from(t.machines)
    .where(scoped(actor, machineColumns, eq(t.machines.id, machineId)));
  return found(machine, 'machine');
}

/** Miles are stored as kilometres (1 mi = 1.609 344 km exactly, shared/units.ts). */
function kmFrom(everyKm: number | null | undefined, everyMiles: number | null | undefined) {
  if (everyMiles === undefined) return everyKm;
  return everyMiles === null ? null : clean(convert(everyMiles, 'mi', 'km'));
}

function notAfterToday(lastDoneOn: string | undefined, today: string) {
  // ISO calendar dates compare correctly as strings.
  if (lastDoneOn !== undefined && lastDoneOn > today) {
    throw new BadRequestError(`Invalid body: lastDoneOn: ${lastDoneOn} is after today (${today})`, [
      { path: 'lastDoneOn', message: 'must not be in the future' },
    ]);
  }
}

export async function listServiceIntervals(
  db: Db,
  actor: Actor,
  machineId: number,
  query: ServiceIntervalListQuery,
  now: Date,
): Promise<ListResponse<ServiceInterval>> {
  const machine = await loadMachine(db, actor, machineId);
  const today = await businessToday(db, actor.businessId, now);
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.serviceIntervals)
    .where(
      and(
        eq(t.serviceIntervals.businessId, actor.businessId),
        eq(t.serviceIntervals.machineId, machine.id),
        after ? lt(t.serviceIntervals.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.serviceIntervals.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, (row) => toServiceInterval(row, machine, today));
}

export async function createServiceInterval(
  db: Db,
  actor: Actor,
  machineId: number,
  input: CreateServiceIntervalInput,
  now: Date,
): Promise<ServiceInterval> {
  const machine = await loadMachine(db, actor, machineId);
  const today = await businessToday(db, actor.businessId, now);
  notAfterToday(input.lastDoneOn, today);
  const [row] = await db
    .insert(t.serviceIntervals)
    .values({
      businessId: actor.businessId,
      machineId: machine.id,
      item: input.item,
      label: input.label,
      everyKm: kmFrom(input.everyKm, input.everyMiles) ?? null,
      everyHours: input.everyHours ?? null,
      everyMonths: input.everyMonths ?? null,
      lastDoneOn: input.lastDoneOn,
      lastDoneMeter: input.lastDoneMeter ?? null,
      source: input.source ?? 'generic',
      createdAt: now,
      updatedAt: now,
    })
    .returning();
  return toServiceInterval(row!, machine, today);
}

export async function updateServiceInterval(
  db: Db,
  actor: Actor,
  machineId: number,
  intervalId: number,
  input: UpdateServiceIntervalInput,
  now: Date,
): Promise<ServiceInterval> {
  const machine = await loadMachine(db, actor, machineId);
  const today = await businessToday(db, actor.businessId, now);
  notAfterToday(input.lastDoneOn, today);
  const { everyMiles, everyKm, ...rest } = input;
  return db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(t.serviceIntervals)
      .where(intervalOf(actor, machine.id, intervalId))
      .for('update');
    const row = found(current, 'service interval');
    const next = {
      ...rest,
      everyKm: kmFrom(everyKm, everyMiles),
    };
    const limits = {
      everyKm: next.everyKm === undefined ? row.everyKm : next.everyKm,
      everyHours: next.everyHours === undefined ? row.everyHours : next.everyHours,
      everyMonths: next.everyMonths === undefined ? row.everyMonths : next.everyMonths,
    };
    if (limits.everyKm === null && limits.everyHours === null && limits.everyMonths === null) {
      throw new BadRequestError('Invalid body: an interval keeps at least one limit', [
        {
          path: 'everyMonths',
          message: 'Set at least one limit: everyKm, everyMiles, everyHours or everyMonths',
        },
      ]);
    }
    const [updated] = await tx
      .update(t.serviceIntervals)
      .set({ ...next, updatedAt: now })
      .where(eq(t.serviceIntervals.id, row.id))
      .returning();
    // Done again, later than it last was: the round its open reminder was about is over, so the
    // reminder closes as done (as marking the reminder done records the service). Only a later
    // date: a correction of the old one leaves the round as it was.
    if (input.lastDoneOn !== undefined && (row.lastDoneOn === null || input.lastDoneOn > row.lastDoneOn)) {
      const closed = await tx
        .update(t.reminders)
        .set({ status: 'done' })
        .where(
          and(
            eq(t.reminders.businessId, actor.businessId),
            eq(t.reminders.serviceIntervalId, row.id),
            inArray(t.reminders.status, ['pending', 'sent']),
          ),
        )
        .returning({ id: t.reminders.id });
      await recordAudit(tx, {
        businessId: actor.businessId,
        actorId: actor.userId,
        action: 'service_interval.done',
        entityType: 'service_interval',
        entityId: row.id,
        details: {
          machineId: machine.id,
          lastDoneOn: input.lastDoneOn,
          lastDoneMeter: updated!.lastDoneMeter,
          remindersClosed: closed.map((r) => r.id),
        },
        at: now,
      });
    }
    return toServiceInterval(updated!, machine, today);
  });
}

export async function deleteServiceInterval(
  db: Db,
  actor: Actor,
  machineId: number,
  intervalId: number,
  now: Date,
): Promise<void> {
  const machine = await loadMachine(db, actor, machineId);
  await db.transaction(async (tx) => {
    const [row] = await tx
      .delete(t.serviceIntervals)
      .where(intervalOf(actor, machine.id, intervalId))
      .returning();
    const deleted = found(row, 'service interval');
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'service_interval.deleted',
      entityType: 'service_interval',
      entityId: deleted.id,
      details: { machineId: deleted.machineId, item: deleted.item, label: deleted.label },
      at: now,
    });
  });
}

function intervalOf(actor: Actor, machineId: number, intervalId: number) {
  return and(
    eq(t.serviceIntervals.businessId, actor.businessId),
    eq(t.serviceIntervals.machineId, machineId),
    eq(t.serviceIntervals.id, intervalId),
  );
}
