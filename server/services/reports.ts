/**
 * The week review (PRODUCT.md, "Week review"). Every figure is an aggregate the database works out
 * (count, sum, group by); the rule behind each is written beside its query and in
 * WeekReportSchema's describe(), which the dashboard and `vanbay week` show.
 */
import { and, count, eq, gte, isNotNull, isNull, lt, ne, sql } from 'drizzle-orm';
import type { MachineDue, WeekReport, WeekReportQuery } from '../../shared/api/reports';
import { evaluateServiceInterval, type IntervalStatus } from '../../shared/evaluators/service-interval';
import { round } from '../../shared/evaluators/types';
import type { Actor } from '../auth/actor';
import { queryRows, type Db } from '../db/client';
import * as t from '../db/schema';
import { addCalendarDays, loadBusiness, startOfDayIn } from './invoices';
import { scoped } from './scope';
import { mileageTotals } from './trips';

interface Week {
  businessId: number;
  /** First and last calendar day, both included. */
  start: string;
  end: string;
  /** 00:00 on `start` and 00:00 the day after `end`, in the business's time zone. */
  from: Date;
  until: Date;
}

/** Jobs done: completedAt in the week; a job cancelled since does not count. */
async function jobsDone(db: Db, actor: Actor, week: Week): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(t.jobs)
    .where(
      scoped(
        actor,
        { businessId: t.jobs.businessId },
        gte(t.jobs.completedAt, week.from),
        lt(t.jobs.completedAt, week.until),
        ne(t.jobs.status, 'cancelled'),
      ),
    );
  return row?.n ?? 0;
}

/**
 * Revenue: totals (tax included) of invoices issued in the week that are not void, per issue day
 * and for the week (ROLLUP's row with a null day).
 */
async function revenue(db: Db, week: Week) {
  const rows = await queryRows<{ day: string | null; cents: number }>(
    db,
    sql`select to_char(${t.invoices.issuedOn}, 'YYYY-MM-DD') as day, sum(${t.invoices.totalCents})::int as cents
        from ${t.invoices}
        where ${t.invoices.businessId} = ${week.businessId} and ${t.invoices.status} <> 'void'
          and ${t.invoices.issuedOn} between ${week.start}::date and ${week.end}::date
        group by rollup (${t.invoices.issuedOn})`,
  );
  const byDay = new Map(rows.filter((row) => row.day !== null).map((row) => [row.day, row.cents]));
  return {
    revenueCents: rows.find((row) => row.day === null)?.cents ?? 0,
    revenueByDay: Array.from({ length: 7 }, (_, i) => {
      const date = addCalendarDays(week.start, i);
      return { date, cents: byDay.get(date) ?? 0 };
    }),
  };
}

/** Hours billed: the labour lines' quantities (thousandths of an hour) on the week's non-void invoices. */
async function hoursBilled(db: Db, week: Week): Promise<number> {
  const [row] = await db
    .select({ milli: sql<number>`coalesce(sum(${t.invoiceLines.quantityMilli}), 0)::int`.mapWith(Number) })
    .from(t.invoiceLines)
    .innerJoin(t.invoices, eq(t.invoices.id, t.invoiceLines.invoiceId))
    .where(
      and(
        eq(t.invoices.businessId, week.businessId),
        ne(t.invoices.status, 'void'),
        sql`${t.invoices.issuedOn} between ${week.start}::date and ${week.end}::date`,
        eq(t.invoiceLines.kind, 'labour'),
      ),
    );
  return round((row?.milli ?? 0) / 1000, 3);
}

/** Collected: every payment received in the week, refunds (negative amounts) netted off. */
async function collected(db: Db, week: Week): Promise<number> {
  const [row] = await db
    .select({ cents: sql<number>`coalesce(sum(${t.payments.amountCents}), 0)::int`.mapWith(Number) })
    .from(t.payments)
    .where(
      and(
        eq(t.payments.businessId, week.businessId),
        gte(t.payments.receivedAt, week.from),
        lt(t.payments.receivedAt, week.until),
      ),
    );
  return row?.cents ?? 0;
}

/**
 * Unpaid and overdue as they stood at the week's end, not as they stand today: an invoice counts
 * if it was issued by the end day and not voided before the week ended, with its balance then
 * (total less the payments received before the week ended) above 0. Overdue: of those, due
 * before the end day (the invoice rule of InvoiceSchema, read on the end day).
 */
async function openBalances(db: Db, week: Week) {
  const [row] = await queryRows<{
    unpaidCount: number;
    unpaidCents: number;
    overdueCount: number;
    overdueCents: number;
  }>(
    db,
    sql`select count(*) filter (where balance > 0)::int as "unpaidCount",
               coalesce(sum(balance) filter (where balance > 0), 0)::int as "unpaidCents",
               count(*) filter (where balance > 0 and due_on < ${week.end}::date)::int as "overdueCount",
               coalesce(sum(balance) filter (where balance > 0 and due_on < ${week.end}::date), 0)::int
                 as "overdueCents"
        from (
          select i.due_on,
                 i.total_cents - coalesce((
                   select sum(p.amount_cents) from payments p
                   where p.invoice_id = i.id and p.received_at < ${week.until}
                 ), 0) as balance
          from invoices i
          where i.business_id = ${week.businessId} and i.status <> 'draft'
            and i.issued_on <= ${week.end}::date
            and (i.voided_at is null or i.voided_at >= ${week.until})
        ) as standing`,
  );
  return {
    unpaid: { count: row?.unpaidCount ?? 0, balanceCents: row?.unpaidCents ?? 0 },
    overdue: { count: row?.overdueCount ?? 0, balanceCents: row?.overdueCents ?? 0 },
  };
}

