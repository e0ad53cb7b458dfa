import { and, desc, eq, inArray, isNull, lt } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import {
  DUE_STATUSES,
  OPEN_REMINDER_STATUSES,
  type CreateReminderInput,
  type DueItem,
  type DueListQuery,
  type Reminder,
  type ReminderStatus,
  type UpdateReminderInput,
} from '../../shared/api/reminders';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { ConflictError } from '../errors';
import { decodeCursor, encodeCursor } from '../http/pagination';
import { found, iso, scoped } from './scope';
import { businessTimezone, dayIn } from './business-calendar';
import { judgeInterval } from './service-intervals';

type ReminderRow = typeof t.reminders.$inferSelect;
/** Intervals are judged in memory (the status is computed), so the due list reads them in batches. */
const BATCH = 200;

const isOpen = (status: ReminderStatus) => (OPEN_REMINDER_STATUSES as readonly string[]).includes(status);

function toReminder(row: ReminderRow): Reminder {
  return {
    id: row.id,
    serviceIntervalId: row.serviceIntervalId,
    machineId: row.machineId,
    customerId: row.customerId,
    dueOn: row.dueOn,
    status: row.status,
    sentAt: iso(row.sentAt),
    createdAt: row.createdAt.toISOString(),
  };
}

/** Every interval of the business with its machine and customer, newest interval first. */
function intervalsWithOwners(db: Db, actor: Actor, before: number | null) {
  return db
    .select({ interval: t.serviceIntervals, machine: t.machines, customer: t.customers })
    .from(t.serviceIntervals)
    .innerJoin(t.machines, eq(t.machines.id, t.serviceIntervals.machineId))
    .innerJoin(t.customers, eq(t.customers.id, t.machines.customerId))
    .where(
      scoped(
        actor,
        { businessId: t.serviceIntervals.businessId, customerId: t.machines.customerId },
        // Archived machines and customers are not reminded of anything.
        isNull(t.machines.archivedAt),
        isNull(t.customers.archivedAt),
        before ? lt(t.serviceIntervals.id, before) : undefined,
      ),
    )
    .orderBy(desc(t.serviceIntervals.id))
    .limit(BATCH);
}

type IntervalWithOwners = Awaited<ReturnType<typeof intervalsWithOwners>>[number];

/**
 * The reminder that belongs to the interval's current round: an open one, else the newest written
 * on or after the day the service was last done (older ones were for a round already closed).
 */
function currentReminder(
  reminders: readonly ReminderRow[],
  lastDoneOn: string | null,
  timezone: string,
): ReminderRow | undefined {
  return (
    reminders.find((r) => isOpen(r.status)) ??
    reminders.find((r) => lastDoneOn === null || dayIn(timezone, r.createdAt) >= lastDoneOn)
  );
}

/** The due list: intervals judged on `on` (default today), filtered by status, with their reminders. */
export async function listDue(
  db: Db,
  actor: Actor,
  query: DueListQuery,
  now: Date,
): Promise<ListResponse<DueItem>> {
  const timezone = await businessTimezone(db, actor.businessId);
  const asOf = query.on ?? dayIn(timezone, now);
  const wanted = new Set<string>(query.status ?? DUE_STATUSES);
  const matches: { row: IntervalWithOwners; state: ReturnType<typeof judgeInterval> }[] = [];
  let before = decodeCursor(query.cursor);
  for (;;) {
    const batch = await intervalsWithOwners(db, actor, before);
    for (const row of batch) {
      const state = judgeInterval(row.interval, row.machine, asOf);
      if (wanted.has(state.status)) matches.push({ row, state });
    }
    if (matches.length > query.limit || batch.length < BATCH) break;
    before = batch.at(-1)!.interval.id;
  }
  const page = matches.slice(0, query.limit);
  const ids = page.map(({ row }) => row.interval.id);
  const reminders =
    ids.length === 0
      ? []
      : await db
          .select()
          .from(t.reminders)
          .where(
            and(eq(t.reminders.businessId, actor.businessId), inArray(t.reminders.serviceIntervalId, ids)),
          )
          .orderBy(desc(t.reminders.id));
  const items = page.map(({ row, state }): DueItem => {
    const { interval, machine, customer } = row;
    const reminder = currentReminder(
      reminders.filter((r) => r.serviceIntervalId === interval.id),
      interval.lastDoneOn,
      timezone,
    );
    return {
      serviceIntervalId: interval.id,
      asOf,
      machine: { id: machine.id, make: machine.make, model: machine.model, meterUnit: machine.meterUnit },
      customer: { id: customer.id, name: customer.name, email: customer.email },
      item: interval.item,
      label: interval.label,
      status: state.status,
      verdict: state.verdict,
      reason: state.reason,
      dueBy: state.dueBy,
      dueOn: state.dueOn,
      dueAtMeter: state.dueAtMeter,
      remaining: { days: state.remainingDays, meter: state.remainingMeter },
      reminder: reminder ? { id: reminder.id, status: reminder.status, sentAt: iso(reminder.sentAt) } : null,
    };
  });
  const last = page.at(-1);
  return {
    items,
    nextCursor: matches.length > query.limit && last ? encodeCursor(last.row.interval.id) : null,
  };
}

