import { eq, sql, type SQL } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyPassword } from '../../server/auth/password';
import { queryRows, type Database } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed';
import { DEMO_PASSWORD } from '../../server/db/seed-data';
import * as t from '../../server/db/schema';
import { JOB_STATUSES } from '../../shared/api/jobs';
import { walkRun } from '../../shared/procedures/engine';
import type { MachineSpec } from '../../shared/procedures/specs';
import { findProcedure, PROCEDURES } from '../../shared/procedures/index';
import { isValidVin } from '../../shared/vin';
import { cloneDatabase } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';

const TABLES = [
  'businesses',
  'users',
  'customers',
  'machines',
  'jobs',
  'job_events',
  'check_runs',
  'check_steps',
  'readings',
  'line_items',
  'estimates',
  'invoice_counters',
  'invoices',
  'invoice_lines',
  'payments',
  'trips',
  'service_intervals',
  'reminders',
  'outbox',
  'audit_events',
  'attachments',
];

/** Every row of every table, in a stable order, as JSON text per table. */
async function snapshot(database: Database) {
  const parts: Record<string, string> = {};
  for (const table of TABLES) {
    parts[table] = JSON.stringify(
      await queryRows(database.db, sql.raw(`select * from ${table} order by 1, 2`)),
    );
  }
  return parts;
}

async function differingTables(a: Database, b: Database) {
  const [left, right] = await Promise.all([snapshot(a), snapshot(b)]);
  return TABLES.filter((table) => left[table] !== right[table]);
}

const rows = <T>(database: Database, query: SQL) => queryRows<T>(database.db, query);

