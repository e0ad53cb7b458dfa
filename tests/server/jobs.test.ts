import { and, count, eq, isNotNull } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../server/auth/password';
import * as t from '../../server/db/schema';
import {
  canTransition,
  JOB_STATUS_LABELS,
  JOB_STATUSES,
  JOB_TRANSITIONS,
  JobDetailSchema,
  JobListSchema,
  JobSchema,
  type Job,
  type JobStatus,
} from '../../shared/api/jobs';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';

/**
 * The hand moves as the product brief lists them, written out here on their own so the shared
 * table is checked against the brief and not against itself.
 */
const BRIEF_TRANSITIONS: Record<JobStatus, JobStatus[]> = {
  booked: ['on_site', 'cancelled'],
  on_site: ['diagnosing', 'cancelled'],
  diagnosing: ['awaiting_approval', 'repairing', 'complete', 'cancelled'],
  awaiting_approval: ['repairing', 'cancelled', 'diagnosing'],
  repairing: ['complete', 'diagnosing'],
  complete: ['repairing'],
  invoiced: [],
  paid: [],
  cancelled: [],
};

let api: TestApi;
let julesId: number;
let rowanId: number;
/** A customer and machine of this file's own, so seeded jobs never get in the way of a count. */
let testCustomerId: number;
let testMachineId: number;
beforeAll(async () => {
  api = await seededApi();
  const customers = await api.database.db.select().from(t.customers);
  julesId = customers.find((c) => c.email === 'jules@example.test')!.id;
  rowanId = customers.find((c) => c.email === 'rowan@example.test')!.id;
  const customer = await request(api.app)
    .post('/api/customers')
    .set(as(api, 'owner'))
    .send({ name: 'Juniper Ashcombe', town: 'Cinder Valley' })
    .expect(201);
  testCustomerId = customer.body.id;
  testMachineId = (await newMachine(testCustomerId)).id;
});
afterAll(() => api.close());

async function newMachine(customerId: number, meterReading: number | null = null): Promise<{ id: number }> {
  const response = await request(api.app)
    .post('/api/machines')
    .set(as(api, 'owner'))
    .send({ customerId, kind: 'atv', make: 'Norrland', model: 'Fjell 450', meterUnit: 'h', meterReading })
    .expect(201);
  return response.body;
}

async function book(body: Record<string, unknown> = {}, machineId = testMachineId): Promise<Job> {
  const [machine] = await api.database.db.select().from(t.machines).where(eq(t.machines.id, machineId));
  const response = await request(api.app)
    .post('/api/jobs')
    .set(as(api, 'owner'))
    .send({ customerId: machine!.customerId, machineId, complaint: 'Cuts out under load.', ...body })
    .expect(201);
  return JobSchema.parse(response.body);
}

const jobCount = async () => (await api.database.db.select({ n: count() }).from(t.jobs))[0]!.n;
const setStatus = (id: number, status: JobStatus) =>
  api.database.db.update(t.jobs).set({ status }).where(eq(t.jobs.id, id));
const moveTo = (id: number, status: JobStatus, caller: 'owner' | 'helper' = 'owner', note?: string) =>
  request(api.app)
    .post(`/api/jobs/${id}/status`)
    .set(as(api, caller))
    .send({ status, ...(note ? { note } : {}) });

async function listIds(query: Record<string, string | number>, caller: 'owner' | 'customer' = 'owner') {
  const ids: number[] = [];
  let cursor: string | null = null;
  do {
    const response = await request(api.app)
      .get('/api/jobs')
      .query({ limit: 100, ...query, ...(cursor ? { cursor } : {}) })
      .set(as(api, caller))
      .expect(200);
    const page = JobListSchema.parse(response.body);
    ids.push(...page.items.map((j) => j.id));
    cursor = page.nextCursor;
  } while (cursor);
  return ids;
}

