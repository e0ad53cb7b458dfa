import { and, count, eq, inArray } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { DUE_STATUSES, DueListSchema, ReminderSchema, type DueItem } from '../../shared/api/reminders';
import { as, seededApi, type TestApi } from '../helpers/api';

let api: TestApi;
/** Jules's motorcycle: odometer in miles, 18 420 mi in the seed. */
let bikeId: number;

beforeAll(async () => {
  api = await seededApi();
  const [bike] = await api.database.db
    .select({ id: t.machines.id })
    .from(t.machines)
    .where(eq(t.machines.model, 'Quillback 650'));
  bikeId = bike!.id;
});
afterAll(() => api.close());

async function dueList(query: Record<string, string | number> = {}, caller: 'owner' | 'helper' = 'owner') {
  const response = await request(api.app)
    .get('/api/reminders')
    .query({ limit: 100, ...query })
    .set(as(api, caller))
    .expect(200);
  return DueListSchema.parse(response.body);
}

/** A months-only interval on the bike, so the day judged on is the only thing that moves it. */
async function interval(lastDoneOn: string, everyMonths = 12) {
  const response = await request(api.app)
    .post(`/api/machines/${bikeId}/intervals`)
    .set(as(api, 'owner'))
    .send({ item: 'fuel_filter', label: 'Test fuel filter', everyMonths, lastDoneOn })
    .expect(201);
  return response.body.id as number;
}

const byInterval = (items: DueItem[], id: number) => items.find((item) => item.serviceIntervalId === id);

async function reminderRows() {
  const [row] = await api.database.db.select({ n: count() }).from(t.reminders);
  return row!.n;
}

