import { randomUUID } from 'node:crypto';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import { ReadingListSchema, ReadingSchema, type Reading } from '../../shared/api/readings';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';

/** NIST SP 811, Appendix B.8: 1 psi = 6.894 757 293 168 kPa (exact from its definition). */
const KPA_PER_PSI = 6.894757293168;

let api: TestApi;
/** A job of the demo customer on a machine with manual specs (40–46 psi, 30 L/h minimum). */
let specJob: number;
/** A job on a machine with no specs entered: the generic limits apply. */
let genericJob: number;
/** Another customer's job. */
let otherJob: number;

const one = async (query: ReturnType<typeof sql>) => {
  const rows = await queryRows<{ id: number }>(api.database.db, query);
  return rows[0]!.id;
};
const count = async () =>
  (await queryRows<{ n: number }>(api.database.db, sql`select count(*)::int as n from readings`))[0]!.n;

beforeAll(async () => {
  api = await seededApi();
  specJob = await one(sql`
    select j.id from jobs j join machines m on m.id = j.machine_id join customers c on c.id = j.customer_id
    where c.email = 'jules@example.test' and m.fuel_pressure_min_kpa is not null order by j.id limit 1`);
  genericJob = await one(sql`
    select j.id from jobs j join machines m on m.id = j.machine_id join customers c on c.id = j.customer_id
    where c.email = 'jules@example.test' and m.fuel_pressure_min_kpa is null order by j.id limit 1`);
  otherJob = await one(sql`
    select j.id from jobs j join customers c on c.id = j.customer_id
    where c.email = 'rowan@example.test' order by j.id limit 1`);
});
afterAll(() => api.close());

async function add(jobId: number, body: object, caller: 'owner' | 'helper' = 'helper'): Promise<Reading> {
  const response = await request(api.app)
    .post(`/api/jobs/${jobId}/readings`)
    .set(as(api, caller))
    .send(body)
    .expect(201);
  return ReadingSchema.parse(response.body);
}