describe('jobs: booking', () => {
  it('books a job with a booked event on its timeline, named after the customer and machine', async () => {
    const job = await book({
      location: 'Quarry Bend trailhead lot',
      scheduledAt: '2026-11-20T16:00:00Z',
      meterReading: 40,
    });
    expect(job).toMatchObject({ status: 'booked', customerId: testCustomerId, machineId: testMachineId });
    expect(job.scheduledAt).toBe('2026-11-20T16:00:00.000Z');
    const detail = JobDetailSchema.parse(
      (await request(api.app).get(`/api/jobs/${job.id}`).set(as(api, 'bookkeeper')).expect(200)).body,
    );
    expect(detail.customerName).toBe('Juniper Ashcombe');
    expect(detail.machineName).toBe('Norrland Fjell 450');
    expect(detail.events).toEqual([
      {
        id: expect.any(Number),
        kind: 'status',
        fromStatus: null,
        toStatus: 'booked',
        note: null,
        actorName: 'Morgan Avery',
        at: SEED_TODAY.toISOString(),
      },
    ]);
  });

  it("refuses a machine that is not the customer's, a missing complaint and unknown fields", async () => {
    const before = await jobCount();
    const [rowans] = await api.database.db
      .select()
      .from(t.machines)
      .where(eq(t.machines.customerId, rowanId));
    for (const body of [
      { customerId: julesId, machineId: rowans!.id, complaint: 'Wrong owner.' },
      { customerId: testCustomerId, machineId: 999_999, complaint: 'No such machine.' },
      { customerId: testCustomerId, machineId: testMachineId },
      { customerId: testCustomerId, machineId: testMachineId, complaint: '   ' },
      { customerId: testCustomerId, machineId: testMachineId, complaint: 'X', status: 'complete' },
      { customerId: testCustomerId, machineId: testMachineId, complaint: 'X', clientId: 'not-a-uuid' },
      { customerId: testCustomerId, machineId: testMachineId, complaint: 'X', scheduledAt: '18/11/2026' },
    ]) {
      const response = await request(api.app).post('/api/jobs').set(as(api, 'owner')).send(body).expect(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    expect(await jobCount()).toBe(before);
  });

  it('answers a replayed clientId with the job it made, once, with 200', async () => {
    const clientId = '6f1c2b8e-3d4a-4f5b-9c6d-7e8f9a0b1c2d';
    const body = {
      customerId: testCustomerId,
      machineId: testMachineId,
      complaint: 'Queued offline.',
      clientId,
    };
    const first = await request(api.app).post('/api/jobs').set(as(api, 'helper')).send(body).expect(201);
    const before = await jobCount();
    const again = await request(api.app).post('/api/jobs').set(as(api, 'helper')).send(body).expect(200);
    const changed = await request(api.app)
      .post('/api/jobs')
      .set(as(api, 'owner'))
      .send({ ...body, complaint: 'Edited in the queue.' })
      .expect(200);
    expect(again.body).toEqual(first.body);
    expect(changed.body.complaint).toBe('Queued offline.');
    expect(await jobCount()).toBe(before);
    const events = await api.database.db
      .select()
      .from(t.jobEvents)
      .where(eq(t.jobEvents.jobId, first.body.id));
    expect(events).toHaveLength(1);
  });

  it("raises the machine's meter with a higher visit reading, never lowers it", async () => {
    const machine = await newMachine(testCustomerId, 100);
    const meter = async () =>
      (await request(api.app).get(`/api/machines/${machine.id}`).set(as(api, 'owner'))).body.meterReading;
    const job = await book({ meterReading: 150 }, machine.id);
    expect(await meter()).toBe(150);
    await book({ meterReading: 120 }, machine.id);
    expect(await meter()).toBe(150);
    await request(api.app).patch(`/api/jobs/${job.id}`).set(as(api, 'owner')).send({ meterReading: 151.5 });
    expect(await meter()).toBe(151.5);
  });
});

describe('jobs: status moves', () => {
  it('follows the brief exactly, in the shared table the CLI and dashboard read', () => {
    expect(JOB_TRANSITIONS).toEqual(BRIEF_TRANSITIONS);
    for (const from of JOB_STATUSES)
      for (const to of JOB_STATUSES)
        expect(canTransition(from, to)).toBe(BRIEF_TRANSITIONS[from].includes(to));
  });

  it('walks every pair of statuses: allowed moves 200 with an event, all others 409 naming the allowed', async () => {
    const outcomes: string[] = [];
    for (const from of JOB_STATUSES) {
      for (const to of JOB_STATUSES) {
        const job = await book();
        await setStatus(job.id, from);
        const response = await moveTo(job.id, to, 'helper');
        const allowed = BRIEF_TRANSITIONS[from].includes(to);
        outcomes.push(`${from}->${to}:${response.status}`);
        const [row] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, job.id));
        const events = await api.database.db
          .select()
          .from(t.jobEvents)
          .where(and(eq(t.jobEvents.jobId, job.id), isNotNull(t.jobEvents.fromStatus)));
        if (allowed) {
          expect(response.body.status).toBe(to);
          expect(row!.status).toBe(to);
          expect(events).toMatchObject([{ fromStatus: from, toStatus: to }]);
        } else {
          expect(response.body.error.code).toBe('conflict');
          for (const next of BRIEF_TRANSITIONS[from])
            expect(response.body.error.message).toContain(JOB_STATUS_LABELS[next]);
          expect(response.body.error.details).toEqual({ from, to, allowed: BRIEF_TRANSITIONS[from] });
          expect(row!.status).toBe(from);
          expect(events).toEqual([]);
        }
      }
    }
    const expected = JOB_STATUSES.flatMap((from) =>
      JOB_STATUSES.map((to) => `${from}->${to}:${BRIEF_TRANSITIONS[from].includes(to) ? 200 : 409}`),
    );
    expect(outcomes).toEqual(expected);
  });

  it('refuses invoiced and paid by hand, saying they come from the invoice', async () => {
    const job = await book();
    await setStatus(job.id, 'complete');
    for (const status of ['invoiced', 'paid'] as const) {
      const response = await moveTo(job.id, status).expect(409);
      expect(response.body.error.message).toContain('invoice');
    }
  });

  it('stamps arrival, completion (cleared on reopening) and cancellation with the clock', async () => {
    const job = await book();
    const at = (iso: string) => {
      api.clock.set(new Date(iso));
    };
    try {
      at('2026-11-18T16:05:00Z');
      const arrived = await moveTo(job.id, 'on_site').expect(200);
      expect(arrived.body.arrivedAt).toBe('2026-11-18T16:05:00.000Z');
      at('2026-11-18T16:20:00Z');
      await moveTo(job.id, 'diagnosing', 'helper', 'Hold test shows a steady fall.').expect(200);
      at('2026-11-18T17:40:00Z');
      const done = await moveTo(job.id, 'complete').expect(200);
      expect(done.body.completedAt).toBe('2026-11-18T17:40:00.000Z');
      at('2026-11-19T09:00:00Z');
      const reopened = await moveTo(job.id, 'repairing').expect(200);
      expect(reopened.body.completedAt).toBeNull();
      expect(reopened.body.arrivedAt).toBe('2026-11-18T16:05:00.000Z');
      at('2026-11-19T10:15:00Z');
      const again = await moveTo(job.id, 'complete').expect(200);
      expect(again.body.completedAt).toBe('2026-11-19T10:15:00.000Z');

      const detail = (await request(api.app).get(`/api/jobs/${job.id}`).set(as(api, 'owner'))).body;
      expect(
        detail.events.map((e: { toStatus: string; actorName: string; at: string }) => [
          e.toStatus,
          e.actorName,
          e.at,
        ]),
      ).toEqual([
        ['booked', 'Morgan Avery', SEED_TODAY.toISOString()],
        ['on_site', 'Morgan Avery', '2026-11-18T16:05:00.000Z'],
        ['diagnosing', 'Dana Whitlock', '2026-11-18T16:20:00.000Z'],
        ['complete', 'Morgan Avery', '2026-11-18T17:40:00.000Z'],
        ['repairing', 'Morgan Avery', '2026-11-19T09:00:00.000Z'],
        ['complete', 'Morgan Avery', '2026-11-19T10:15:00.000Z'],
      ]);
      expect(detail.events[2].note).toBe('Hold test shows a steady fall.');

      const cancelled = await book();
      at('2026-11-19T11:00:00Z');
      const gone = await moveTo(cancelled.id, 'cancelled').expect(200);
      expect(gone.body.cancelledAt).toBe('2026-11-19T11:00:00.000Z');
      expect(gone.body.arrivedAt).toBeNull();
    } finally {
      api.clock.set(SEED_TODAY);
    }
  });

  it('answers a replayed status move with the job instead of a 409', async () => {
    const job = await book();
    const move = { status: 'on_site', clientId: '0b7e3a52-9f14-4c1e-8d2a-5b6c7d8e9f01' };
    const first = await request(api.app).post(`/api/jobs/${job.id}/status`).set(as(api, 'helper')).send(move);
    const again = await request(api.app).post(`/api/jobs/${job.id}/status`).set(as(api, 'helper')).send(move);
    expect([first.status, again.status]).toEqual([200, 200]);
    expect(again.body).toEqual(first.body);
    const moves = await api.database.db
      .select()
      .from(t.jobEvents)
      .where(and(eq(t.jobEvents.jobId, job.id), eq(t.jobEvents.toStatus, 'on_site')));
    expect(moves).toHaveLength(1);
    // The same clientId on another job is a mistake, not a replay.
    const other = await book();
    await request(api.app).post(`/api/jobs/${other.id}/status`).set(as(api, 'helper')).send(move).expect(409);
  });

  it('refuses unknown statuses and extra fields with 400', async () => {
    const job = await book();
    for (const body of [
      { status: 'finished' },
      {},
      { status: 'on_site', by: 'me' },
      { status: 'on_site', note: 'x'.repeat(2001) },
    ]) {
      await request(api.app).post(`/api/jobs/${job.id}/status`).set(as(api, 'owner')).send(body).expect(400);
    }
    const [row] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, job.id));
    expect(row!.status).toBe('booked');
  });
});

