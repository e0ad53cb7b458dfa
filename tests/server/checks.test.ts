import { randomUUID } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { CheckRunListSchema, CheckRunSchema, type CheckRun } from '../../shared/api/checks';
import { AppliedLinesSchema } from '../../shared/api/line-items';
import { ReadingListSchema } from '../../shared/api/readings';
import { DEFER_LINE } from '../../shared/procedures/cautions';
import { walkRun } from '../../shared/procedures/engine';
import { findProcedure } from '../../shared/procedures/index';
import { as, seededApi, type Caller, type TestApi } from '../helpers/api';

/** NIST SP 811, Appendix B.8: 1 psi = 6.894 757 293 168 kPa. */
const KPA_PER_PSI = 6.894757293168;

let api: TestApi;
/** The demo customer's job that is not yet invoiced: the helper walks checks on it. */
let ownJob: number;
/** Another customer's job. */
let otherJob: number;
/** Every run this file creates, re-walked from the database at the end. */
const created: number[] = [];

const one = async (query: ReturnType<typeof sql>) =>
  (await queryRows<{ id: number }>(api.database.db, query))[0]!.id;
const countOf = async (table: 'check_runs' | 'check_steps' | 'readings') =>
  (await queryRows<{ n: number }>(api.database.db, sql.raw(`select count(*)::int as n from ${table}`)))[0]!.n;

beforeAll(async () => {
  api = await seededApi();
  ownJob = await one(sql`
    select j.id from jobs j join customers c on c.id = j.customer_id
    where c.email = 'jules@example.test' and j.status not in ('invoiced', 'paid', 'cancelled')
    order by j.id limit 1`);
  otherJob = await one(sql`
    select j.id from jobs j join customers c on c.id = j.customer_id
    where c.email = 'rowan@example.test' order by j.id limit 1`);
});
afterAll(() => api.close());

const V = (value: number) => ({ value, unit: 'V' });
const psi = (value: number) => ({ value, unit: 'psi' });

/**
 * A lean machine with a clogged filter, in the order the fuel-delivery check asks. Limits are
 * generic on this job's machine (39–47 psi, 30 L/h; shared/procedures/specs.ts).
 */
const CLOGGED_FILTER: [string, object][] = [
  ['symptoms', { symptoms: ['cuts_out_under_load', 'stumbles_on_acceleration'] }],
  // 12.65 V is a full flooded battery at rest (BCI open-circuit table, REFERENCES.md).
  ['basics-battery', { batteryType: 'flooded', volts: V(12.65) }],
  ['basics-fuel', { fuel: 'fresh' }],
  ['basics-air-filter', { airFilter: 'clean' }],
  ['basics-fault-codes', { faultCodes: 'none' }],
  ['basics-engine', { engine: 'confirmed' }],
  // About 2–3 s at key-on is a normal prime (REFERENCES.md, "Fuel delivery": common practice).
  ['prime-run', { primeRun: 'ran_stopped', seconds: { value: 2.5, unit: 's' } }],
  [
    'static-pressure-hold',
    // Settles 1 psi, then 0.5 psi over the rest of 5 min: under the 3 psi generic limit.
    {
      points: {
        unit: 'psi',
        points: [
          { sec: 0, value: 43 },
          { sec: 30, value: 42 },
          { sec: 120, value: 42 },
          { sec: 300, value: 41.5 },
        ],
      },
    },
  ],
  ['engine-runs', { runs: 'yes' }],
  // Snap and held fall below the 39 psi generic minimum: lean under load.
  ['running-pressure', { idle: psi(42), snap: psi(33), held: psi(30) }],
  // 95 mL in 15 s = 0.095 L ÷ (15/3600 h) = 22.8 L/h (hand arithmetic), under 30 L/h.
  ['flow-volume', { volume: { value: 95, unit: 'mL' }, seconds: { value: 15, unit: 's' } }],
  ['filters', { filters: 'restricted' }],
];