describe('the due list', () => {
  it('lists the seeded overdue and due-soon items with machine, customer and reminder', async () => {
    const { items } = await dueList();
    expect(items.length).toBeGreaterThan(0);
    expect(items.every((item) => (DUE_STATUSES as readonly string[]).includes(item.status))).toBe(true);
    expect(items.every((item) => item.asOf === '2026-11-18')).toBe(true);
    // The seed staggers last services 13, 11, 6 and 2 months back, on the 10th (server/db/seed.ts).
    // 13 months back: done 2025-10-10, 12-month fuel filter due 2026-10-10; 10 Oct → 18 Nov is
    // 21 + 18 = 39 days (hand arithmetic): overdue.
    const overdue = items.find((i) => i.item === 'fuel_filter' && i.dueOn === '2026-10-10');
    expect(overdue).toMatchObject({ status: 'overdue', verdict: 'fail', remaining: { days: -39 } });
    // 11 months back: done 2025-12-10, due 2026-12-10; 18 Nov → 10 Dec is 12 + 10 = 22 days, inside
    // the evaluator's 30-day window: due soon.
    const soon = items.find((i) => i.item === 'fuel_filter' && i.dueOn === '2026-12-10');
    expect(soon).toMatchObject({ status: 'due_soon', verdict: 'warn', remaining: { days: 22 } });
    expect(soon!.machine).toEqual({
      id: expect.any(Number),
      make: expect.any(String),
      model: expect.any(String),
      meterUnit: expect.stringMatching(/^(mi|km|h)$/),
    });
    expect(soon!.customer).toEqual({
      id: expect.any(Number),
      name: expect.any(String),
      email: expect.any(String),
    });

    // The seed mailed the first overdue fuel filter's reminder and left the others pending.
    const reminders = items
      .filter((i) => i.item === 'fuel_filter' && i.dueOn === '2026-10-10')
      .map((i) => i.reminder);
    expect(reminders).toContainEqual({ id: expect.any(Number), status: 'sent', sentAt: expect.any(String) });
    expect(reminders).toContainEqual({ id: expect.any(Number), status: 'pending', sentAt: null });
  });

  it('filters by status and judges on another day with ?on=', async () => {
    const id = await interval('2025-11-10');
    // Due 2026-11-10 (calendar months, hand arithmetic): 8 days over on the 18th; due on the day
    // itself; 26 days to go on 15 Oct (inside 30: due soon); 70 days to go on 1 Sep (not yet).
    expect(byInterval((await dueList()).items, id)).toMatchObject({
      status: 'overdue',
      remaining: { days: -8 },
    });
    expect(byInterval((await dueList({ on: '2026-11-10' })).items, id)).toMatchObject({
      status: 'due',
      asOf: '2026-11-10',
    });
    expect(byInterval((await dueList({ on: '2026-10-15' })).items, id)).toMatchObject({
      status: 'due_soon',
      remaining: { days: 26 },
    });
    expect(byInterval((await dueList({ on: '2026-09-01' })).items, id)).toBeUndefined();
    expect(byInterval((await dueList({ on: '2026-09-01', status: 'ok' })).items, id)).toMatchObject({
      status: 'ok',
      remaining: { days: 70 },
    });

    const onlyOk = await dueList({ status: 'ok' });
    expect(onlyOk.items.length).toBeGreaterThan(0);
    expect(onlyOk.items.every((i) => i.status === 'ok')).toBe(true);
    const two = await dueList({ status: 'overdue,due_soon' });
    expect(new Set(two.items.map((i) => i.status))).toEqual(new Set(['overdue', 'due_soon']));

    for (const query of [
      { status: 'late' },
      { on: '2026-02-30' },
      { on: 'tomorrow' },
      { limit: 0 },
      { cursor: '!!' },
    ]) {
      const response = await request(api.app).get('/api/reminders').query(query).set(as(api, 'owner'));
      expect(response.status, JSON.stringify(query)).toBe(400);
    }
  });

  it('pages over intervals with a cursor, without repeats or gaps', async () => {
    const all = (await dueList({ status: 'ok,due_soon,due,overdue' })).items.map((i) => i.serviceIntervalId);
    expect(all.length).toBeGreaterThan(5);
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get('/api/reminders')
        .query({ limit: 3, status: 'ok,due_soon,due,overdue', ...(cursor ? { cursor } : {}) })
        .set(as(api, 'helper'))
        .expect(200);
      const page = DueListSchema.parse(response.body);
      expect(page.items.length).toBeLessThanOrEqual(3);
      seen.push(...page.items.map((i) => i.serviceIntervalId));
      cursor = page.nextCursor;
    } while (cursor);
    expect(seen).toEqual(all);
    expect([...all].sort((a, b) => b - a)).toEqual(all);

    // A filtered list pages the same way.
    const due = (await dueList()).items.map((i) => i.serviceIntervalId);
    const paged: number[] = [];
    cursor = null;
    do {
      const response = await request(api.app)
        .get('/api/reminders')
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'owner'))
        .expect(200);
      const page = DueListSchema.parse(response.body);
      paged.push(...page.items.map((i) => i.serviceIntervalId));
      cursor = page.nextCursor;
    } while (cursor);
    expect(paged).toEqual(due);
  });

  it('leaves out archived machines', async () => {
    const id = await interval('2025-01-01');
    expect(byInterval((await dueList()).items, id)).toBeDefined();
    await api.database.db
      .update(t.machines)
      .set({ archivedAt: new Date('2026-11-17T12:00:00Z') })
      .where(eq(t.machines.id, bikeId));
    try {
      const { items } = await dueList();
      expect(items.some((i) => i.machine.id === bikeId)).toBe(false);
    } finally {
      await api.database.db.update(t.machines).set({ archivedAt: null }).where(eq(t.machines.id, bikeId));
    }
  });

  it('is for staff: a customer gets 403', async () => {
    await request(api.app).get('/api/reminders').set(as(api, 'customer')).expect(403);
    await request(api.app).get('/api/reminders').set(as(api, 'bookkeeper')).expect(200);
  });
});

