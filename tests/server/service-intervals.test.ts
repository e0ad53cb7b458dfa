import { addMonths, formatISO } from 'date-fns';
import { and, count, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { ServiceIntervalListSchema, ServiceIntervalSchema } from '../../shared/api/service-intervals';
import { evaluateServiceInterval } from '../../shared/evaluators/service-interval';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';

let api: TestApi;
/** Jules's motorcycle: odometer in miles, 18 420 mi in the seed. */
let bikeId: number;
let otherMachineId: number;

beforeAll(async () => {
  api = await seededApi();
  const [bike] = await api.database.db
    .select({ id: t.machines.id, meterReading: t.machines.meterReading })
    .from(t.machines)
    .where(eq(t.machines.model, 'Quillback 650'));
  bikeId = bike!.id;
  expect(bike!.meterReading).toBe(18_420);
  const [other] = await api.database.db
    .select({ id: t.machines.id })
    .from(t.machines)
    .where(eq(t.machines.meterUnit, 'h'))
    .limit(1);
  otherMachineId = other!.id;
});
afterAll(() => api.close());
afterEach(() => api.clock.set(new Date(SEED_TODAY)));

const path = (machineId: number) => `/api/machines/${machineId}/intervals`;

async function create(body: object, machineId = bikeId) {
  const response = await request(api.app).post(path(machineId)).set(as(api, 'helper')).send(body).expect(201);
  return ServiceIntervalSchema.parse(response.body);
}

async function listed(machineId: number, id: number) {
  const response = await request(api.app)
    .get(path(machineId))
    .query({ limit: 100 })
    .set(as(api, 'owner'))
    .expect(200);
  const item = ServiceIntervalListSchema.parse(response.body).items.find((i) => i.id === id);
  return item!;
}

async function intervalRows() {
  const [row] = await api.database.db.select({ n: count() }).from(t.serviceIntervals);
  return row!.n;
}

describe('service intervals: the maths, end to end', () => {
  it('is overdue by the calendar: done 2025-11-10, every 12 months → due 2026-11-10, 8 days over on 2026-11-18', async () => {
    const created = await create({
      item: 'fuel_filter',
      label: 'In-line fuel filter',
      everyMonths: 12,
      lastDoneOn: '2025-11-10',
    });
    // Calendar arithmetic by hand: twelve months after 10 Nov 2025 is 10 Nov 2026; 10 → 18 Nov is 8 days.
    expect(created.state).toMatchObject({
      asOf: '2026-11-18',
      status: 'overdue',
      verdict: 'fail',
      dueBy: 'months',
      dueOn: '2026-11-10',
      remainingDays: -8,
    });
    expect((await listed(bikeId, created.id)).state).toEqual(created.state);
  });

  it("judges on the business's calendar day (America/Denver), not UTC's", async () => {
    const created = await create({ item: 'oil', label: 'Oil', everyMonths: 12, lastDoneOn: '2025-11-10' });
    // 2026-11-19 05:00Z is 22:00 on the 18th in Denver (MST, UTC−7 after the first Sunday of
    // November: 15 U.S.C. 260a) — still 8 days over; at 08:00Z it is 01:00 on the 19th — 9 days.
    api.clock.set(new Date('2026-11-19T05:00:00Z'));
    expect((await listed(bikeId, created.id)).state).toMatchObject({ asOf: '2026-11-18', remainingDays: -8 });
    api.clock.set(new Date('2026-11-19T08:00:00Z'));
    expect((await listed(bikeId, created.id)).state).toMatchObject({ asOf: '2026-11-19', remainingDays: -9 });
  });

  it('adds calendar months the way date-fns does at a month end', async () => {
    const created = await create({ item: 'other', label: 'Chain', everyMonths: 1, lastDoneOn: '2026-01-31' });
    // Cross-check: date-fns addMonths clamps 31 Jan + 1 month to 28 Feb 2026 (not a leap year).
    const expected = formatISO(addMonths(new Date(2026, 0, 31), 1), { representation: 'date' });
    expect(expected).toBe('2026-02-28');
    expect(created.state.dueOn).toBe(expected);
  });

  it('takes miles, stores kilometres, and judges distance on the odometer in miles', async () => {
    const created = await create({
      item: 'oil',
      label: 'Engine oil and filter',
      everyMiles: 3000,
      lastDoneOn: '2026-09-01',
      lastDoneMeter: 15_500,
      source: 'manual',
    });
    // 3000 mi × 1.609 344 km/mi (exact, NIST SP 811 B.8) = 4828.032 km.
    expect(created.everyKm).toBeCloseTo(4828.032, 9);
    // Hand arithmetic: due at 15 500 + 3000 = 18 500 mi; 18 500 − 18 420 = 80 mi left, inside the
    // last tenth (300 mi) of the interval: due soon (the evaluator's rule).
    expect(created.state).toMatchObject({
      status: 'due_soon',
      verdict: 'warn',
      dueBy: 'distance',
      dueAtMeter: 18_500,
      remainingMeter: 80,
      dueOn: null,
    });
    expect(created).toMatchObject({ meterUnit: 'mi', source: 'manual', everyHours: null, everyMonths: null });
  });

  it("reports each seeded interval as the evaluator judges it with the machine's meter", async () => {
    const response = await request(api.app).get(path(otherMachineId)).set(as(api, 'bookkeeper')).expect(200);
    const items = ServiceIntervalListSchema.parse(response.body).items;
    expect(items.length).toBeGreaterThan(0);
    const [machine] = await api.database.db
      .select()
      .from(t.machines)
      .where(eq(t.machines.id, otherMachineId));
    for (const item of items) {
      const direct = evaluateServiceInterval({
        everyKm: item.everyKm,
        everyHours: item.everyHours,
        everyMonths: item.everyMonths,
        lastDoneOn: item.lastDoneOn!,
        lastDoneMeter: item.lastDoneMeter,
        meterUnit: machine!.meterUnit,
        currentMeter: machine!.meterReading,
        today: '2026-11-18',
      });
      expect(item.state).toEqual({
        asOf: '2026-11-18',
        verdict: direct.verdict,
        reason: direct.reason,
        ...direct.figures,
      });
    }
  });
});

describe('service intervals: changes', () => {
  it('marks one done with PATCH and it is no longer due', async () => {
    const created = await create({
      item: 'fuel_filter',
      label: 'Fuel filter',
      everyMiles: 3000,
      everyMonths: 12,
      lastDoneOn: '2025-10-01',
      lastDoneMeter: 14_000,
    });
    expect(created.state.status).toBe('overdue');
    const response = await request(api.app)
      .patch(`${path(bikeId)}/${created.id}`)
      .set(as(api, 'helper'))
      .send({ lastDoneOn: '2026-11-18', lastDoneMeter: 18_420 })
      .expect(200);
    const done = ServiceIntervalSchema.parse(response.body);
    // Hand arithmetic: next at 18 420 + 3000 = 21 420 mi, or on 2027-11-18, whichever comes first.
    expect(done.state).toMatchObject({
      status: 'ok',
      verdict: 'pass',
      dueAtMeter: 21_420,
      dueOn: '2027-11-18',
    });
    expect(done.everyKm).toBe(created.everyKm);

    const relabelled = await request(api.app)
      .patch(`${path(bikeId)}/${created.id}`)
      .set(as(api, 'owner'))
      .send({ label: 'Fuel filter (in-line)', everyMiles: null, everyHours: null })
      .expect(200);
    expect(relabelled.body).toMatchObject({ label: 'Fuel filter (in-line)', everyKm: null, everyMonths: 12 });
  });

  it('closes the open reminder when the service is recorded done later, audited; a correction back leaves it', async () => {
    const created = await create({
      item: 'oil',
      label: 'Engine oil',
      everyMonths: 6,
      lastDoneOn: '2026-03-01',
      lastDoneMeter: 16_000,
    });
    const reminder = await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: created.id })
      .expect(201);
    const status = async () => {
      const [row] = await api.database.db
        .select({ status: t.reminders.status })
        .from(t.reminders)
        .where(eq(t.reminders.id, reminder.body.id));
      return row!.status;
    };
    expect(await status()).toBe('pending');

    // A correction of the old date (earlier) is not a new service: the round stays open.
    await request(api.app)
      .patch(`${path(bikeId)}/${created.id}`)
      .set(as(api, 'helper'))
      .send({ lastDoneOn: '2026-02-27' })
      .expect(200);
    expect(await status()).toBe('pending');

    await request(api.app)
      .patch(`${path(bikeId)}/${created.id}`)
      .set(as(api, 'helper'))
      .send({ lastDoneOn: '2026-11-18', lastDoneMeter: 18_420 })
      .expect(200);
    expect(await status()).toBe('done');
    const audits = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(
        and(eq(t.auditEvents.action, 'service_interval.done'), eq(t.auditEvents.entityId, String(created.id))),
      );
    expect(audits.map((a) => a.details)).toEqual([
      { machineId: bikeId, lastDoneOn: '2026-11-18', lastDoneMeter: 18_420, remindersClosed: [reminder.body.id] },
    ]);
    // The next round may be reminded afresh.
    await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: created.id })
      .expect(201);
  });

  it('refuses bad bodies with 400 and changes nothing', async () => {
    const before = await intervalRows();
    const bad: object[] = [
      { item: 'oil', label: 'No limit at all', lastDoneOn: '2026-01-01' },
      { item: 'oil', label: 'Both', everyKm: 5000, everyMiles: 3000, lastDoneOn: '2026-01-01' },
      { item: 'oil', label: 'Half a month', everyMonths: 1.5, lastDoneOn: '2026-01-01' },
      { item: 'oil', label: 'Negative', everyKm: -5, lastDoneOn: '2026-01-01' },
      { item: 'oil', label: 'No date', everyMonths: 6 },
      { item: 'oil', label: 'Bad date', everyMonths: 6, lastDoneOn: '2026-02-30' },
      { item: 'oil', label: 'Tomorrow', everyMonths: 6, lastDoneOn: '2026-11-19' },
      { item: 'brakes', label: 'Unknown item', everyMonths: 6, lastDoneOn: '2026-01-01' },
      { item: 'oil', label: 'Extra', everyMonths: 6, lastDoneOn: '2026-01-01', machineId: 1 },
      { item: 'oil', label: '', everyMonths: 6, lastDoneOn: '2026-01-01' },
    ];
    for (const body of bad) {
      const response = await request(api.app).post(path(bikeId)).set(as(api, 'owner')).send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    expect(await intervalRows()).toBe(before);

    const created = await create({ item: 'oil', label: 'Oil', everyMonths: 6, lastDoneOn: '2026-06-01' });
    for (const body of [{}, { everyMonths: null }, { colour: 'red' }, { lastDoneOn: '2026-12-01' }]) {
      const response = await request(api.app)
        .patch(`${path(bikeId)}/${created.id}`)
        .set(as(api, 'owner'))
        .send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
    }
    expect((await listed(bikeId, created.id)).everyMonths).toBe(6);
  });

  it('deletes for the owner only, audited; a wrong machine or id is 404', async () => {
    const created = await create({
      item: 'spark_plug',
      label: 'Plugs',
      everyMonths: 24,
      lastDoneOn: '2025-05-01',
    });
    const one = `${path(bikeId)}/${created.id}`;
    await request(api.app).delete(one).set(as(api, 'helper')).expect(403);
    await request(api.app)
      .delete(`${path(otherMachineId)}/${created.id}`)
      .set(as(api, 'owner'))
      .expect(404);
    await request(api.app)
      .patch(`${path(otherMachineId)}/${created.id}`)
      .set(as(api, 'owner'))
      .send({ label: 'x' })
      .expect(404);
    await request(api.app).delete(one).set(as(api, 'owner')).expect(204);
    await request(api.app).delete(one).set(as(api, 'owner')).expect(404);
    const audits = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(
        and(
          eq(t.auditEvents.action, 'service_interval.deleted'),
          eq(t.auditEvents.entityId, String(created.id)),
        ),
      );
    expect(audits).toHaveLength(1);
    expect(audits[0]!.details).toMatchObject({ machineId: bikeId, item: 'spark_plug' });
  });
});