describe('jobs: notes and edits', () => {
  it('adds notes (idempotent on clientId) that staff see and customers do not', async () => {
    const [ownJob] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.customerId, julesId));
    const note = {
      note: 'Left the old pump on the bench for the customer.',
      clientId: 'c3d4e5f6-a7b8-4c9d-8e0f-1a2b3c4d5e6f',
    };
    const first = await request(api.app)
      .post(`/api/jobs/${ownJob!.id}/notes`)
      .set(as(api, 'helper'))
      .send(note)
      .expect(201);
    expect(first.body).toMatchObject({
      kind: 'note',
      fromStatus: null,
      toStatus: null,
      actorName: 'Dana Whitlock',
      note: note.note,
    });
    const again = await request(api.app)
      .post(`/api/jobs/${ownJob!.id}/notes`)
      .set(as(api, 'helper'))
      .send(note)
      .expect(200);
    expect(again.body).toEqual(first.body);
    await request(api.app)
      .post(`/api/jobs/${ownJob!.id}/notes`)
      .set(as(api, 'owner'))
      .send({ note: 'x'.repeat(2001) })
      .expect(400);
    await request(api.app)
      .post(`/api/jobs/${ownJob!.id}/notes`)
      .set(as(api, 'owner'))
      .send({ note: '' })
      .expect(400);

    const staff = (await request(api.app).get(`/api/jobs/${ownJob!.id}`).set(as(api, 'owner'))).body;
    expect(staff.events.filter((e: { note: string | null }) => e.note === note.note)).toHaveLength(1);
    const customer = JobDetailSchema.parse(
      (await request(api.app).get(`/api/jobs/${ownJob!.id}`).set(as(api, 'customer')).expect(200)).body,
    );
    expect(customer.events.length).toBeGreaterThan(0);
    for (const event of customer.events) {
      expect(event.kind).toBe('status');
      expect(event.note).toBeNull();
    }
    expect(customer.events.length).toBe(
      staff.events.filter((e: { kind: string }) => e.kind === 'status').length,
    );
  });

  it('hides the note on a status move from the customer but shows the move', async () => {
    const [mine] = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    const job = await book({}, mine!.id);
    await moveTo(job.id, 'on_site', 'owner', 'Dog in the yard; knock first.').expect(200);
    const customer = (await request(api.app).get(`/api/jobs/${job.id}`).set(as(api, 'customer')).expect(200))
      .body;
    expect(
      customer.events.map((e: { toStatus: string; note: string | null }) => [e.toStatus, e.note]),
    ).toEqual([
      ['booked', null],
      ['on_site', null],
    ]);
  });

  it('edits the record fields but never the status', async () => {
    const job = await book();
    const patched = await request(api.app)
      .patch(`/api/jobs/${job.id}`)
      .set(as(api, 'helper'))
      .send({
        diagnosis: 'Restricted in-line filter.',
        workDone: 'Replaced the filter.',
        location: null,
        scheduledAt: '2026-11-21T15:30:00-07:00',
      })
      .expect(200);
    expect(patched.body).toMatchObject({
      diagnosis: 'Restricted in-line filter.',
      workDone: 'Replaced the filter.',
      location: null,
      scheduledAt: '2026-11-21T22:30:00.000Z', // 15:30 at UTC−7 is 22:30 UTC (hand arithmetic)
      status: 'booked',
    });
    for (const body of [{ status: 'complete' }, { complaint: null }, { complaint: '' }, { colour: 'red' }]) {
      await request(api.app).patch(`/api/jobs/${job.id}`).set(as(api, 'owner')).send(body).expect(400);
    }
    const [row] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, job.id));
    expect(row!.status).toBe('booked');
    expect(row!.complaint).toBe('Cuts out under load.');
  });
});