describe('reminders', () => {
  it('creates one open reminder per interval: a second is 409', async () => {
    const id = await interval('2025-10-20');
    const created = await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: id })
      .expect(201);
    const reminder = ReminderSchema.parse(created.body);
    // Due 2026-10-20: twelve calendar months after 2025-10-20 (hand arithmetic).
    expect(reminder).toMatchObject({
      serviceIntervalId: id,
      machineId: bikeId,
      status: 'pending',
      dueOn: '2026-10-20',
      sentAt: null,
    });
    const before = await reminderRows();
    const again = await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: id })
      .expect(409);
    expect(again.body.error).toMatchObject({ code: 'conflict', details: { reminderId: reminder.id } });
    expect(await reminderRows()).toBe(before);
    expect(byInterval((await dueList()).items, id)!.reminder).toEqual({
      id: reminder.id,
      status: 'pending',
      sentAt: null,
    });
  });

  it('refuses a reminder for an interval whose seeded reminder is still open (pending or sent)', async () => {
    const open = await api.database.db
      .select({ serviceIntervalId: t.reminders.serviceIntervalId })
      .from(t.reminders)
      .where(inArray(t.reminders.status, ['pending', 'sent']));
    expect(open.length).toBeGreaterThan(1);
    for (const { serviceIntervalId } of open) {
      await request(api.app)
        .post('/api/reminders')
        .set(as(api, 'owner'))
        .send({ serviceIntervalId })
        .expect(409);
    }
  });

  it('dismisses; a closed reminder cannot change again, and a new one may then be made', async () => {
    const id = await interval('2025-09-15');
    const created = await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: id })
      .expect(201);
    const one = `/api/reminders/${created.body.id}`;
    await request(api.app).patch(one).set(as(api, 'helper')).send({ status: 'dismissed' }).expect(403);
    const dismissed = await request(api.app)
      .patch(one)
      .set(as(api, 'owner'))
      .send({ status: 'dismissed' })
      .expect(200);
    expect(dismissed.body.status).toBe('dismissed');
    // Still due, and the list says it was dismissed this round.
    expect(byInterval((await dueList()).items, id)).toMatchObject({
      status: 'overdue',
      reminder: { id: created.body.id, status: 'dismissed' },
    });
    const closed = await request(api.app)
      .patch(one)
      .set(as(api, 'owner'))
      .send({ status: 'done' })
      .expect(409);
    expect(closed.body.error.code).toBe('conflict');
    await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: id })
      .expect(201);
  });

  it('done marks the interval done today at the machine’s meter, and it leaves the due list', async () => {
    const id = await interval('2025-08-01');
    expect(byInterval((await dueList()).items, id)).toBeDefined();
    const created = await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: id })
      .expect(201);
    const done = await request(api.app)
      .patch(`/api/reminders/${created.body.id}`)
      .set(as(api, 'owner'))
      .send({ status: 'done' })
      .expect(200);
    expect(done.body.status).toBe('done');
    const [row] = await api.database.db
      .select()
      .from(t.serviceIntervals)
      .where(eq(t.serviceIntervals.id, id));
    // Today in the business's zone (America/Denver) for the seed clock 2026-11-18T15:00Z is the 18th.
    expect(row).toMatchObject({ lastDoneOn: '2026-11-18', lastDoneMeter: 18_420 });
    expect(byInterval((await dueList()).items, id)).toBeUndefined();
    expect(byInterval((await dueList({ status: 'ok' })).items, id)).toMatchObject({
      status: 'ok',
      dueOn: '2027-11-18',
      reminder: { id: created.body.id, status: 'done' },
    });
  });

  it('refuses bad input with 400, unknown ids with 404, and other roles with 403, changing nothing', async () => {
    const id = await interval('2025-07-01');
    const before = await reminderRows();
    for (const body of [{}, { serviceIntervalId: 'x' }, { serviceIntervalId: id, status: 'sent' }, []]) {
      const response = await request(api.app).post('/api/reminders').set(as(api, 'owner')).send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'owner'))
      .send({ serviceIntervalId: 999_999 })
      .expect(404);
    await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'helper'))
      .send({ serviceIntervalId: id })
      .expect(403);
    await request(api.app)
      .post('/api/reminders')
      .set(as(api, 'customer'))
      .send({ serviceIntervalId: id })
      .expect(403);
    expect(await reminderRows()).toBe(before);

    const [pending] = await api.database.db
      .select()
      .from(t.reminders)
      .where(and(eq(t.reminders.status, 'pending')))
      .limit(1);
    for (const body of [{ status: 'sent' }, { status: 'pending' }, { status: 'done', sentAt: 'now' }, {}]) {
      const response = await request(api.app)
        .patch(`/api/reminders/${pending!.id}`)
        .set(as(api, 'owner'))
        .send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
    }
    await request(api.app)
      .patch('/api/reminders/999999')
      .set(as(api, 'owner'))
      .send({ status: 'done' })
      .expect(404);
    const [still] = await api.database.db.select().from(t.reminders).where(eq(t.reminders.id, pending!.id));
    expect(still!.status).toBe('pending');
  });
});