/** Checks: guided checks finished in the week (finishedAt in it), counted per verdict. */
async function checkVerdicts(db: Db, week: Week) {
  const rows = await db
    .select({ verdict: t.checkRuns.verdict, n: count() })
    .from(t.checkRuns)
    .where(
      and(
        eq(t.checkRuns.businessId, week.businessId),
        gte(t.checkRuns.finishedAt, week.from),
        lt(t.checkRuns.finishedAt, week.until),
        isNotNull(t.checkRuns.verdict),
      ),
    )
    .groupBy(t.checkRuns.verdict);
  const counts = { pass: 0, warn: 0, fail: 0 };
  for (const row of rows) if (row.verdict) counts[row.verdict] = row.n;
  return counts;
}

const URGENCY: Record<IntervalStatus, number> = { ok: 0, due_soon: 1, due: 2, overdue: 3 };

/**
 * Machines due: each service interval of a machine in use, judged by the shared evaluator on the
 * end day with the machine's meter as last recorded before the week ended (a reading with no date
 * is taken as it stands). An interval never done (no lastDoneOn) cannot be judged and is left out.
 */
async function machinesDue(db: Db, week: Week): Promise<MachineDue[]> {
  const rows = await db
    .select({
      interval: t.serviceIntervals,
      make: t.machines.make,
      model: t.machines.model,
      meterUnit: t.machines.meterUnit,
      meterReading: t.machines.meterReading,
      meterReadAt: t.machines.meterReadAt,
      customerId: t.customers.id,
      customerName: t.customers.name,
    })
    .from(t.serviceIntervals)
    .innerJoin(t.machines, eq(t.machines.id, t.serviceIntervals.machineId))
    .innerJoin(t.customers, eq(t.customers.id, t.machines.customerId))
    .where(and(eq(t.serviceIntervals.businessId, week.businessId), isNull(t.machines.archivedAt)));
  const due: MachineDue[] = [];
  for (const row of rows) {
    const { interval } = row;
    if (interval.lastDoneOn === null) continue;
    const meterKnown = row.meterReadAt === null || row.meterReadAt < week.until;
    const { figures, reason } = evaluateServiceInterval({
      everyKm: interval.everyKm,
      everyHours: interval.everyHours,
      everyMonths: interval.everyMonths,
      lastDoneOn: interval.lastDoneOn,
      lastDoneMeter: interval.lastDoneMeter,
      meterUnit: row.meterUnit,
      currentMeter: meterKnown ? row.meterReading : null,
      today: week.end,
    });
    if (figures.status === 'ok') continue;
    due.push({
      machineId: interval.machineId,
      machine: `${row.make} ${row.model}`,
      customerId: row.customerId,
      customerName: row.customerName,
      serviceIntervalId: interval.id,
      item: interval.item,
      label: interval.label,
      status: figures.status,
      dueBy: figures.dueBy,
      dueOn: figures.dueOn,
      dueAtMeter: figures.dueAtMeter,
      meterUnit: row.meterUnit,
      reason,
    });
  }
  return due.sort(
    (a, b) =>
      URGENCY[b.status] - URGENCY[a.status] ||
      (a.dueOn ?? '9999-12-31').localeCompare(b.dueOn ?? '9999-12-31') ||
      a.machine.localeCompare(b.machine) ||
      a.serviceIntervalId - b.serviceIntervalId,
  );
}

export async function weekReport(db: Db, actor: Actor, query: WeekReportQuery): Promise<WeekReport> {
  const business = await loadBusiness(db, actor.businessId);
  const tz = business.timezone;
  const week: Week = {
    businessId: business.id,
    start: query.start,
    end: addCalendarDays(query.start, 6),
    from: startOfDayIn(tz, query.start),
    until: startOfDayIn(tz, addCalendarDays(query.start, 7)),
  };
  const [done, money, hours, collectedCents, balances, mileage, checks, machines] = await Promise.all([
    jobsDone(db, actor, week),
    revenue(db, week),
    hoursBilled(db, week),
    collected(db, week),
    openBalances(db, week),
    mileageTotals(db, week.businessId, week.start, week.end),
    checkVerdicts(db, week),
    machinesDue(db, week),
  ]);
  return {
    start: week.start,
    end: week.end,
    timezone: tz,
    jobsDone: done,
    hoursBilled: hours,
    ...money,
    collectedCents,
    ...balances,
    miles: mileage.miles,
    deductionCents: mileage.deductionCents,
    checks,
    machinesDue: machines,
  };
}