describe('jobs: deleting', () => {
  it('deletes a booking made by mistake, with an audit row', async () => {
    const job = await book();
    await request(api.app).delete(`/api/jobs/${job.id}`).set(as(api, 'owner')).expect(204);
    await request(api.app).get(`/api/jobs/${job.id}`).set(as(api, 'owner')).expect(404);
    const audit = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'job.deleted'), eq(t.auditEvents.entityId, String(job.id))));
    expect(audit).toHaveLength(1);
    expect(audit[0]!.details).toMatchObject({ customerId: testCustomerId, machineId: testMachineId });
  });

  it('refuses a job past booked, or one with a reading, and says to cancel instead', async () => {
    const started = await book();
    await moveTo(started.id, 'on_site').expect(200);
    const past = await request(api.app).delete(`/api/jobs/${started.id}`).set(as(api, 'owner')).expect(409);
    expect(past.body.error.message).toContain('cancel');

    const measured = await book();
    await api.database.db.insert(t.readings).values({
      businessId: (
        await api.database.db.select().from(t.businesses).where(eq(t.businesses.slug, 'ridgeback'))
      )[0]!.id,
      jobId: measured.id,
      quantity: 'voltage',
      value: 12.6,
      unit: 'V',
      enteredValue: 12.6,
      enteredUnit: 'V',
    });
    const held = await request(api.app).delete(`/api/jobs/${measured.id}`).set(as(api, 'owner')).expect(409);
    expect(held.body.error.message).toMatch(/readings.*cancel/);
    await request(api.app).get(`/api/jobs/${measured.id}`).set(as(api, 'owner')).expect(200);
    await request(api.app).get(`/api/jobs/${started.id}`).set(as(api, 'owner')).expect(200);
  });
});

