import Decimal from 'decimal.js';
import { eq, isNull, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { addCalendarDays, startOfDayIn } from '../../server/services/invoices';
import { MACHINES_DUE_LISTED, WeekReportSchema, type WeekReport } from '../../shared/api/reports';
import { evaluateServiceInterval } from '../../shared/evaluators/service-interval';
import { as, seededApi, type TestApi } from '../helpers/api';
import { freshInvoice } from './access/money';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const db = () => api.database.db;
const TZ = 'America/Denver';

async function week(start: string, caller: 'owner' | 'bookkeeper' = 'owner'): Promise<WeekReport> {
  const response = await request(api.app)
    .get('/api/reports/week')
    .query({ start })
    .set(as(api, caller))
    .expect(200);
  return WeekReportSchema.parse(response.body);
}
async function one<T>(query: ReturnType<typeof sql>): Promise<T> {
  const rows = await queryRows<T>(db(), query);
  return rows[0]!;
}

describe('the week report on the seeded week of 2026-11-09', () => {
  let report: WeekReport;
  beforeAll(async () => {
    report = await week('2026-11-09', 'bookkeeper');
  });

  it('spans seven days on the business calendar', () => {
    expect(report).toMatchObject({ start: '2026-11-09', end: '2026-11-15', timezone: TZ });
    expect(report.revenueByDay.map((d) => d.date)).toEqual([
      '2026-11-09',
      '2026-11-10',
      '2026-11-11',
      '2026-11-12',
      '2026-11-13',
      '2026-11-14',
      '2026-11-15',
    ]);
  });

  it('counts the jobs done, matching a hand count and an independent query', async () => {
    // Hand count from the seed's plan: one job a day Monday to Saturday, two on 11-10 and 11-14
    // (days 8 and 4 before "today", every fourth day has two); all of them finished: 8.
    expect(report.jobsDone).toBe(8);
    const check = await one<{ n: number }>(
      sql`select count(*)::int as n from jobs where status <> 'cancelled'
          and (completed_at at time zone ${TZ})::date between '2026-11-09' and '2026-11-15'`,
    );
    expect(report.jobsDone).toBe(check.n);
  });

  it('adds up revenue per day from the invoices issued that week', async () => {
    // Hand sums of the seeded invoices 34–39 (their totals as the seed issued them):
    // 11-10: 37 973; 11-11: 39 352 + 22 045 = 61 397; 11-12: 21 336; 11-13: 11 375; 11-14: 15 064.
    expect(report.revenueByDay.map((d) => d.cents)).toEqual([0, 37_973, 61_397, 21_336, 11_375, 15_064, 0]);
    // 37 973 + 61 397 + 21 336 + 11 375 + 15 064 = 147 145.
    expect(report.revenueCents).toBe(147_145);
    const check = await one<{ cents: number }>(
      sql`select sum(total_cents)::int as cents from invoices
          where status <> 'void' and issued_on >= '2026-11-09' and issued_on < '2026-11-16'`,
    );
    expect(report.revenueCents).toBe(check.cents);
  });

  it('adds up the labour hours on those invoices', async () => {
    const check = await one<{ milli: number }>(
      sql`select sum(l.quantity_milli)::int as milli from invoice_lines l join invoices i on i.id = l.invoice_id
          where l.kind = 'labour' and i.status <> 'void' and i.issued_on between '2026-11-09' and '2026-11-15'`,
    );
    expect(check.milli).toBeGreaterThan(0);
    expect(report.hoursBilled).toBe(new Decimal(check.milli).div(1000).toNumber());
  });

  it('adds up the money collected that week', async () => {
    // Hand count: the seed pays an invoice 3 days after issue at 11:00; invoices 30 (11-06),
    // 31 and 32 (11-07) and 33 (11-08) were paid 11-09 to 11-11:
    // 18 325 + 20 286 + 15 436 + 24 505 = 78 552.
    expect(report.collectedCents).toBe(78_552);
    const check = await one<{ cents: number }>(
      sql`select sum(amount_cents)::int as cents from payments
          where (received_at at time zone ${TZ})::date between '2026-11-09' and '2026-11-15'`,
    );
    expect(report.collectedCents).toBe(check.cents);
  });

  it('states unpaid and overdue as they stood at the week’s end', () => {
    // Hand count: open at the end of 11-15 are the seed's unpaid 3 (17 959) and part-paid 5
    // (5 875 left), and 34–39 issued that week: 37 973 + 39 352 + 22 045 + 21 336 + 11 375 +
    // 15 064; in all 8 invoices, 170 979 ¢. Overdue (due before 11-15): only 3 and 5, 23 834 ¢.
    expect(report.unpaid).toEqual({ count: 8, balanceCents: 170_979 });
    expect(report.overdue).toEqual({ count: 2, balanceCents: 23_834 });
  });

  it('adds up the week’s miles at the 2026 rate', async () => {
    const check = await one<{ distance: string }>(
      sql`select sum(end_odometer::numeric - start_odometer::numeric)::text as distance from trips
          where odometer_unit = 'mi' and end_odometer is not null
          and trip_date between '2026-11-09' and '2026-11-15'`,
    );
    expect(report.miles).toBe(Number(check.distance));
    // IRS Notice 2026-10: 72.5 ¢/mi, rounded half up to the cent (decimal.js).
    expect(report.deductionCents).toBe(
      new Decimal(check.distance).times('72.5').toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber(),
    );
  });

  it('counts the checks finished that week by verdict', async () => {
    const rows = await queryRows<{ verdict: 'pass' | 'warn' | 'fail'; n: number }>(
      db(),
      sql`select verdict, count(*)::int as n from check_runs
          where verdict is not null and (finished_at at time zone ${TZ})::date between '2026-11-09' and '2026-11-15'
          group by verdict`,
    );
    const expected = { pass: 0, warn: 0, fail: 0 };
    for (const row of rows) expected[row.verdict] = row.n;
    expect(report.checks).toEqual(expected);
    expect(report.checks.pass + report.checks.warn + report.checks.fail).toBeGreaterThan(0);
  });

  it('lists the machines coming due, most urgent first', async () => {
    const statuses = report.machinesDue.map((m) => m.status);
    const rank = { due_soon: 1, due: 2, overdue: 3 } as const;
    expect([...statuses].sort((a, b) => rank[b] - rank[a])).toEqual(statuses);
    // The demo seed has fewer than the 20 a report lists: every one is listed and counted.
    expect(report.machinesDue.length).toBeLessThan(MACHINES_DUE_LISTED);
    expect(report.machinesDueTotal).toBe(report.machinesDue.length);
    // Hand arithmetic from the seed: the Quillback 650's fuel filter was last done 2025-10-10,
    // every 12 months → due 2026-10-10, so overdue on 2026-11-15.
    expect(report.machinesDue).toContainEqual(
      expect.objectContaining({
        machine: 'Kestrel Quillback 650',
        customerName: 'Jules Marchetti',
        item: 'fuel_filter',
        status: 'overdue',
        dueBy: 'months',
        dueOn: '2026-10-10',
      }),
    );
    // Independent query of the months rule (whichever limit comes first decides, so a months
    // limit already passed makes the interval overdue; within 30 days makes it at least due soon).
    const byMonths = await queryRows<{ id: number; overdue: boolean }>(
      db(),
      sql`select id, (last_done_on + every_months * interval '1 month')::date < '2026-11-15' as overdue
          from service_intervals
          where every_months is not null
            and (last_done_on + every_months * interval '1 month')::date <= date '2026-11-15' + 30`,
    );
    expect(byMonths.length).toBeGreaterThan(0);
    for (const interval of byMonths) {
      const item = report.machinesDue.find((m) => m.serviceIntervalId === interval.id);
      expect(item, `interval ${interval.id}`).toBeDefined();
      if (interval.overdue) expect(item!.status).toBe('overdue');
    }
  });
});

describe('the week report as things change', () => {
  it('keeps a past week’s unpaid as it was, and matches today’s open balances for this week', async () => {
    const seeded = await one<{ id: number; balance: number }>(
      sql`select id, balance_cents as balance from invoices where number = 34`,
    );
    await request(api.app)
      .post(`/api/invoices/${seeded.id}/payments`)
      .set(as(api, 'owner'))
      .send({ method: 'card', amountCents: seeded.balance })
      .expect(201);
    // Paid on 2026-11-18: the week that ended on 11-15 still shows it unpaid.
    expect((await week('2026-11-09')).unpaid).toEqual({ count: 8, balanceCents: 170_979 });
    const thisWeek = await week('2026-11-16');
    const open = await one<{ count: number; cents: number }>(
      sql`select count(*)::int as count, sum(balance_cents)::int as cents from invoices
          where status <> 'void' and balance_cents > 0`,
    );
    expect(thisWeek.unpaid).toEqual({ count: open.count, balanceCents: open.cents });
    // This week's collections include the payment just made (2026-11-18 in Denver).
    expect(thisWeek.collectedCents).toBeGreaterThanOrEqual(seeded.balance);
  });

  it('keeps a past week’s unpaid as it was when an invoice is voided or refunded after the week', async () => {
    // Two changes made today (2026-11-18) to invoices of the week of 11-09: one issued that week and
    // still unpaid is voided (a void keeps its balance, so it stays open to that week), and one paid
    // in full that week is partly refunded (open again today, but paid at that week's end).
    const unpaidThen = await one<{ id: number }>(
      sql`select id from invoices where status = 'issued' and paid_cents = 0 and number <> 34
          and issued_on between '2026-11-09' and '2026-11-15' order by number limit 1`,
    );
    const paidInWeek = await one<{ id: number }>(
      sql`select i.id from invoices i join payments p on p.invoice_id = i.id
          where i.status = 'paid' and (p.received_at at time zone ${TZ})::date between '2026-11-09' and '2026-11-15'
          order by i.number limit 1`,
    );
    await request(api.app)
      .patch(`/api/invoices/${unpaidThen.id}`)
      .set(as(api, 'owner'))
      .send({ status: 'void' })
      .expect(200);
    await request(api.app)
      .post(`/api/invoices/${paidInWeek.id}/payments`)
      .set(as(api, 'owner'))
      .send({ method: 'card', amountCents: -5_000 })
      .expect(201);
    // Still the hand count of the seeded week above: 8 invoices, 170 979 ¢.
    expect((await week('2026-11-09')).unpaid).toEqual({ count: 8, balanceCents: 170_979 });
    // This week ends after both: the void is gone, the refunded balance is open, as today.
    const open = await one<{ count: number; cents: number }>(
      sql`select count(*)::int as count, sum(balance_cents)::int as cents from invoices
          where status <> 'void' and balance_cents > 0`,
    );
    expect((await week('2026-11-16')).unpaid).toEqual({ count: open.count, balanceCents: open.cents });
  });

  it('leaves void invoices out of revenue and nets refunds out of collections', async () => {
    const before = await week('2026-11-16');
    const kept = await freshInvoice(api);
    const voided = await freshInvoice(api);
    const during = await week('2026-11-16');
    // Hand arithmetic: two default test invoices of 39 352 ¢ each, issued 2026-11-18.
    expect(during.revenueCents - before.revenueCents).toBe(2 * 39_352);
    expect(during.revenueByDay.find((d) => d.date === '2026-11-18')!.cents).toBeGreaterThanOrEqual(
      2 * 39_352,
    );
    await request(api.app)
      .patch(`/api/invoices/${voided.id}`)
      .set(as(api, 'owner'))
      .send({ status: 'void' })
      .expect(200);
    const after = await week('2026-11-16');
    expect(after.revenueCents - before.revenueCents).toBe(39_352);
    expect(after.unpaid.count - before.unpaid.count).toBe(1);

    for (const amountCents of [10_000, -2_500]) {
      await request(api.app)
        .post(`/api/invoices/${kept.id}/payments`)
        .set(as(api, 'owner'))
        .send({ method: 'card', amountCents })
        .expect(201);
    }
    // Hand arithmetic: 10 000 in, 2 500 back out: 7 500 ¢ collected.
    expect((await week('2026-11-16')).collectedCents - after.collectedCents).toBe(7_500);
  });

  it('reads the days in the business time zone across the end of daylight saving time', () => {
    // 15 U.S.C. §260a: DST ends on the first Sunday of November (2026-11-01). Denver is UTC−6
    // (MDT) at the start of that day and UTC−7 (MST) from the next.
    expect(startOfDayIn(TZ, '2026-11-01').toISOString()).toBe('2026-11-01T06:00:00.000Z');
    expect(startOfDayIn(TZ, '2026-11-02').toISOString()).toBe('2026-11-02T07:00:00.000Z');
  });

  it('refuses a missing or bad start with 400, and the roles the policy leaves out with 403', async () => {
    for (const query of [{}, { start: '2026-11-9' }, { start: '2026-02-30' }, { start: 'monday' }]) {
      const response = await request(api.app)
        .get('/api/reports/week')
        .query(query)
        .set(as(api, 'owner'))
        .expect(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    await request(api.app).get('/api/reports/week?start=2026-11-09').set(as(api, 'helper')).expect(403);
    await request(api.app).get('/api/reports/week?start=2026-11-09').set(as(api, 'customer')).expect(403);
  });
});

describe('the machines coming due at scale and at their limits', () => {
  type Interval = typeof t.serviceIntervals.$inferInsert;
  type Machine = typeof t.machines.$inferInsert;

  /**
   * Every interval judged one by one by the shared evaluator (the authority the report's SQL
   * mirrors, itself checked against its published rules in tests/shared), for the week ending
   * `end`: machines in use, the meter as read before the week's end, refused values left out;
   * then ordered as WeekReportSchema says.
   */
  async function judgedByEvaluator(end: string, until: Date) {
    const rows = await db()
      .select({ interval: t.serviceIntervals, machine: t.machines })
      .from(t.serviceIntervals)
      .innerJoin(t.machines, eq(t.machines.id, t.serviceIntervals.machineId))
      .where(isNull(t.machines.archivedAt));
    const rank = { ok: 0, due_soon: 1, due: 2, overdue: 3 } as const;
    const due = [];
    for (const { interval, machine } of rows) {
      if (interval.lastDoneOn === null) continue;
      let status;
      let dueOn;
      try {
        ({ status, dueOn } = evaluateServiceInterval({
          ...interval,
          lastDoneOn: interval.lastDoneOn,
          meterUnit: machine.meterUnit,
          currentMeter:
            machine.meterReadAt === null || machine.meterReadAt < until ? machine.meterReading : null,
          today: end,
        }).figures);
      } catch (error) {
        if (error instanceof RangeError) continue;
        throw error;
      }
      if (status !== 'ok') due.push({ id: interval.id, machineId: machine.id, status, dueOn });
    }
    return due.sort(
      (a, b) =>
        rank[b.status] - rank[a.status] ||
        (a.dueOn ?? '9999-12-31').localeCompare(b.dueOn ?? '9999-12-31') ||
        a.machineId - b.machineId ||
        a.id - b.id,
    );
  }

  beforeAll(async () => {
    const [customer] = await db().select().from(t.customers).limit(1);
    const businessId = customer!.businessId;
    const machine = async (values: Partial<Machine>) => {
      const [row] = await db()
        .insert(t.machines)
        .values({
          businessId,
          customerId: customer!.id,
          kind: 'atv',
          make: 'Tamarack',
          model: 'Test 450',
          meterUnit: 'mi',
          ...values,
        })
        .returning();
      return row!.id;
    };
    const interval = (machineId: number, values: Partial<Interval>): Interval => ({
      businessId,
      machineId,
      item: 'fuel_filter',
      label: 'Fuel filter',
      ...values,
    });
    const byDate = await machine({ model: 'Dates 450' });
    const byMiles = await machine({ model: 'Miles 450', meterReading: 1100.1 });
    const byHours = await machine({ model: 'Hours 450', meterUnit: 'h', meterReading: 140.3 });
    // Typed readings whose binary sums miss the decimal one: 100.7 + 100.1 − 190.79 is
    // 10.010000000000019 in IEEE 754 doubles, 250.7 + 100.1 − 350.8 is −5.7e−14 (checked with
    // Node's own arithmetic); the evaluator strips that noise (clean(), 12 significant digits).
    const tenthLeft = await machine({ model: 'Tenth 450', meterUnit: 'h', meterReading: 190.79 });
    const reached = await machine({ model: 'Reached 450', meterUnit: 'h', meterReading: 350.8 });
    const readLater = await machine({
      model: 'Read later 450',
      meterReading: 90_000,
      // Read on 2026-11-18, after the week of 11-09 ended: that week cannot know it.
      meterReadAt: new Date('2026-11-18T16:00:00Z'),
    });
    const archived = await machine({ model: 'Sold 450', archivedAt: new Date('2026-06-01T00:00:00Z') });
    const broken = await machine({ model: 'Broken 450', meterReading: -5 });
    await db()
      .insert(t.serviceIntervals)
      .values([
        // 25 long overdue, a day apart: more than the 20 a report lists.
        ...Array.from({ length: 25 }, (_, i) =>
          interval(byDate, { everyMonths: 12, lastDoneOn: `2019-03-${String(i + 1).padStart(2, '0')}` }),
        ),
        // Calendar-month arithmetic at its edges (date-fns addMonths and PostgreSQL's month
        // interval both keep the day, or take the month's last day when it has none):
        interval(byDate, { everyMonths: 1, lastDoneOn: '2026-10-15' }), // due 11-15: due that week
        interval(byDate, { everyMonths: 6, lastDoneOn: '2026-05-31' }), // due 11-30 (no 31st)
        interval(byDate, { everyMonths: 1, lastDoneOn: '2026-10-30' }), // due 11-30
        interval(byDate, { everyMonths: 3, lastDoneOn: '2026-09-15' }), // due 12-15: 30 days off
        interval(byDate, { everyMonths: 3, lastDoneOn: '2026-09-16' }), // due 12-16: 31 days off
        // 12 months (365 days): due soon 36.5 days off, so on day 36 and not day 37.
        interval(byDate, { everyMonths: 12, lastDoneOn: '2025-12-21' }), // due 2026-12-21: 36 days
        interval(byDate, { everyMonths: 12, lastDoneOn: '2025-12-22' }), // due 2026-12-22: 37 days
        // 1 000 mi (1 609.344 km) from 100.1 mi: exactly reached at 1 100.1 mi, float noise aside.
        interval(byMiles, { everyKm: 1609.344, lastDoneOn: '2026-01-10', lastDoneMeter: 100.1 }),
        // 100 h from 50.3 h, at 140.3 h: exactly the last tenth left, so due soon.
        interval(byHours, { everyHours: 100, lastDoneOn: '2026-01-10', lastDoneMeter: 50.3 }),
        // 100 h from 50.2 h, at 140.3 h: 9.9 h left, due soon; from 30.3 h, 10 h past: overdue.
        interval(byHours, { everyHours: 100, lastDoneOn: '2026-01-10', lastDoneMeter: 50.2 }),
        interval(byHours, { everyHours: 100, lastDoneOn: '2026-01-10', lastDoneMeter: 30.3 }),
        interval(tenthLeft, { everyHours: 100.1, lastDoneOn: '2026-01-10', lastDoneMeter: 100.7 }),
        interval(reached, { everyHours: 100.1, lastDoneOn: '2026-01-10', lastDoneMeter: 250.7 }),
        interval(readLater, { everyKm: 10_000, lastDoneOn: '2026-06-01', lastDoneMeter: 100 }),
        interval(archived, { everyMonths: 12, lastDoneOn: '2019-01-01' }),
        // A negative meter the evaluator refuses: not judged, not counted.
        interval(broken, { everyKm: 5_000, lastDoneOn: '2026-06-01', lastDoneMeter: 0 }),
        interval(byDate, { everyMonths: 12, lastDoneOn: null }),
      ]);
  });

  // In the week of 2020-03-09 only 14 of the 25 are overdue by date, so the listing's rest is ranked
  // from the others (due that day, due soon, and those the meter alone makes overdue).
  for (const start of ['2020-03-09', '2026-11-09', '2026-11-16', '2026-11-24']) {
    it(`lists the 20 the evaluator ranks first and counts all it finds due, week of ${start}`, async () => {
      const report = await week(start);
      const until = startOfDayIn(TZ, addCalendarDays(start, 7));
      const expected = await judgedByEvaluator(report.end, until);
      expect(expected.length).toBeGreaterThan(MACHINES_DUE_LISTED);
      expect(report.machinesDueTotal).toBe(expected.length);
      expect(report.machinesDue.map((m) => m.serviceIntervalId)).toEqual(
        expected.slice(0, MACHINES_DUE_LISTED).map((m) => m.id),
      );
      expect(report.machinesDue.map((m) => m.status)).toEqual(
        expected.slice(0, MACHINES_DUE_LISTED).map((m) => m.status),
      );
    });
  }

  it('judges the edge cases as their limits say', async () => {
    // Read from the whole due list the evaluator makes for the week ending 2026-11-15 (hand
    // arithmetic beside each interval above).
    const statusOf = async (end: string, where: ReturnType<typeof sql>) => {
      const [row] = await queryRows<{ id: number }>(
        db(),
        sql`select id from service_intervals where ${where}`,
      );
      const until = startOfDayIn(TZ, addCalendarDays(end, 1));
      return (await judgedByEvaluator(end, until)).find((m) => m.id === row!.id)?.status ?? 'ok';
    };
    const end = '2026-11-15';
    expect(await statusOf(end, sql`every_months = 1 and last_done_on = '2026-10-15'`)).toBe('due');
    expect(await statusOf(end, sql`every_months = 3 and last_done_on = '2026-09-15'`)).toBe('due_soon');
    expect(await statusOf(end, sql`every_months = 3 and last_done_on = '2026-09-16'`)).toBe('ok');
    expect(await statusOf(end, sql`every_months = 12 and last_done_on = '2025-12-21'`)).toBe('due_soon');
    expect(await statusOf(end, sql`every_months = 12 and last_done_on = '2025-12-22'`)).toBe('ok');
    expect(await statusOf(end, sql`every_km = 1609.344 and last_done_meter = 100.1`)).toBe('due');
    expect(await statusOf(end, sql`every_hours = 100 and last_done_meter = 50.3`)).toBe('due_soon');
    expect(await statusOf(end, sql`every_hours = 100 and last_done_meter = 30.3`)).toBe('overdue');
    // 10.01 h left of 100.1 h is the last tenth exactly: due soon; 0 h left is due, not overdue.
    expect(await statusOf(end, sql`every_hours = 100.1 and last_done_meter = 100.7`)).toBe('due_soon');
    expect(await statusOf(end, sql`every_hours = 100.1 and last_done_meter = 250.7`)).toBe('due');
    expect(await statusOf('2026-11-30', sql`every_months = 6 and last_done_on = '2026-05-31'`)).toBe('due');
    expect(await statusOf('2026-11-30', sql`every_months = 1 and last_done_on = '2026-10-30'`)).toBe('due');
    // The meter read after the week of 11-09 is not that week's: by its km limit alone it cannot be
    // judged then; the next week knows it (90 000 mi, due at 100 + 6 213.7 mi): overdue.
    const readLater = sql`last_done_meter = 100 and every_km = 10000`;
    expect(await statusOf('2026-11-15', readLater)).toBe('ok');
    expect(await statusOf('2026-11-22', readLater)).toBe('overdue');
    // An archived machine's interval is never listed; a refused value is not judged.
    expect(await statusOf(end, sql`last_done_on = '2019-01-01'`)).toBe('ok');
    expect(await statusOf(end, sql`every_km = 5000 and last_done_meter = 0`)).toBe('ok');
  });

  it('follows a machine’s meter, its archiving and an interval’s edits as they are made', async () => {
    // The database keeps where each interval stands as it is written (migration 0006); each change
    // below goes through the API, and after each the report must agree with the evaluator's own
    // count made afresh, and move by the hand count beside it.
    const weeks = ['2026-11-09', '2026-11-16'] as const;
    const totals = async () => {
      const out: number[] = [];
      for (const start of weeks) {
        const report = await week(start);
        const expected = await judgedByEvaluator(report.end, startOfDayIn(TZ, addCalendarDays(start, 7)));
        expect(report.machinesDueTotal).toBe(expected.length);
        out.push(report.machinesDueTotal);
      }
      return out;
    };
    const [lastWeek, thisWeek] = await totals();
    const owner = as(api, 'owner');
    const [customer] = await db().select().from(t.customers).limit(1);
    const machine = await request(api.app)
      .post('/api/machines')
      .set(owner)
      .send({
        customerId: customer!.id,
        kind: 'atv',
        make: 'Tamarack',
        model: 'Meter 450',
        meterUnit: 'h',
        meterReading: 10,
      })
      .expect(201);
    const machineId = (machine.body as { id: number }).id;
    const intervalPath = `/api/machines/${machineId}/intervals`;
    // 100 h or 24 months from 0 h on 2026-06-01: at 10 h, 90 h and a year and a half to go.
    const interval = await request(api.app)
      .post(intervalPath)
      .set(owner)
      .send({
        item: 'fuel_filter',
        label: 'Fuel filter',
        everyHours: 100,
        everyMonths: 24,
        lastDoneOn: '2026-06-01',
        lastDoneMeter: 0,
      })
      .expect(201);
    const intervalId = (interval.body as { id: number }).id;
    expect(await totals()).toEqual([lastWeek, thisWeek]);
    // Read at 95 h today (2026-11-18): 5 h left, the last tenth, due soon; the week of 11-09 had
    // ended before the reading and cannot know it.
    await request(api.app)
      .patch(`/api/machines/${machineId}`)
      .set(owner)
      .send({ meterReading: 95 })
      .expect(200);
    expect(await totals()).toEqual([lastWeek, thisWeek! + 1]);
    // A job at 130 h raises the meter: 30 h over, overdue, still one interval due.
    await request(api.app)
      .post('/api/jobs')
      .set(owner)
      .send({ customerId: customer!.id, machineId, complaint: 'Hard start when warm', meterReading: 130 })
      .expect(201);
    expect(await totals()).toEqual([lastWeek, thisWeek! + 1]);
    // Done today at 130 h: 100 h to go again, not due in either week.
    await request(api.app)
      .patch(`${intervalPath}/${intervalId}`)
      .set(owner)
      .send({ lastDoneOn: '2026-11-18', lastDoneMeter: 130 })
      .expect(200);
    expect(await totals()).toEqual([lastWeek, thisWeek]);
    await request(api.app)
      .patch(`${intervalPath}/${intervalId}`)
      .set(owner)
      .send({ lastDoneOn: '2026-06-01', lastDoneMeter: 0 })
      .expect(200);
    expect(await totals()).toEqual([lastWeek, thisWeek! + 1]);
    // Archived: its intervals are no longer judged.
    await request(api.app).delete(`/api/machines/${machineId}`).set(owner).expect(204);
    expect(await totals()).toEqual([lastWeek, thisWeek]);
  });
});