describe('recording readings', () => {
  it('stores a pressure typed in psi in kPa, keeps the psi, and judges it against the manual band', async () => {
    const reading = await add(specJob, { quantity: 'pressure', value: '43psi' });
    expect(reading).toMatchObject({
      quantity: 'pressure',
      unit: 'kPa',
      enteredValue: 43,
      enteredUnit: 'psi',
    });
    // NIST SP 811 B.8: 43 psi × 6.894 757 293 168 = 296.474 563 6… kPa.
    expect(reading.value).toBeCloseTo(43 * KPA_PER_PSI, 9);
    // The machine's manual band is 40–46 psi (seed): 43 psi is inside it, but a single reading
    // does not show the snap and held-throttle phases, which evaluateRunningPressure warns about.
    expect(reading.judgement).toMatchObject({ verdict: 'warn', specSource: 'manual', basis: 'reading' });
    expect(reading.judgement!.reason).toMatch(/in band where measured/);
    expect(reading.judgement!.reason).not.toMatch(/generic limit/);
  });

  it('fails a pressure below the band and a flow below the minimum, naming the cause', async () => {
    // 35 psi < the 40 psi manual minimum.
    const low = await add(specJob, { quantity: 'pressure', value: '35 psi' });
    expect(low.judgement).toMatchObject({ verdict: 'fail', specSource: 'manual' });
    expect(low.judgement!.reason).toMatch(/below the 40 psi/);
    // 20 L/h < the 30 L/h manual minimum.
    const weak = await add(specJob, { quantity: 'flow', value: '20 L/h' });
    expect(weak.judgement).toMatchObject({ verdict: 'fail', specSource: 'manual' });
    // 600 mL/min × 60 min/h ÷ 1000 mL/L = 36 L/h (hand arithmetic) ≥ 30 L/h.
    const strong = await add(specJob, { quantity: 'flow', value: '600 mL/min' });
    expect(strong.value).toBeCloseTo(36, 12);
    expect(strong.judgement).toMatchObject({ verdict: 'pass', specSource: 'manual' });
  });

  it('labels a judgement against generic limits as generic', async () => {
    // 3 bar = 300 kPa exactly (NIST SP 811: 1 bar = 100 kPa); the generic band is 39–47 psi.
    const reading = await add(genericJob, { quantity: 'pressure', value: '3 bar' });
    expect(reading.value).toBe(300);
    expect(reading.judgement).toMatchObject({ specSource: 'generic' });
    expect(reading.judgement!.reason).toMatch(/\(generic limit: confirm in the service manual\)$/);
  });

  it('has no judgement where the machine has no limit for the quantity', async () => {
    const volts = await add(specJob, { quantity: 'voltage', value: 12.4, unit: 'V' });
    expect(volts).toMatchObject({ value: 12.4, unit: 'V', enteredUnit: 'V', judgement: null });
    // °C = (°F − 32) × 5/9: 68 °F = 20 °C (the definition of the Fahrenheit scale).
    const air = await add(specJob, { quantity: 'temperature', value: '68F' });
    expect(air.value).toBeCloseTo(20, 12);
    expect(air).toMatchObject({ unit: 'C', enteredValue: 68, enteredUnit: 'F', judgement: null });
    // An air-fuel ratio has one unit, so a bare number is unambiguous.
    const afr = await add(specJob, { quantity: 'afr', value: '14.7' });
    expect(afr).toMatchObject({ value: 14.7, unit: 'ratio' });
  });

  it('takes the time from the clock unless one is given, and keeps the note and step', async () => {
    const now = await add(specJob, { quantity: 'voltage', value: '12.6V' });
    expect(now.takenAt).toBe(SEED_TODAY.toISOString());
    const given = await add(specJob, {
      quantity: 'duration',
      value: '2.5s',
      takenAt: '2026-11-18T07:55:00-07:00',
      note: 'prime run at the trailhead',
      stepKey: 'prime-run',
    });
    expect(given).toMatchObject({
      takenAt: '2026-11-18T14:55:00.000Z',
      note: 'prime run at the trailhead',
      stepKey: 'prime-run',
      checkRunId: null,
    });
  });

  it('refuses a wrong-dimension unit, garbage and malformed bodies with 400 and stores nothing', async () => {
    const before = await count();
    const bodies = [
      { quantity: 'pressure', value: '12V' },
      { quantity: 'pressure', value: 'abc' },
      { quantity: 'pressure', value: '43' },
      { quantity: 'pressure', value: '43 furlongs' },
      { quantity: 'pressure', value: '3,5 bar' },
      { quantity: 'pressure', value: '-4psi' },
      { quantity: 'pressure', value: 43 },
      { quantity: 'pressure', value: 43, unit: 'V' },
      { quantity: 'pressure', value: '43psi', unit: 'psi' },
      { quantity: 'torque', value: '10 Nm' },
      { quantity: 'voltage', value: '12V', colour: 'red' },
      { quantity: 'voltage', value: '12V', clientId: 'not-a-uuid' },
      { quantity: 'voltage', value: '12V', takenAt: 'yesterday' },
      { quantity: 'voltage', value: '2e7 V' },
    ];
    for (const body of bodies) {
      const response = await request(api.app)
        .post(`/api/jobs/${specJob}/readings`)
        .set(as(api, 'helper'))
        .send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    expect(await count()).toBe(before);
  });

  it('stores a reading once however often its clientId is sent (the offline queue replays)', async () => {
    const clientId = randomUUID();
    const body = { quantity: 'pressure', value: '41psi', clientId };
    const first = await request(api.app)
      .post(`/api/jobs/${specJob}/readings`)
      .set(as(api, 'helper'))
      .send(body)
      .expect(201);
    const before = await count();
    const again = await request(api.app)
      .post(`/api/jobs/${specJob}/readings`)
      .set(as(api, 'helper'))
      .send(body)
      .expect(200);
    expect(again.body).toEqual(first.body);
    expect(await count()).toBe(before);
    // The same clientId on another job is not a replay but a clash.
    await request(api.app)
      .post(`/api/jobs/${genericJob}/readings`)
      .set(as(api, 'helper'))
      .send(body)
      .expect(409);
  });
});

describe('listing readings', () => {
  it('pages newest first with a cursor and filters by quantity', async () => {
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get(`/api/jobs/${specJob}/readings`)
        .query({ limit: 3, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'owner'))
        .expect(200);
      const page = ReadingListSchema.parse(response.body);
      expect(page.items.every((r) => r.jobId === specJob)).toBe(true);
      seen.push(...page.items.map((r) => r.id));
      cursor = page.nextCursor;
    } while (cursor);
    const [{ n }] = (await queryRows<{ n: number }>(
      api.database.db,
      sql`select count(*)::int as n from readings where job_id = ${specJob}`,
    )) as [{ n: number }];
    expect(seen.length).toBe(n);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);

    const flows = await request(api.app)
      .get(`/api/jobs/${specJob}/readings`)
      .query({ quantity: 'flow', limit: 100 })
      .set(as(api, 'owner'))
      .expect(200);
    expect(flows.body.items.length).toBeGreaterThanOrEqual(2);
    expect(flows.body.items.every((r: Reading) => r.quantity === 'flow' && r.unit === 'L/h')).toBe(true);
    await request(api.app)
      .get(`/api/jobs/${specJob}/readings`)
      .query({ quantity: 'torque' })
      .set(as(api, 'owner'))
      .expect(400);
  });

  it("shows a customer their own job's readings, 404 for another's, and refuses the bookkeeper", async () => {
    const own = await request(api.app)
      .get(`/api/jobs/${specJob}/readings`)
      .set(as(api, 'customer'))
      .expect(200);
    expect(own.body.items.length).toBeGreaterThan(0);
    await request(api.app).get(`/api/jobs/${otherJob}/readings`).set(as(api, 'customer')).expect(404);
    await request(api.app).get(`/api/jobs/${specJob}/readings`).set(as(api, 'bookkeeper')).expect(403);
    await request(api.app)
      .post(`/api/jobs/${specJob}/readings`)
      .set(as(api, 'customer'))
      .send({ quantity: 'voltage', value: '12V' })
      .expect(403);
    await request(api.app).get('/api/jobs/999999/readings').set(as(api, 'owner')).expect(404);
  });
});