describe('jobs: lists', () => {
  it('combines status (several), customer and machine filters, and pages newest first', async () => {
    const [mine] = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    const all = await api.database.db.select().from(t.jobs);
    const cases: { query: Record<string, string | number>; keep: (j: (typeof all)[number]) => boolean }[] = [
      { query: { status: 'paid,invoiced' }, keep: (j) => ['paid', 'invoiced'].includes(j.status) },
      {
        query: { status: 'paid', customerId: julesId },
        keep: (j) => j.status === 'paid' && j.customerId === julesId,
      },
      {
        query: { status: 'paid,complete,cancelled', machineId: mine!.id },
        keep: (j) => ['paid', 'complete', 'cancelled'].includes(j.status) && j.machineId === mine!.id,
      },
      { query: { customerId: rowanId }, keep: (j) => j.customerId === rowanId },
    ];
    for (const { query, keep } of cases) {
      const expected = all
        .filter(keep)
        .map((j) => j.id)
        .sort((a, b) => b - a);
      expect(expected.length).toBeGreaterThan(0);
      expect(await listIds(query)).toEqual(expected);
    }

    const paged: number[] = [];
    let cursor: string | null = null;
    do {
      const response: request.Response = await request(api.app)
        .get('/api/jobs')
        .query({ status: 'paid', limit: 3, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'bookkeeper'))
        .expect(200);
      paged.push(...response.body.items.map((j: { id: number }) => j.id));
      cursor = response.body.nextCursor;
    } while (cursor);
    expect(paged).toEqual(await listIds({ status: 'paid' }));
    expect(new Set(paged).size).toBe(paged.length);

    for (const query of [{ status: 'finished' }, { status: ',' }, { limit: 0 }, { customerId: 'x' }]) {
      await request(api.app).get('/api/jobs').query(query).set(as(api, 'owner')).expect(400);
    }
  });

  it("filters on scheduledAt by calendar day in the business's own time zone", async () => {
    const machine = await newMachine(testCustomerId);
    const on = (scheduledAt: string | null) => book({ scheduledAt }, machine.id);
    // America/Denver is UTC−7 (MST) in November and UTC−6 (MDT) in July: US DST runs from the second
    // Sunday of March to the first Sunday of November (Energy Policy Act of 2005); hand arithmetic below.
    const lateOn17th = await on('2026-11-18T05:30:00Z'); // 22:30 on 2026-11-17 in Denver
    const midnight18th = await on('2026-11-18T07:00:00Z'); // 00:00 on 2026-11-18
    const lateOn16th = await on('2026-11-17T06:59:00Z'); // 23:59 on 2026-11-16
    const july15th = await on('2026-07-15T06:30:00Z'); // 00:30 on 2026-07-15 (MDT); a fixed −7 would say the 14th
    await on(null);
    const days = (query: Record<string, string>) => listIds({ machineId: machine.id, ...query });
    const newestFirst = (...jobs: Job[]) => jobs.map((j) => j.id).sort((a, b) => b - a);

    expect(await days({ from: '2026-11-17', to: '2026-11-17' })).toEqual(newestFirst(lateOn17th));
    expect(await days({ from: '2026-11-17' })).toEqual(newestFirst(lateOn17th, midnight18th));
    expect(await days({ to: '2026-11-17' })).toEqual(newestFirst(lateOn17th, lateOn16th, july15th));
    expect(await days({ from: '2026-07-15', to: '2026-07-15' })).toEqual(newestFirst(july15th));
    expect(await days({ from: '2026-07-14', to: '2026-07-14' })).toEqual([]);

    // The zone is the business's setting, not a constant: Asia/Tokyo is UTC+9 all year (IANA tz database).
    const [business] = await api.database.db
      .select()
      .from(t.businesses)
      .where(eq(t.businesses.slug, 'ridgeback'));
    await api.database.db
      .update(t.businesses)
      .set({ timezone: 'Asia/Tokyo' })
      .where(eq(t.businesses.id, business!.id));
    try {
      // 05:30Z and 07:00Z on the 18th are 14:30 and 16:00 on the 18th in Tokyo; 06:59Z on the 17th is 15:59 on the 17th.
      expect(await days({ from: '2026-11-18', to: '2026-11-18' })).toEqual(
        newestFirst(lateOn17th, midnight18th),
      );
      expect(await days({ from: '2026-11-17', to: '2026-11-17' })).toEqual(newestFirst(lateOn16th));
    } finally {
      await api.database.db
        .update(t.businesses)
        .set({ timezone: business!.timezone })
        .where(eq(t.businesses.id, business!.id));
    }

    await request(api.app)
      .get('/api/jobs')
      .query({ from: '2026-11-18', to: '2026-11-17' })
      .set(as(api, 'owner'))
      .expect(400);
    await request(api.app).get('/api/jobs').query({ from: '2026-13-01' }).set(as(api, 'owner')).expect(400);
  });

  it('names the customer and machine on each row and searches complaint, customer and machine', async () => {
    const machine = await newMachine(testCustomerId);
    const job = await book({ complaint: 'Bogs at 40% throttle after a creek crossing' }, machine.id);
    const page = JobListSchema.parse(
      (await request(api.app).get('/api/jobs').query({ q: 'creek' }).set(as(api, 'owner')).expect(200)).body,
    );
    expect(page.items.map((j) => j.id)).toEqual([job.id]);
    expect(page.items[0]).toMatchObject({
      customerName: 'Juniper Ashcombe',
      machineName: 'Norrland Fjell 450',
    });

    // Against the rows themselves: every job of the customer, and of machines of that make.
    const all = await api.database.db
      .select({ id: t.jobs.id, customer: t.customers.name, make: t.machines.make })
      .from(t.jobs)
      .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
      .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId));
    const newestFirst = (ids: number[]) => ids.sort((a, b) => b - a);
    expect(await listIds({ q: 'juniper ASHCOMBE' })).toEqual(
      newestFirst(all.filter((j) => j.customer === 'Juniper Ashcombe').map((j) => j.id)),
    );
    expect(await listIds({ q: 'norrland' })).toEqual(
      newestFirst(all.filter((j) => j.make === 'Norrland').map((j) => j.id)),
    );
    // LIKE's own wildcards are plain characters here: "40%" matches only the text "40%".
    expect(await listIds({ q: '40%' })).toEqual([job.id]);
    expect(await listIds({ q: '_' })).toEqual([]);
    // A customer's search stays within their own jobs.
    expect(await listIds({ q: 'creek' }, 'customer')).toEqual([]);
  });
});

