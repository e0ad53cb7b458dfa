/**
 * The week review (PRODUCT.md, "Week review"). Every figure is an aggregate the database works out
 * (count, sum, group by); the rule behind each is written beside its query and in
 * WeekReportSchema's describe(), which the dashboard and `vanbay week` show.
 */
import { and, count, eq, gte, isNotNull, lt, ne, sql } from 'drizzle-orm';
import {
  MACHINES_DUE_LISTED,
  type MachineDue,
  type WeekReport,
  type WeekReportQuery,
} from '../../shared/api/reports';
import { evaluateServiceInterval, type IntervalStatus } from '../../shared/evaluators/service-interval';
import { convert } from '../../shared/units';
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
 *
 * Only invoices that can have been open at the week's end are looked at: an invoice's stored
 * balance is its total less every payment on it (payments.ts keeps it so, a void keeps its
 * balance), so one with a balance then either still has one now or took a payment or refund since.
 * Ten years of paid invoices are never visited. `offset 0` keeps the balance worked out once per
 * invoice, not once per aggregate that reads it.
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
          from unnest(array(
                 select id from invoices
                 where business_id = ${week.businessId} and balance_cents > 0 and issued_on <= ${week.end}::date
                 union
                 select invoice_id from payments
                 where business_id = ${week.businessId} and received_at >= ${week.until}
               )) as maybe_open(id)
          join invoices i on i.id = maybe_open.id
          where i.business_id = ${week.businessId} and i.status <> 'draft'
            and i.issued_on <= ${week.end}::date
            and (i.voided_at is null or i.voided_at >= ${week.until})
          offset 0
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

/** The evaluator's km-to-mile factor (NIST SP 811: 1 mi = 1.609 344 km exactly), for the same arithmetic in SQL. */
const KM_PER_MILE = convert(1, 'mi', 'km');

const URGENCY: Record<IntervalStatus, number> = { ok: 0, due_soon: 1, due: 2, overdue: 3 };

/**
 * Machines due: each service interval of a machine in use, judged by the shared evaluator on the
 * end day with the machine's meter as last recorded before the week ended (a reading with no date
 * is taken as it stands). An interval never done (no lastDoneOn) cannot be judged and is left out.
 * The most urgent MACHINES_DUE_LISTED are listed (status, then the months limit's date, then
 * machine and interval id) and all of them are counted.
 *
 * Ten years of customers leave thousands of intervals due, and judging each in JavaScript costs
 * more than the whole report may (about 10 µs each, and as much again to fetch the row), so the
 * counting and ranking happen in SQL with the evaluator's own rules (service-interval.ts,
 * statusFor: past the limit overdue, at it due, within 30 days or the last tenth of the interval
 * due soon; the most urgent limit decides). Where SQL's float arithmetic could land on the other
 * side of a meter limit from the evaluator's (within a millionth of it), or a stored value is one
 * the evaluator refuses, the interval is "unsure": SQL neither counts nor ranks it and the
 * evaluator judges it. The evaluator also judges every interval listed; its status, dates and
 * reason are what the report shows. `offset 0` keeps each derived value worked out once per row.
 */