async function startRun(body: object = { procedure: 'fuel-delivery' }, caller: Caller = 'helper') {
  const response = await request(api.app).post(`/api/jobs/${ownJob}/checks`).set(as(api, caller)).send(body);
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  const run = CheckRunSchema.parse(response.body);
  created.push(run.id);
  return run;
}

async function answer(run: number, stepKey: string, value: object, cautionAcknowledged = true) {
  return request(api.app)
    .post(`/api/jobs/${ownJob}/checks/${run}/steps`)
    .set(as(api, 'helper'))
    .send({ stepKey, answer: value, cautionAcknowledged });
}

async function walkTo(run: number, steps: [string, object][]): Promise<CheckRun> {
  let view: CheckRun | null = null;
  for (const [stepKey, value] of steps) {
    const response = await answer(run, stepKey, value);
    expect(response.status, `${stepKey}: ${JSON.stringify(response.body)}`).toBe(201);
    view = CheckRunSchema.parse(response.body);
  }
  return view!;
}

describe('walking the fuel delivery check over HTTP', () => {
  let finished: CheckRun;

  it('walks every step as the helper, cautions acknowledged, to a finished run with findings', async () => {
    const run = await startRun();
    expect(run).toMatchObject({ status: 'in_progress', finished: false, steps: [], verdict: null });
    expect(run.current!.key).toBe('symptoms');

    const beforeHold = await walkTo(run.id, CLOGGED_FILTER.slice(0, 7));
    // The hold is hazardous: the current step carries its caution, the deferral to the manual last.
    expect(beforeHold.current!.key).toBe('static-pressure-hold');
    expect(beforeHold.current!.caution!.key).toBe('fuel-pressure');
    expect(beforeHold.current!.caution!.lines.at(-1)).toBe(DEFER_LINE);
    expect(beforeHold.current!.fields.map((f) => f.key)).toEqual(['points']);

    finished = await walkTo(run.id, CLOGGED_FILTER.slice(7));
    expect(finished.status).toBe('finished');
    expect(finished.finished).toBe(true);
    expect(finished.finishedAt).not.toBeNull();
    expect(finished.current).toBeNull();
    expect(finished.steps.map((s) => s.stepKey)).toEqual(CLOGGED_FILTER.map(([key]) => key));
    expect(finished.verdict).toBe('fail');
    const byKey = new Map(finished.steps.map((s) => [s.stepKey, s]));
    expect(byKey.get('running-pressure')!.evaluation!.verdict).toBe('fail');
    expect(byKey.get('flow-volume')!.evaluation!.figures.litersPerHour).toBe(22.8);
    expect(byKey.get('static-pressure-hold')!.cautionAcknowledgedAt).not.toBeNull();
    expect(byKey.get('symptoms')!.cautionAcknowledgedAt).toBeNull();
    // A restricted filter is the most common cause of low pressure (PRODUCT.md, "Lean running").
    expect(finished.outcome!.findings[0]!.key).toBe('restricted_filter');
    expect(finished.outcome!.diagnosis!.causes[0]!.cause).toBe('restricted_filter');
    expect(finished.outcome!.lines.map((l) => l.description)).toContain('In-line fuel filter');
    expect(finished.outcome!.advice.length).toBeGreaterThan(0);

    const [row] = await api.database.db.select().from(t.checkRuns).where(eq(t.checkRuns.id, run.id));
    expect(row).toMatchObject({ status: 'finished', verdict: 'fail' });
    expect((row!.findings as { nextAction: string }).nextAction).toBe(finished.outcome!.nextAction);
  });

  it("puts the run's readings in the job's reading list, in canonical units, judged by their step", async () => {
    const response = await request(api.app)
      .get(`/api/jobs/${ownJob}/readings`)
      .query({ checkRunId: finished.id, limit: 100 })
      .set(as(api, 'owner'))
      .expect(200);
    const readings = ReadingListSchema.parse(response.body).items;
    // 1 battery volts + 1 prime seconds + 4 hold points + 3 running pressures + 2 flow fields.
    expect(readings).toHaveLength(11);
    const hold = readings.filter((r) => r.stepKey === 'static-pressure-hold');
    expect(hold.map((r) => r.enteredValue).sort()).toEqual([41.5, 42, 42, 43]);
    for (const reading of hold) {
      expect(reading).toMatchObject({ quantity: 'pressure', unit: 'kPa', enteredUnit: 'psi' });
      // NIST SP 811 B.8: kPa = psi × 6.894 757 293 168.
      expect(reading.value).toBeCloseTo(reading.enteredValue * KPA_PER_PSI, 9);
      expect(reading.judgement).toMatchObject({ verdict: 'pass', basis: 'step', specSource: 'generic' });
    }
    const volume = readings.find((r) => r.stepKey === 'flow-volume' && r.quantity === 'volume')!;
    expect(volume).toMatchObject({ value: 95, unit: 'mL' });
    const snap = readings.filter((r) => r.stepKey === 'running-pressure');
    expect(snap.every((r) => r.judgement?.verdict === 'fail')).toBe(true);
    // The whole list holds them too, with the run named.
    const all = await request(api.app)
      .get(`/api/jobs/${ownJob}/readings`)
      .query({ limit: 100 })
      .set(as(api, 'helper'))
      .expect(200);
    const inList = all.body.items.filter((r: { checkRunId: number | null }) => r.checkRunId === finished.id);
    expect(inList).toHaveLength(11);
  });

  it('refuses more answers once finished (409), and going back (409)', async () => {
    const again = await answer(finished.id, 'filters', { filters: 'ok' });
    expect(again.status).toBe(409);
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${finished.id}/back`)
      .set(as(api, 'helper'))
      .expect(409);
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${finished.id}/pause`)
      .set(as(api, 'helper'))
      .expect(409);
  });

  it("adds the outcome's suggested lines at the business's rates, once", async () => {
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${finished.id}/apply-lines`)
      .set(as(api, 'helper'))
      .expect(403);
    const response = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${finished.id}/apply-lines`)
      .set(as(api, 'owner'))
      .expect(201);
    const applied = AppliedLinesSchema.parse(response.body);
    expect(applied.items.map((l) => l.description)).toEqual(
      finished.outcome!.lines.map((l) => l.description),
    );
    expect(applied.items.every((l) => l.checkRunId === finished.id)).toBe(true);
    const labour = applied.items.find((l) => l.description === 'Replace fuel filter and strainer')!;
    // 0.8 h × $95.00 (the demo business's labour rate) = $76.00 (hand arithmetic); labour untaxed.
    expect(labour).toMatchObject({
      kind: 'labour',
      quantityMilli: 800,
      unitPriceCents: 9500,
      taxable: false,
    });
    expect(labour.lineTotalCents).toBe(7600);
    const filter = applied.items.find((l) => l.description === 'In-line fuel filter')!;
    // Parts come in at 0 for the owner to price, with the business's 25 % parts markup ready.
    expect(filter).toMatchObject({ kind: 'part', unitPriceCents: 0, markupBps: 2500, needsPrice: true });
    expect(applied.note).toMatch(/price/);

    const twice = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${finished.id}/apply-lines`)
      .set(as(api, 'owner'))
      .expect(409);
    expect(twice.body.error.message).toMatch(/already/);
    const lines = await queryRows<{ n: number }>(
      api.database.db,
      sql`select count(*)::int as n from line_items where check_run_id = ${finished.id}`,
    );
    expect(lines[0]!.n).toBe(applied.items.length);
    const view = await request(api.app)
      .get(`/api/jobs/${ownJob}/checks/${finished.id}`)
      .set(as(api, 'helper'))
      .expect(200);
    expect(view.body.linesApplied).toBe(true);
  });
});

describe('refused answers', () => {
  it('refuses a hazardous step without its caution acknowledged, and stores nothing', async () => {
    const run = await startRun();
    await walkTo(run.id, CLOGGED_FILTER.slice(0, 7));
    const [steps, readings] = [await countOf('check_steps'), await countOf('readings')];
    const refused = await answer(run.id, 'static-pressure-hold', CLOGGED_FILTER[7]![1], false);
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toBe('acknowledge the caution before Static pressure hold');
    expect([await countOf('check_steps'), await countOf('readings')]).toEqual([steps, readings]);
  });

  it("refuses the wrong step, a field the step does not have, and a wrong unit with the engine's line", async () => {
    const run = await startRun();
    const steps = await countOf('check_steps');
    const cases: [string, object, RegExp][] = [
      ['basics-fuel', { fuel: 'fresh' }, /^the current step is symptoms, not basics-fuel$/],
      ['symptoms', { symptoms: ['no_start'], mood: 'grumpy' }, /unknown field mood/],
      ['symptoms', { symptoms: ['hiccups'] }, /choose from/],
    ];
    for (const [stepKey, value, message] of cases) {
      const response = await answer(run.id, stepKey, value);
      expect(response.status).toBe(400);
      expect(response.body.error.message).toMatch(message);
    }
    await walkTo(run.id, CLOGGED_FILTER.slice(0, 1));
    const volts = await answer(run.id, 'basics-battery', { batteryType: 'flooded', volts: psi(12) });
    expect(volts.body.error.message).toMatch(/psi is not a unit of voltage/);
    expect(await countOf('check_steps')).toBe(steps + 1);
  });
});

describe('back, pause and resume', () => {
  it('goes back one step, removing its readings, and refuses to go back from nothing', async () => {
    const run = await startRun();
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/back`)
      .set(as(api, 'helper'))
      .expect(409);
    await walkTo(run.id, CLOGGED_FILTER.slice(0, 2));
    const runReadings = async () =>
      (
        await queryRows<{ n: number }>(
          api.database.db,
          sql`select count(*)::int as n from readings where check_run_id = ${run.id}`,
        )
      )[0]!.n;
    expect(await runReadings()).toBe(1); // the battery volts
    const back = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/back`)
      .set(as(api, 'helper'))
      .expect(200);
    const view = CheckRunSchema.parse(back.body);
    expect(view.steps.map((s) => s.stepKey)).toEqual(['symptoms']);
    expect(view.current!.key).toBe('basics-battery');
    expect(await runReadings()).toBe(0);
    // Answered again, differently: a 12.0 V battery is under 25 % (BCI table, 12.06 V = 25 %)
    // and ends the run at once.
    const flat = await walkTo(run.id, [['basics-battery', { batteryType: 'flooded', volts: V(12.0) }]]);
    expect(flat).toMatchObject({ status: 'finished', verdict: 'fail' });
    expect(flat.outcome!.findings.map((f) => f.key)).toEqual(['battery-low']);
  });

  it('pauses a run and resumes it by answering', async () => {
    const run = await startRun();
    await walkTo(run.id, CLOGGED_FILTER.slice(0, 1));
    const paused = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/pause`)
      .set(as(api, 'helper'))
      .expect(200);
    expect(paused.body.status).toBe('paused');
    const list = await request(api.app)
      .get(`/api/jobs/${ownJob}/checks`)
      .query({ status: 'paused' })
      .set(as(api, 'helper'))
      .expect(200);
    expect(CheckRunListSchema.parse(list.body).items.map((r) => r.id)).toContain(run.id);
    const resumed = await walkTo(run.id, CLOGGED_FILTER.slice(1, 2));
    expect(resumed.status).toBe('in_progress');
    expect(resumed.current!.key).toBe('basics-fuel');
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/pause`)
      .set(as(api, 'helper'))
      .send({ reason: 'lunch' })
      .expect(400);
  });

  it('refuses apply-lines on a run that is not finished, or on a job already billed', async () => {
    const run = await startRun();
    expect(run.linesApplied).toBe(false);
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/apply-lines`)
      .set(as(api, 'owner'))
      .expect(409);
    const [billed] = await queryRows<{ id: number; job_id: number }>(
      api.database.db,
      sql`select r.id, r.job_id from check_runs r join jobs j on j.id = r.job_id
          where j.status = 'paid' and r.status = 'finished' order by r.id limit 1`,
    );
    const refused = await request(api.app)
      .post(`/api/jobs/${billed!.job_id}/checks/${billed!.id}/apply-lines`)
      .set(as(api, 'owner'))
      .expect(409);
    expect(refused.body.error.message).toMatch(/paid/);
  });

  it('applies nothing, with 200, when the finished run suggests no lines', async () => {
    // Poor compression or spark ends the fuel check at once; its finding has no lines to bill.
    const run = await startRun({
      procedure: 'fuel-delivery',
      steps: CLOGGED_FILTER.slice(0, 5)
        .map(([stepKey, value]) => ({ stepKey, answer: value, cautionAcknowledged: true }))
        .concat([{ stepKey: 'basics-engine', answer: { engine: 'poor' }, cautionAcknowledged: true }]),
    });
    expect(run.outcome!.findings.map((f) => f.key)).toEqual(['engine-basics']);
    const response = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks/${run.id}/apply-lines`)
      .set(as(api, 'owner'))
      .expect(200);
    expect(response.body).toEqual({ checkRunId: run.id, items: [], note: null });
  });
});

describe('saving a whole run at once (offline sync)', () => {
  const steps = (overrides: Record<string, unknown> = {}) =>
    CLOGGED_FILTER.map(([stepKey, value]) => ({
      stepKey,
      answer: value,
      cautionAcknowledged: true,
      ...overrides,
    }));

  it("ignores a client's verdicts and stores the server's", async () => {
    // A client claiming every step passed, on the same failing answers.
    const tampered = steps({ verdict: 'pass', reason: 'All good.', figures: { litersPerHour: 99 } });
    const run = await startRun({ procedure: 'fuel', steps: tampered, clientId: randomUUID() });
    expect(run).toMatchObject({ status: 'finished', verdict: 'fail', procedureKey: 'fuel-delivery' });
    const stored = await api.database.db
      .select()
      .from(t.checkSteps)
      .where(eq(t.checkSteps.checkRunId, run.id))
      .orderBy(t.checkSteps.seq);
    const flow = stored.find((s) => s.stepKey === 'flow-volume')!;
    expect(flow.verdict).toBe('fail');
    expect((flow.figures as { litersPerHour: number }).litersPerHour).toBe(22.8);
    expect(flow.reason).not.toBe('All good.');
    expect(stored.find((s) => s.stepKey === 'running-pressure')!.verdict).toBe('fail');
  });

  it("judges a stored run by the limits it started with, whatever the machine's specs become", async () => {
    const run = await startRun({ procedure: 'fuel', steps: steps(), clientId: randomUUID() });
    const [job] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, ownJob));
    const [machine] = await api.database.db
      .select()
      .from(t.machines)
      .where(eq(t.machines.id, job!.machineId));
    try {
      // A manual band of 20–60 psi would pass the 30 psi held throttle that failed under 39–47.
      await api.database.db
        .update(t.machines)
        .set({ fuelPressureMinKpa: 20 * KPA_PER_PSI, fuelPressureMaxKpa: 60 * KPA_PER_PSI })
        .where(eq(t.machines.id, machine!.id));
      const reread = await request(api.app)
        .get(`/api/jobs/${ownJob}/checks/${run.id}`)
        .set(as(api, 'helper'))
        .expect(200);
      const parsed = CheckRunSchema.parse(reread.body);
      const running = parsed.steps.find((s) => s.stepKey === 'running-pressure')!;
      expect(running.evaluation!.verdict).toBe('fail');
      // The run says which limits it is judged by, so the CLI and the dashboard judge it the same way.
      expect(parsed.spec).toEqual({
        fuelPressureMinKpa: machine!.fuelPressureMinKpa,
        fuelPressureMaxKpa: machine!.fuelPressureMaxKpa,
        holdMaxDropKpa: machine!.holdMaxDropKpa,
        holdMinutes: machine!.holdMinutes,
        flowMinLph: machine!.flowMinLph,
      });
    } finally {
      await api.database.db
        .update(t.machines)
        .set({
          fuelPressureMinKpa: machine!.fuelPressureMinKpa,
          fuelPressureMaxKpa: machine!.fuelPressureMaxKpa,
        })
        .where(eq(t.machines.id, machine!.id));
    }
  });

  it('saves a run once however often its clientId is sent', async () => {
    const clientId = randomUUID();
    const body = { procedure: 'fuel-delivery', steps: steps().slice(0, 3), clientId, status: 'paused' };
    const first = await startRun(body);
    expect(first.status).toBe('paused');
    const runs = await countOf('check_runs');
    const again = await request(api.app)
      .post(`/api/jobs/${ownJob}/checks`)
      .set(as(api, 'helper'))
      .send(body)
      .expect(200);
    expect(again.body.id).toBe(first.id);
    expect(await countOf('check_runs')).toBe(runs);
    await request(api.app).post(`/api/jobs/${otherJob}/checks`).set(as(api, 'helper')).send(body).expect(409);
  });

  it("refuses steps that do not fit, with the engine's message, and stores nothing", async () => {
    const before = await Promise.all([countOf('check_runs'), countOf('check_steps'), countOf('readings')]);
    const noCaution = steps().map((s) =>
      s.stepKey === 'static-pressure-hold' ? { ...s, cautionAcknowledged: false } : s,
    );
    const cases: [object, RegExp][] = [
      [
        { procedure: 'fuel-delivery', steps: noCaution },
        /step 8 \(static-pressure-hold\) was answered without acknowledging its caution/,
      ],
      [
        { procedure: 'fuel-delivery', steps: steps().slice(1) },
        /step 1 is basics-battery where symptoms was expected/,
      ],
      [
        { procedure: 'fuel-delivery', steps: steps().slice(0, 3), status: 'finished' },
        /not finished: the next step is basics-air-filter/,
      ],
      [{ procedure: 'fuel-delivery', steps: steps(), status: 'paused' }, /cannot be saved paused/],
      [{ procedure: 'fuel-delivery', steps: [...steps(), steps()[0]!] }, /finished before step 13/],
      [
        { procedure: 'fuel-delivery', steps: [{ stepKey: 'symptoms', answer: { symptoms: [] }, mood: 1 }] },
        /mood/,
      ],
      [{ procedure: 'carburettor' }, /unknown procedure/],
      [{ procedure: 'fuel-delivery', colour: 'red' }, /colour/],
      [
        {
          procedure: 'fuel-delivery',
          steps: steps().map((s) =>
            s.stepKey === 'flow-volume'
              ? { ...s, answer: { volume: { value: 95, unit: 'mL' }, seconds: { value: 0, unit: 's' } } }
              : s,
          ),
        },
        /seconds must be positive/,
      ],
    ];
    for (const [body, message] of cases) {
      const response = await request(api.app)
        .post(`/api/jobs/${ownJob}/checks`)
        .set(as(api, 'helper'))
        .send(body);
      expect(response.status, JSON.stringify(response.body)).toBe(400);
      expect(response.body.error.message).toMatch(message);
    }
    expect(await Promise.all([countOf('check_runs'), countOf('check_steps'), countOf('readings')])).toEqual(
      before,
    );
  });

  it('starts the battery and compression checks by name', async () => {
    const battery = await startRun({ procedure: 'battery' });
    expect(battery.procedureKey).toBe('battery-charging');
    const compression = await startRun({ procedure: 'compression' });
    expect(compression.current!.fields[0]).toMatchObject({ type: 'list', quantity: 'compression' });
  });
});

describe('who sees which runs', () => {
  it("shows a customer their own job's runs, 404 for another's, and refuses the bookkeeper", async () => {
    const list = await request(api.app)
      .get(`/api/jobs/${ownJob}/checks`)
      .set(as(api, 'customer'))
      .expect(200);
    const page = CheckRunListSchema.parse(list.body);
    expect(page.items.length).toBeGreaterThan(0);
    await request(api.app)
      .get(`/api/jobs/${ownJob}/checks/${page.items[0]!.id}`)
      .set(as(api, 'customer'))
      .expect(200);
    await request(api.app).get(`/api/jobs/${otherJob}/checks`).set(as(api, 'customer')).expect(404);
    const [otherRun] = await queryRows<{ id: number }>(
      api.database.db,
      sql`select id from check_runs where job_id = ${otherJob} limit 1`,
    );
    await request(api.app)
      .get(`/api/jobs/${otherJob}/checks/${otherRun!.id}`)
      .set(as(api, 'customer'))
      .expect(404);
    // A run is found only under its own job.
    await request(api.app)
      .get(`/api/jobs/${ownJob}/checks/${otherRun!.id}`)
      .set(as(api, 'owner'))
      .expect(404);
    await request(api.app).get(`/api/jobs/${ownJob}/checks`).set(as(api, 'bookkeeper')).expect(403);
    await request(api.app)
      .post(`/api/jobs/${ownJob}/checks`)
      .set(as(api, 'customer'))
      .send({ procedure: 'fuel' })
      .expect(403);
  });

  it('pages the runs newest first', async () => {
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get(`/api/jobs/${ownJob}/checks`)
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'owner'))
        .expect(200);
      const page = CheckRunListSchema.parse(response.body);
      seen.push(...page.items.map((r) => r.id));
      cursor = page.nextCursor;
    } while (cursor);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);
    expect(seen).toEqual(expect.arrayContaining(created));
  });
});

describe('every stored run re-walks to what is stored', () => {
  it("agrees step by step with the shared engine's walk of its stored answers", async () => {
    expect(created.length).toBeGreaterThan(5);
    for (const runId of created) {
      const [run] = await api.database.db.select().from(t.checkRuns).where(eq(t.checkRuns.id, runId));
      const steps = await api.database.db
        .select()
        .from(t.checkSteps)
        .where(eq(t.checkSteps.checkRunId, runId))
        .orderBy(t.checkSteps.seq);
      const [job] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, run!.jobId));
      const [machine] = await api.database.db
        .select()
        .from(t.machines)
        .where(eq(t.machines.id, job!.machineId));
      const view = walkRun(
        findProcedure(run!.procedureKey)!,
        {
          procedureKey: run!.procedureKey,
          procedureVersion: run!.procedureVersion,
          steps: steps.map((s) => ({
            stepKey: s.stepKey,
            answer: s.answer,
            cautionAcknowledged: s.cautionAcknowledgedAt !== null,
          })),
        },
        { spec: machine },
      );
      expect(steps.map((s) => s.seq)).toEqual(steps.map((_, i) => i));
      expect(view.finished).toBe(run!.status === 'finished');
      expect(
        view.steps.map((s) => [
          s.stepKey,
          s.answer,
          s.evaluation?.verdict ?? null,
          s.evaluation?.reason ?? null,
        ]),
      ).toEqual(steps.map((s) => [s.stepKey, s.answer, s.verdict, s.reason]));
      expect(view.steps.map((s) => s.evaluation?.figures ?? null)).toEqual(steps.map((s) => s.figures));
      expect(view.outcome?.verdict ?? null).toBe(run!.verdict);
      expect(JSON.parse(JSON.stringify(view.outcome))).toEqual(run!.findings);
    }
  });
});