describe('jobs: who sees what', () => {
  it("lists a customer's own jobs only, and 404s another customer's job", async () => {
    const own = await api.database.db
      .select({ id: t.jobs.id })
      .from(t.jobs)
      .where(eq(t.jobs.customerId, julesId));
    const listed = await listIds({}, 'customer');
    expect(listed).toEqual(own.map((j) => j.id).sort((a, b) => b - a));
    expect(await listIds({ customerId: rowanId }, 'customer')).toEqual([]);

    const [theirs] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.customerId, rowanId));
    await request(api.app).get(`/api/jobs/${theirs!.id}`).set(as(api, 'customer')).expect(404);
    // The write routes are closed to customers by the policy table, with the same 403 for their own
    // job as for another's, so the answer tells them nothing about whose a job is.
    for (const id of [own[0]!.id, theirs!.id]) {
      await request(api.app)
        .patch(`/api/jobs/${id}`)
        .set(as(api, 'customer'))
        .send({ location: 'x' })
        .expect(403);
      await request(api.app)
        .post(`/api/jobs/${id}/status`)
        .set(as(api, 'customer'))
        .send({ status: 'cancelled' })
        .expect(403);
      await request(api.app)
        .post(`/api/jobs/${id}/notes`)
        .set(as(api, 'customer'))
        .send({ note: 'x' })
        .expect(403);
      await request(api.app).delete(`/api/jobs/${id}`).set(as(api, 'customer')).expect(403);
    }
    const [after] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, theirs!.id));
    expect(after).toEqual(theirs);
  });

  it("keeps another business's staff out of every job and machine route (404, not 403)", async () => {
    const [other] = await api.database.db
      .insert(t.businesses)
      .values({
        slug: 'ember-hollow',
        name: 'Ember Hollow Small Engines',
        ownerName: 'Ash Verity',
        email: 'ash@emberhollow.test',
        labourRateCents: 8_000,
      })
      .returning();
    const password = 'another-long-password';
    await api.database.db.insert(t.users).values({
      businessId: other!.id,
      email: 'ash@emberhollow.test',
      name: 'Ash Verity',
      role: 'owner',
      passwordHash: await hashPassword(password),
    });
    const signIn = await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'ash@emberhollow.test', password })
      .expect(200);
    const stranger = { Authorization: `Bearer ${signIn.body.token}` };

    const [job] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.customerId, julesId));
    expect((await request(api.app).get('/api/jobs').set(stranger).expect(200)).body.items).toEqual([]);
    expect((await request(api.app).get('/api/machines').set(stranger).expect(200)).body.items).toEqual([]);
    await request(api.app).get(`/api/jobs/${job!.id}`).set(stranger).expect(404);
    await request(api.app).patch(`/api/jobs/${job!.id}`).set(stranger).send({ location: 'x' }).expect(404);
    await request(api.app)
      .post(`/api/jobs/${job!.id}/status`)
      .set(stranger)
      .send({ status: 'cancelled' })
      .expect(404);
    await request(api.app).post(`/api/jobs/${job!.id}/notes`).set(stranger).send({ note: 'x' }).expect(404);
    await request(api.app).delete(`/api/jobs/${job!.id}`).set(stranger).expect(404);
    await request(api.app).get(`/api/machines/${job!.machineId}`).set(stranger).expect(404);
    await request(api.app).get(`/api/machines/${job!.machineId}/history`).set(stranger).expect(404);
    await request(api.app)
      .patch(`/api/machines/${job!.machineId}`)
      .set(stranger)
      .send({ notes: 'x' })
      .expect(404);
    await request(api.app).delete(`/api/machines/${job!.machineId}`).set(stranger).expect(404);
    await request(api.app)
      .post('/api/jobs')
      .set(stranger)
      .send({ customerId: job!.customerId, machineId: job!.machineId, complaint: 'Not yours.' })
      .expect(400);
    await request(api.app)
      .post('/api/machines')
      .set(stranger)
      .send({
        customerId: job!.customerId,
        kind: 'atv',
        make: 'Tamarack',
        model: 'Larch 570',
        meterUnit: 'h',
      })
      .expect(400);
    const [after] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, job!.id));
    expect(after).toEqual(job);
  });
});
