/**
 * The week review (PRODUCT.md, "Week review"). Every figure is an aggregate the database works out
 * (count, sum, group by); the rule behind each is written beside its query and in
 * WeekReportSchema's describe(), which the dashboard and `vanbay week` show.
 */
import { gte, lt, ne, sql, type SQL } from 'drizzle-orm';
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
import { addCalendarDays, startOfDayIn } from './invoices';
import { businessTimezone } from './business-calendar';
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

/**
 * The week's jobs, money and checks: each figure is one single-row aggregate, written below with
 * its rule, and all of them travel as one statement. PGlite answers one statement at a time and
 * each costs a round trip and a plan of its own, which for these few-row aggregates is most of
 * their cost.
 */
async function weekFigures(db: Db, actor: Actor, week: Week) {
  const [row] = await queryRows<{
    jobsDone: number;
    revenueByDay: Record<string, number> | null;
    revenueCents: number;
    hoursMilli: number;
    collectedCents: number;
    unpaidCount: number;
    unpaidCents: number;
    overdueCount: number;
    overdueCents: number;
    pass: number;
    warn: number;
    fail: number;
  }>(
    db,
    sql`with week_invoices as (${weekInvoices(week)})
        select jobs."jobsDone", revenue."revenueByDay", revenue."revenueCents", hours."hoursMilli",
               collected."collectedCents", balances."unpaidCount", balances."unpaidCents",
               balances."overdueCount", balances."overdueCents", checks.pass, checks.warn, checks.fail
        from (${jobsDone(actor, week)}) as jobs
        cross join (${revenue()}) as revenue
        cross join (${hoursBilled()}) as hours
        cross join (${collected(week)}) as collected
        cross join (${openBalances(week)}) as balances
        cross join (${checkVerdicts(week)}) as checks`,
  );
  const figures = row!;
  const byDay = figures.revenueByDay ?? {};
  return {
    jobsDone: figures.jobsDone,
    revenueCents: figures.revenueCents,
    revenueByDay: Array.from({ length: 7 }, (_, i) => {
      const date = addCalendarDays(week.start, i);
      return { date, cents: byDay[date] ?? 0 };
    }),
    hoursBilled: round(figures.hoursMilli / 1000, 3),
    collectedCents: figures.collectedCents,
    unpaid: { count: figures.unpaidCount, balanceCents: figures.unpaidCents },
    overdue: { count: figures.overdueCount, balanceCents: figures.overdueCents },
    checks: { pass: figures.pass, warn: figures.warn, fail: figures.fail },
  };
}

/** Jobs done: completedAt in the week; a job cancelled since does not count. */
function jobsDone(actor: Actor, week: Week): SQL {
  return sql`select count(*)::int as "jobsDone" from ${t.jobs}
    where ${scoped(
      actor,
      { businessId: t.jobs.businessId },
      gte(t.jobs.completedAt, week.from),
      lt(t.jobs.completedAt, week.until),
      ne(t.jobs.status, 'cancelled'),
    )}`;
}

/** The invoices revenue and hours billed read: issued in the week and not void. */
function weekInvoices(week: Week): SQL {
  return sql`select id, issued_on, total_cents from invoices
    where business_id = ${week.businessId} and status <> 'void'
      and issued_on between ${week.start}::date and ${week.end}::date`;
}

/** Revenue: totals (tax included) of the week's invoices, per issue day and for the week. */
function revenue(): SQL {
  return sql`select json_object_agg(day, cents) as "revenueByDay", coalesce(sum(cents), 0)::int as "revenueCents"
    from (
      select to_char(issued_on, 'YYYY-MM-DD') as day, sum(total_cents)::int as cents
      from week_invoices group by issued_on
    ) as days`;
}

/** Hours billed: the labour lines' quantities (thousandths of an hour) on the week's invoices. */
function hoursBilled(): SQL {
  return sql`select coalesce(sum(l.quantity_milli), 0)::int as "hoursMilli"
    from week_invoices i join invoice_lines l on l.invoice_id = i.id
    where l.kind = 'labour'`;
}

/** Collected: every payment received in the week, refunds (negative amounts) netted off. */
function collected(week: Week): SQL {
  return sql`select coalesce(sum(amount_cents), 0)::int as "collectedCents" from payments
    where business_id = ${week.businessId} and received_at >= ${week.from} and received_at < ${week.until}`;
}