describe('demo seed', () => {
  let first: Database;
  let second: Database;
  beforeAll(async () => {
    [first, second] = await Promise.all([cloneDatabase('empty'), cloneDatabase('empty')]);
    await seedDemo(first.db, { today: SEED_TODAY });
  });
  afterAll(async () => {
    await Promise.all([first.close(), second.close()]);
  });

  it('is deterministic: the same day gives the same rows, byte for byte', async () => {
    await seedDemo(second.db, { today: SEED_TODAY });
    expect(await differingTables(first, second)).toEqual([]);
  });

  it('is idempotent: a second run adds nothing', async () => {
    const before = await snapshot(first);
    const result = await seedDemo(first.db, { today: SEED_TODAY });
    expect(result.seeded).toBe(false);
    expect(await snapshot(first)).toEqual(before);
  });

  it('has the four demo sign-ins of CONTRACT.md with the demo password', async () => {
    const users = await first.db.select().from(t.users).orderBy(t.users.id);
    expect(users.map((u) => [u.role, u.email])).toEqual([
      ['owner', 'owner@ridgeback.test'],
      ['helper', 'helper@ridgeback.test'],
      ['bookkeeper', 'books@ridgeback.test'],
      ['customer', 'jules@example.test'],
    ]);
    for (const user of users) expect(await verifyPassword(DEMO_PASSWORD, user.passwordHash)).toBe(true);
    expect(await verifyPassword('wrong-password', users[0]!.passwordHash)).toBe(false);
    const customer = users[3]!;
    const [linked] = await first.db
      .select()
      .from(t.customers)
      .where(sql`${t.customers.id} = ${customer.customerId}`);
    expect(linked?.email).toBe('jules@example.test');
  });

  it('has at least 8 customers and 12 machines of several kinds, VINs valid where given', async () => {
    const customers = await first.db.select().from(t.customers);
    const machines = await first.db.select().from(t.machines);
    expect(customers.length).toBeGreaterThanOrEqual(8);
    expect(machines.length).toBeGreaterThanOrEqual(12);
    expect(new Set(machines.map((m) => m.kind)).size).toBeGreaterThanOrEqual(5);
    const vins = machines.flatMap((m) => (m.vin ? [m.vin] : []));
    expect(vins.length).toBeGreaterThanOrEqual(8);
    expect(vins.filter((vin) => !isValidVin(vin))).toEqual([]);
  });

  it('spans six weeks of jobs ending at today, in every status', async () => {
    const jobs = await first.db.select().from(t.jobs);
    expect(new Set(jobs.map((j) => j.status))).toEqual(new Set(JOB_STATUSES));
    const times = jobs.map((j) => j.scheduledAt!.getTime());
    const spanDays = (SEED_TODAY.getTime() - Math.min(...times)) / 86_400_000;
    expect(spanDays).toBeGreaterThanOrEqual(35);
    expect(spanDays).toBeLessThanOrEqual(43);
    // Booked jobs lie ahead; billed ones lie behind.
    for (const job of jobs) {
      if (job.status === 'booked') expect(job.scheduledAt!.getTime()).toBeGreaterThan(SEED_TODAY.getTime());
      if (job.status === 'paid') expect(job.completedAt!.getTime()).toBeLessThan(SEED_TODAY.getTime());
    }
  });

  it("books jobs in working hours on the business's own clock, Monday to Saturday", async () => {
    const hours = await rows<{ hour: number; dow: number }>(
      first,
      sql`
      select extract(hour from j.scheduled_at at time zone b.timezone)::int as hour,
             extract(dow from j.scheduled_at at time zone b.timezone)::int as dow
      from jobs j join businesses b on b.id = j.business_id`,
    );
    expect(hours.filter(({ hour }) => hour < 8 || hour > 17)).toEqual([]);
    expect(hours.filter(({ dow }) => dow === 0)).toEqual([]);
  });

  it('includes a failing pressure hold and a clogged-filter case among the check runs', async () => {
    const failedHolds = await rows<{ job_id: number; points: number }>(
      first,
      sql`
      select r.job_id, count(rd.id)::int as points
      from check_steps s join check_runs r on r.id = s.check_run_id
      left join readings rd on rd.check_run_id = r.id and rd.step_key = s.step_key
      where s.step_key = 'static-pressure-hold' and s.verdict = 'fail'
      group by r.job_id`,
    );
    expect(failedHolds.length).toBeGreaterThanOrEqual(1);
    expect(failedHolds[0]!.points).toBeGreaterThanOrEqual(5); // a pressure-over-time series

    const cloggedFilter = await rows<{ job_id: number }>(
      first,
      sql`
      select r.job_id from check_runs r
      join check_steps run on run.check_run_id = r.id and run.step_key = 'running-pressure' and run.verdict = 'fail'
      join check_steps flow on flow.check_run_id = r.id and flow.step_key = 'flow-volume' and flow.verdict = 'fail'
      join line_items li on li.job_id = r.job_id and li.description ilike '%filter%'`,
    );
    expect(cloggedFilter.length).toBeGreaterThanOrEqual(1);
  });

  it('records the caution acknowledged on every hazardous step it seeds', async () => {
    // The steps whose procedure data carries a caution (PRODUCT.md, "Safety").
    const hazardous = Object.values(PROCEDURES).flatMap((p) =>
      Object.values(p.steps as Record<string, { key: string; caution?: string }>).flatMap((s) =>
        s.caution ? [s.key] : [],
      ),
    );
    const seeded = await rows<{ step_key: string; acknowledged: boolean }>(
      first,
      sql`select distinct step_key, caution_acknowledged_at is not null as acknowledged from check_steps`,
    );
    const unacknowledged = seeded.filter((s) => hazardous.includes(s.step_key) && !s.acknowledged);
    expect(unacknowledged).toEqual([]);
    expect(seeded.filter((s) => hazardous.includes(s.step_key)).length).toBeGreaterThan(4);
    const flowSteps = await rows<{ n: number }>(
      first,
      sql`select count(*)::int as n from check_steps where step_key = 'flow-volume'`,
    );
    expect(flowSteps[0]!.n).toBeGreaterThan(0);
  });

  it('stores pressure readings in kPa and keeps what the mechanic typed', async () => {
    const [reading] = await rows<{
      value: number;
      unit: string;
      entered_value: number;
      entered_unit: string;
    }>(
      first,
      sql`select value, unit, entered_value, entered_unit from readings where quantity = 'pressure' limit 1`,
    );
    expect(reading!.unit).toBe('kPa');
    expect(reading!.entered_unit).toBe('psi');
    // NIST SP 811 B.8: 1 psi = 6.894 757 kPa.
    expect(reading!.value / reading!.entered_value).toBeCloseTo(6.894757, 6);
  });

  it('has paid, unpaid and overdue invoices with gapless numbers and consistent totals', async () => {
    const invoices = await first.db.select().from(t.invoices).orderBy(t.invoices.number);
    expect(invoices.map((i) => i.number)).toEqual(invoices.map((_, n) => n + 1));
    const today = SEED_TODAY.toISOString().slice(0, 10);
    expect(invoices.some((i) => i.status === 'paid' && i.balanceCents === 0)).toBe(true);
    expect(invoices.some((i) => i.balanceCents > 0 && i.dueOn >= today)).toBe(true);
    expect(invoices.some((i) => i.balanceCents > 0 && i.dueOn < today)).toBe(true);
    expect(invoices.some((i) => i.status === 'part_paid')).toBe(true);
    const lineSums = await rows<{ invoice_id: number; sum: number }>(
      first,
      sql`select invoice_id, sum(line_total_cents)::int as sum from invoice_lines group by invoice_id`,
    );
    const byId = new Map(lineSums.map((r) => [r.invoice_id, r.sum]));
    for (const invoice of invoices) expect(byId.get(invoice.id)).toBe(invoice.subtotalCents);
    const paymentSums = await rows<{ invoice_id: number; sum: number }>(
      first,
      sql`select invoice_id, sum(amount_cents)::int as sum from payments group by invoice_id`,
    );
    for (const { invoice_id, sum } of paymentSums) {
      expect(invoices.find((i) => i.id === invoice_id)!.paidCents).toBe(sum);
    }
  });

  it('logs a trip for every day a job was worked, with odometers that only go up', async () => {
    const missing = await rows<{ day: string }>(
      first,
      sql`
      select distinct (j.scheduled_at at time zone b.timezone)::date::text as day
      from jobs j join businesses b on b.id = j.business_id
      where j.status not in ('booked', 'cancelled')
      except select trip_date::text from trips`,
    );
    expect(missing).toEqual([]);
    const trips = await first.db.select().from(t.trips).orderBy(t.trips.startedAt);
    for (const [i, trip] of trips.entries()) {
      expect(trip.endOdometer!).toBeGreaterThan(trip.startOdometer);
      if (i > 0) expect(trip.startOdometer).toBeGreaterThanOrEqual(trips[i - 1]!.endOdometer!);
    }
  });

  it("stores every check as the shared engine derives it, so the server's re-check agrees", async () => {
    const runs = await first.db.select().from(t.checkRuns);
    expect(runs.length).toBeGreaterThan(5);
    for (const run of runs) {
      const steps = await first.db
        .select()
        .from(t.checkSteps)
        .where(eq(t.checkSteps.checkRunId, run.id))
        .orderBy(t.checkSteps.seq);
      const [job] = await first.db.select().from(t.jobs).where(eq(t.jobs.id, run.jobId));
      const [machine] = await first.db.select().from(t.machines).where(eq(t.machines.id, job!.machineId));
      const procedure = findProcedure(run.procedureKey)!;
      const view = walkRun(
        procedure,
        {
          procedureKey: run.procedureKey,
          procedureVersion: run.procedureVersion,
          steps: steps.map((s) => ({
            stepKey: s.stepKey,
            answer: s.answer,
            cautionAcknowledged: s.cautionAcknowledgedAt !== null,
          })),
        },
        { spec: (run.spec as MachineSpec | null) ?? machine },
      );
      expect(view.finished).toBe(run.status === 'finished');
      expect(
        view.steps.map((s) => [s.stepKey, s.evaluation?.verdict ?? null, s.evaluation?.reason ?? null]),
      ).toEqual(steps.map((s) => [s.stepKey, s.verdict, s.reason]));
      expect(view.outcome?.verdict ?? null).toBe(run.verdict);
    }
  });

  it('keeps every business-owned row under the one demo business', async () => {
    const [business] = await first.db.select().from(t.businesses);
    for (const table of TABLES.filter((name) => name !== 'businesses')) {
      const [count] = await rows<{ n: number }>(
        first,
        sql.raw(`select count(*)::int as n from ${table} where business_id <> ${business!.id}`),
      );
      expect(count!.n, table).toBe(0);
    }
  });
});