describe('service intervals: access and lists', () => {
  it('is staff only: a customer gets 403 even for their own machine; no machine is 404', async () => {
    await request(api.app).get(path(bikeId)).set(as(api, 'customer')).expect(403);
    await request(api.app)
      .post(path(bikeId))
      .set(as(api, 'bookkeeper'))
      .send({ item: 'oil', label: 'Oil', everyMonths: 6, lastDoneOn: '2026-06-01' })
      .expect(403);
    await request(api.app).get(path(999_999)).set(as(api, 'owner')).expect(404);
    await request(api.app).get(path(0)).set(as(api, 'owner')).expect(400);
  });

  it('pages a machine’s intervals newest first', async () => {
    const all = await request(api.app)
      .get(path(bikeId))
      .query({ limit: 100 })
      .set(as(api, 'owner'))
      .expect(200);
    const ids = ServiceIntervalListSchema.parse(all.body).items.map((i) => i.id);
    expect(ids.length).toBeGreaterThan(2);
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const page = await request(api.app)
        .get(path(bikeId))
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'helper'))
        .expect(200);
      const parsed = ServiceIntervalListSchema.parse(page.body);
      seen.push(...parsed.items.map((i) => i.id));
      cursor = parsed.nextCursor;
    } while (cursor);
    expect(seen).toEqual(ids);
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
  });
});