/**
 * Unpaid and overdue as they stood at the week's end, not as they stand today: an invoice counts
 * if it was issued by the end day and not voided before the week ended, with its balance then
 * (total less the payments received before the week ended) above 0. Overdue: of those, due
 * before the end day (the invoice rule of InvoiceSchema, read on the end day).
 *
 * An invoice's stored balance is its total less every payment on it (payments.ts keeps it so, the
 * invoices_balance_check holds balance = total − paid, and a void keeps its balance), so its
 * balance then is its balance now plus what was paid on it since the week ended (refunds
 * negative). An invoice open then either still has a balance now (the few of the partial index
 * invoices_business_open_idx) or took a payment or refund since (the few payments after the week):
 * the two branches, by today's balance above 0 or not, never meet. Ten years of paid invoices and
 * their payments are never visited.
 */
function openBalances(week: Week): SQL {
  const stood = sql`i.status <> 'draft' and i.issued_on <= ${week.end}::date
    and (i.voided_at is null or i.voided_at >= ${week.until})`;
  return sql`select count(*) filter (where balance > 0)::int as "unpaidCount",
      coalesce(sum(balance) filter (where balance > 0), 0)::int as "unpaidCents",
      count(*) filter (where balance > 0 and due_on < ${week.end}::date)::int as "overdueCount",
      coalesce(sum(balance) filter (where balance > 0 and due_on < ${week.end}::date), 0)::int as "overdueCents"
    from (
      with since as (
        select invoice_id, sum(amount_cents) as cents from payments
        where business_id = ${week.businessId} and received_at >= ${week.until}
        group by invoice_id
      )
      select i.due_on, i.balance_cents + coalesce(since.cents, 0) as balance
      from invoices i left join since on since.invoice_id = i.id
      where i.business_id = ${week.businessId} and i.balance_cents > 0 and ${stood}
      union all
      select i.due_on, i.balance_cents + since.cents
      from since join invoices i on i.id = since.invoice_id
      where i.business_id = ${week.businessId} and i.balance_cents <= 0 and ${stood}
    ) as standing`;
}