async function machinesDue(db: Db, week: Week): Promise<{ listed: MachineDue[]; total: number }> {
  const rows = await queryRows<IntervalRow & { sureCount: number; unsure: boolean | null }>(
    db,
    sql`with statuses as (
          select id, machine_id, due_on,
                 greatest(
                   case when due_on < ${week.end}::date then 3 when due_on = ${week.end}::date then 2
                        -- days ≤ 30 or days ≤ interval days × 0.1, in whole numbers
                        when 10 * (due_on - ${week.end}::date) <= greatest(300, due_on - last_done_on) then 1
                        else 0 end,
                   case when meter_left < 0 then 3 when meter_left = 0 then 2
                        when meter_left <= meter_every * 0.1::float8 then 1 else 0 end,
                   0) as urgency,
                 invalid or coalesce(least(abs(meter_left), abs(meter_left - meter_every * 0.1::float8))
                                       <= meter_slack, false) as unsure
          from (
            select si.id, si.machine_id, si.last_done_on, meter.every as meter_every,
                   (si.last_done_on + si.every_months * interval '1 month')::date as due_on,
                   si.last_done_meter + meter.every - meter.now as meter_left,
                   1e-6::float8 * greatest(1, meter.now, si.last_done_meter + meter.every) as meter_slack,
                   coalesce(least(si.every_km, si.every_hours, si.every_months) <= 0
                            or least(si.last_done_meter, m.meter_reading) < 0
                            or greatest(si.every_km, si.every_hours, si.last_done_meter, m.meter_reading)
                                 >= 'Infinity', false) as invalid
            from service_intervals si
            join machines m on m.id = si.machine_id,
            lateral (
              select case when m.meter_read_at is null or m.meter_read_at < ${week.until} then m.meter_reading
                     end as now,
                     case m.meter_unit when 'h' then si.every_hours when 'km' then si.every_km
                       else si.every_km / ${KM_PER_MILE}::float8 end as every
            ) as meter
            where si.business_id = ${week.businessId} and m.business_id = ${week.businessId}
              and m.archived_at is null and si.last_done_on is not null
            offset 0
          ) as judged
          offset 0
        ), ranked as (
          select count(*) filter (where not unsure)::int as sure_count,
                 array_agg(id) filter (where unsure) as unsure_ids,
                 (array_agg(id order by urgency desc, due_on asc nulls last, machine_id, id)
                    filter (where not unsure))[1:${MACHINES_DUE_LISTED}] as top_ids
          from statuses
          where urgency > 0 or unsure
        )
        select r.sure_count as "sureCount", si.id = any(r.unsure_ids) as unsure,
               si.id, si.machine_id as "machineId", si.item, si.label, si.every_km as "everyKm",
               si.every_hours as "everyHours", si.every_months as "everyMonths",
               to_char(si.last_done_on, 'YYYY-MM-DD') as "lastDoneOn", si.last_done_meter as "lastDoneMeter",
               m.make, m.model, m.meter_unit as "meterUnit", m.meter_reading as "meterReading",
               m.meter_read_at < ${week.until} or m.meter_read_at is null as "meterKnown",
               c.id as "customerId", c.name as "customerName"
        from ranked r
        left join service_intervals si on si.id = any(r.unsure_ids || r.top_ids)
        left join machines m on m.id = si.machine_id
        left join customers c on c.id = m.customer_id`,
  );
  let total = rows[0]?.sureCount ?? 0;
  const due: MachineDue[] = [];
  for (const row of rows) {
    if (row.id === null) continue; // nothing due: the one row of counts, joined to no interval
    const judged = judge(row, week.end);
    // The evaluator has the last word on every interval it sees, counted by SQL or not.
    if (row.unsure && judged) total += 1;
    if (!row.unsure && !judged) total -= 1;
    if (judged) due.push(judged);
  }
  due.sort(
    (a, b) =>
      URGENCY[b.status] - URGENCY[a.status] ||
      (a.dueOn ?? '9999-12-31').localeCompare(b.dueOn ?? '9999-12-31') ||
      a.machineId - b.machineId ||
      a.serviceIntervalId - b.serviceIntervalId,
  );
  return { listed: due.slice(0, MACHINES_DUE_LISTED), total };
}

/** One interval as machinesDue reads it, with what the evaluator and the listing need. */
interface IntervalRow {
  id: number;
  machineId: number;
  item: MachineDue['item'];
  label: string;
  everyKm: number | null;
  everyHours: number | null;
  everyMonths: number | null;
  lastDoneOn: string;
  lastDoneMeter: number | null;
  make: string;
  model: string;
  meterUnit: MachineDue['meterUnit'];
  meterReading: number | null;
  /** Read before the week's end (or when is not known): the meter as it stood then. */
  meterKnown: boolean;
  customerId: number;
  customerName: string;
}

/** The shared evaluator's word on one interval; null when it is not due or cannot be judged. */
function judge(row: IntervalRow, today: string): MachineDue | null {
  let evaluation;
  try {
    evaluation = evaluateServiceInterval({
      everyKm: row.everyKm,
      everyHours: row.everyHours,
      everyMonths: row.everyMonths,
      lastDoneOn: row.lastDoneOn,
      lastDoneMeter: row.lastDoneMeter,
      meterUnit: row.meterUnit,
      currentMeter: row.meterKnown ? row.meterReading : null,
      today,
    });
  } catch (error) {
    // A stored value the evaluator refuses (a negative meter) cannot be judged; it must not sink the report.
    if (error instanceof RangeError) return null;
    throw error;
  }
  const { figures, reason } = evaluation;
  if (figures.status === 'ok') return null;
  return {
    machineId: row.machineId,
    machine: `${row.make} ${row.model}`,
    customerId: row.customerId,
    customerName: row.customerName,
    serviceIntervalId: row.id,
    item: row.item,
    label: row.label,
    status: figures.status,
    dueBy: figures.dueBy,
    dueOn: figures.dueOn,
    dueAtMeter: figures.dueAtMeter,
    meterUnit: row.meterUnit,
    reason,
  };
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
    machinesDue: machines.listed,
    machinesDueTotal: machines.total,
  };
}