/** A pending reminder for an interval; its due date is the interval's, or today when due by the meter. */
export async function createReminder(
  db: Db,
  actor: Actor,
  input: CreateReminderInput,
  now: Date,
): Promise<Reminder> {
  const timezone = await businessTimezone(db, actor.businessId);
  const today = dayIn(timezone, now);
  return db.transaction(async (tx) => {
    // The row lock makes "one open reminder per interval" hold when two requests race.
    const [target] = await tx
      .select({ interval: t.serviceIntervals, machine: t.machines })
      .from(t.serviceIntervals)
      .innerJoin(t.machines, eq(t.machines.id, t.serviceIntervals.machineId))
      .where(
        and(
          eq(t.serviceIntervals.businessId, actor.businessId),
          eq(t.serviceIntervals.id, input.serviceIntervalId),
        ),
      )
      .for('update', { of: t.serviceIntervals });
    const { interval, machine } = found(target, 'service interval');
    const [open] = await tx
      .select({ id: t.reminders.id, status: t.reminders.status })
      .from(t.reminders)
      .where(
        and(
          eq(t.reminders.serviceIntervalId, interval.id),
          inArray(t.reminders.status, [...OPEN_REMINDER_STATUSES]),
        ),
      );
    if (open) {
      throw new ConflictError(`This interval already has an open reminder (${open.status})`, {
        reminderId: open.id,
      });
    }
    const state = judgeInterval(interval, machine, today);
    const [row] = await tx
      .insert(t.reminders)
      .values({
        businessId: actor.businessId,
        serviceIntervalId: interval.id,
        machineId: machine.id,
        customerId: machine.customerId,
        dueOn: state.dueOn ?? today,
        status: 'pending',
        createdAt: now,
      })
      .returning();
    return toReminder(row!);
  });
}

/** Closes an open reminder; `done` records the service as done today at the machine's current meter. */
export async function updateReminder(
  db: Db,
  actor: Actor,
  id: number,
  input: UpdateReminderInput,
  now: Date,
): Promise<Reminder> {
  const timezone = await businessTimezone(db, actor.businessId);
  const today = dayIn(timezone, now);
  return db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(t.reminders)
      .where(and(eq(t.reminders.businessId, actor.businessId), eq(t.reminders.id, id)))
      .for('update');
    const reminder = found(current, 'reminder');
    if (!isOpen(reminder.status)) {
      throw new ConflictError(`This reminder is already ${reminder.status}`, { status: reminder.status });
    }
    const [row] = await tx
      .update(t.reminders)
      .set({ status: input.status })
      .where(eq(t.reminders.id, reminder.id))
      .returning();
    if (input.status === 'done') {
      const [machine] = await tx
        .select({ meterReading: t.machines.meterReading })
        .from(t.machines)
        .where(eq(t.machines.id, reminder.machineId));
      const [interval] = await tx
        .select({ lastDoneMeter: t.serviceIntervals.lastDoneMeter })
        .from(t.serviceIntervals)
        .where(eq(t.serviceIntervals.id, reminder.serviceIntervalId));
      await tx
        .update(t.serviceIntervals)
        .set({
          lastDoneOn: today,
          // Without a current reading the old one stays: the distance limit then comes due early, never late.
          lastDoneMeter: machine?.meterReading ?? interval?.lastDoneMeter ?? null,
          updatedAt: now,
        })
        .where(eq(t.serviceIntervals.id, reminder.serviceIntervalId));
    }
    return toReminder(row!);
  });
}