/** Checks: guided checks finished in the week (finishedAt in it), counted per verdict. */
function checkVerdicts(week: Week): SQL {
  return sql`select count(*) filter (where verdict = 'pass')::int as pass,
      count(*) filter (where verdict = 'warn')::int as warn,
      count(*) filter (where verdict = 'fail')::int as fail
    from check_runs
    where business_id = ${week.businessId} and finished_at >= ${week.from} and finished_at < ${week.until}`;
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
 * Ten years of customers leave thousands of intervals due, and judging each on every request costs
 * more than the whole report may, so the database keeps where each interval stands as it is written
 * (service_intervals.judged_by, due_soon_on and meter_due_since: trigger service_intervals_standing,
 * migration 0006, with the evaluator's rules): the day from which its months limit makes it due, and
 * whether its machine's meter, as last read, does and since when. An interval is then due on the
 * end day when that day is on or after due_soon_on, or the week ended after the meter reading that
 * made it due; both are counted from indexes, never visiting the intervals. Where SQL's float
 * arithmetic could land on the other side of a meter limit from the evaluator's, or a stored value
 * is one the evaluator refuses, the interval is the evaluator's (judged_by 'evaluator'): SQL neither
 * counts nor ranks it, and the evaluator judges it here. The evaluator also judges every interval
 * listed; its status, dates and reason are what the report shows.
 *
 * The listing: an interval past its months limit is overdue whatever its meter says, and it ranks
 * before every interval overdue by its meter alone (their months limit's date is later, or none),
 * so while at least MACHINES_DUE_LISTED are overdue by date (years of lapsed customers make it so)
 * they are the listing, read in order from service_intervals_business_months_due_idx. Only when
 * fewer are is the rest ranked, by a second statement.
 */
async function machinesDue(db: Db, week: Week): Promise<{ listed: MachineDue[]; total: number }> {
  const business = week.businessId;
  const rows = await queryRows<Nullable<IntervalRow> & { sureCount: number; unsure: boolean | null }>(
    db,
    sql`with listed as (
          select id from service_intervals where business_id = ${business} and judged_by = 'evaluator'
          union all
          (select id from service_intervals
           where business_id = ${business} and judged_by = 'database' and months_due_on < ${week.end}::date
           order by months_due_on, machine_id, id
           limit ${MACHINES_DUE_LISTED})
        )
        select (
            (select count(*) from service_intervals
             where business_id = ${business} and due_soon_on <= ${week.end}::date)
            + (select count(*) from service_intervals
               where business_id = ${business} and meter_due_since < ${week.until}
                 and (due_soon_on > ${week.end}::date or due_soon_on is null))
          )::int as "sureCount",
          si.judged_by = 'evaluator' as unsure, ${intervalColumns(week)}
        from (select) as counts
        left join (
          listed join service_intervals si on si.id = listed.id
          join machines m on m.id = si.machine_id
          join customers c on c.id = m.customer_id
        ) on true`,
  );
  let total = rows[0]?.sureCount ?? 0;
  // With nothing listed, the one row of counts is joined to no interval.
  const seen: (IntervalRow & { unsure: boolean })[] = rows
    .filter((row): row is typeof row & IntervalRow => row.id !== null)
    .map((row) => ({ ...row, unsure: row.unsure === true }));
  // An interval of the evaluator's is not in the listing read by date: the two never meet.
  const overdueByDate = seen.filter((row) => !row.unsure).length;
  if (overdueByDate < MACHINES_DUE_LISTED) {
    const rest = await queryRows<IntervalRow>(
      db,
      sql`select ${intervalColumns(week)}
          from service_intervals si
          join machines m on m.id = si.machine_id
          join customers c on c.id = m.customer_id
          where si.business_id = ${business} and si.judged_by = 'database'
            and (si.due_soon_on <= ${week.end}::date or si.meter_due_since < ${week.until})
            and (si.months_due_on >= ${week.end}::date or si.months_due_on is null)
          order by ${urgency(week)} desc, si.months_due_on asc nulls last, si.machine_id, si.id
          limit ${MACHINES_DUE_LISTED - overdueByDate}`,
    );
    seen.push(...rest.map((row) => ({ ...row, unsure: false })));
  }
  const due: MachineDue[] = [];
  for (const row of seen) {
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

type Nullable<T> = { [K in keyof T]: T[K] | null };

/**
 * The evaluator's status of an interval `si` of machine `m` judged by the database, as URGENCY
 * ranks it, on the end day: its most urgent limit's (service-interval.ts, statusFor: past the
 * limit overdue, at it due, within 30 days or the last tenth of the interval due soon), the meter
 * read only when read before the week ended (or when is not known).
 */
function urgency(week: Week): SQL {
  const every = sql`case m.meter_unit when 'h' then si.every_hours when 'km' then si.every_km
    else si.every_km / ${KM_PER_MILE}::float8 end`;
  const left = sql`(si.last_done_meter + ${every} - m.meter_reading)`;
  return sql`greatest(
      case when si.months_due_on < ${week.end}::date then 3 when si.months_due_on = ${week.end}::date then 2
           when si.due_soon_on <= ${week.end}::date then 1 else 0 end,
      case when m.meter_read_at >= ${week.until} then 0
           when ${left} < 0 then 3 when ${left} = 0 then 2 when ${left} <= ${every} * 0.1::float8 then 1
           else 0 end
    )`;
}

/** What judge() and the listing read of an interval `si`, its machine `m` and customer `c`. */
function intervalColumns(week: Week): SQL {
  return sql`si.id, si.machine_id as "machineId", si.item, si.label, si.every_km as "everyKm",
    si.every_hours as "everyHours", si.every_months as "everyMonths",
    to_char(si.last_done_on, 'YYYY-MM-DD') as "lastDoneOn", si.last_done_meter as "lastDoneMeter",
    m.make, m.model, m.meter_unit as "meterUnit", m.meter_reading as "meterReading",
    m.meter_read_at < ${week.until} or m.meter_read_at is null as "meterKnown",
    c.id as "customerId", c.name as "customerName"`;
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
  const tz = await businessTimezone(db, actor.businessId);
  const week: Week = {
    businessId: actor.businessId,
    start: query.start,
    end: addCalendarDays(query.start, 6),
    from: startOfDayIn(tz, query.start),
    until: startOfDayIn(tz, addCalendarDays(query.start, 7)),
  };
  // One statement each on PGlite, which answers them in turn; a PostgreSQL pool runs them side by side.
  const [figures, mileage, machines] = await Promise.all([
    weekFigures(db, actor, week),
    mileageTotals(db, week.businessId, week.start, week.end),
    machinesDue(db, week),
  ]);
  return {
    start: week.start,
    end: week.end,
    timezone: tz,
    jobsDone: figures.jobsDone,
    hoursBilled: figures.hoursBilled,
    revenueCents: figures.revenueCents,
    revenueByDay: figures.revenueByDay,
    collectedCents: figures.collectedCents,
    unpaid: figures.unpaid,
    overdue: figures.overdue,
    miles: mileage.miles,
    deductionCents: mileage.deductionCents,
    checks: figures.checks,
    machinesDue: machines.listed,
    machinesDueTotal: machines.total,
  };
}