describe('deleting readings', () => {
  it('lets the owner delete a loose reading, audited; the helper may not', async () => {
    const reading = await add(specJob, { quantity: 'voltage', value: '12.2V' });
    await request(api.app)
      .delete(`/api/jobs/${specJob}/readings/${reading.id}`)
      .set(as(api, 'helper'))
      .expect(403);
    // Through another job's path the reading does not exist.
    await request(api.app)
      .delete(`/api/jobs/${genericJob}/readings/${reading.id}`)
      .set(as(api, 'owner'))
      .expect(404);
    await request(api.app)
      .delete(`/api/jobs/${specJob}/readings/${reading.id}`)
      .set(as(api, 'owner'))
      .expect(204);
    const audit = await queryRows<{ action: string; details: { value: number } }>(
      api.database.db,
      sql`select action, details from audit_events where entity_type = 'reading' and entity_id = ${String(reading.id)}`,
    );
    expect(audit).toEqual([{ action: 'reading.deleted', details: expect.objectContaining({ value: 12.2 }) }]);
    await request(api.app)
      .delete(`/api/jobs/${specJob}/readings/${reading.id}`)
      .set(as(api, 'owner'))
      .expect(404);
  });

  it("keeps a check run's readings: they go only with their step", async () => {
    const [seeded] = await queryRows<{ id: number; job_id: number }>(
      api.database.db,
      sql`select id, job_id from readings where check_run_id is not null order by id limit 1`,
    );
    const response = await request(api.app)
      .delete(`/api/jobs/${seeded!.job_id}/readings/${seeded!.id}`)
      .set(as(api, 'owner'))
      .expect(409);
    expect(response.body.error.message).toMatch(/check run/);
  });
});
