import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CustomerListSchema, CustomerSchema } from '../../shared/api/customers';
import { as, seededApi, type TestApi } from '../helpers/api';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

describe('customers', () => {
  it('pages through every customer with a cursor, newest first, without repeats', async () => {
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get('/api/customers')
        .query({ limit: 4, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'owner'))
        .expect(200);
      const page = CustomerListSchema.parse(response.body);
      seen.push(...page.items.map((c) => c.id));
      cursor = page.nextCursor;
    } while (cursor);
    expect(seen.length).toBe(9);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);
  });

  it('searches by any part of the name, e-mail or phone', async () => {
    const response = await request(api.app)
      .get('/api/customers')
      .query({ q: 'JULES' })
      .set(as(api, 'owner'))
      .expect(200);
    expect(response.body.items.map((c: { email: string }) => c.email)).toEqual(['jules@example.test']);
  });

  it('creates, updates and archives; an archived customer leaves the list but keeps its record', async () => {
    const created = await request(api.app)
      .post('/api/customers')
      .set(as(api, 'helper'))
      .send({ name: 'Avery Quill', email: 'avery@example.test', town: 'Cinder Valley' })
      .expect(201);
    const customer = CustomerSchema.parse(created.body);
    const updated = await request(api.app)
      .patch(`/api/customers/${customer.id}`)
      .set(as(api, 'helper'))
      .send({ phone: '555-0142' })
      .expect(200);
    expect(updated.body.phone).toBe('555-0142');
    await request(api.app).delete(`/api/customers/${customer.id}`).set(as(api, 'helper')).expect(403);
    await request(api.app).delete(`/api/customers/${customer.id}`).set(as(api, 'owner')).expect(204);
    const list = await request(api.app)
      .get('/api/customers')
      .query({ q: 'Avery Quill' })
      .set(as(api, 'owner'));
    expect(list.body.items).toEqual([]);
    const kept = await request(api.app)
      .get(`/api/customers/${customer.id}`)
      .set(as(api, 'owner'))
      .expect(200);
    expect(kept.body.archivedAt).not.toBeNull();
  });

  it('shows a customer only their own record, without staff notes', async () => {
    const list = await request(api.app).get('/api/customers').set(as(api, 'customer')).expect(200);
    expect(list.body.items).toHaveLength(1);
    expect(list.body.items[0].email).toBe('jules@example.test');
    expect(list.body.items[0].notes).toBeNull();
    const others = await request(api.app).get('/api/customers').set(as(api, 'owner')).query({ q: 'rowan' });
    await request(api.app)
      .get(`/api/customers/${others.body.items[0].id}`)
      .set(as(api, 'customer'))
      .expect(404);
  });

  it('refuses unknown fields, bad e-mails and bad ids with 400 and changes nothing', async () => {
    const before = await request(api.app).get('/api/customers').query({ limit: 100 }).set(as(api, 'owner'));
    for (const body of [{ name: 'X', admin: true }, { name: '' }, { name: 'X', email: 'not-an-email' }, []]) {
      const response = await request(api.app)
        .post('/api/customers')
        .set(as(api, 'owner'))
        .send(body)
        .expect(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    await request(api.app).get('/api/customers/abc').set(as(api, 'owner')).expect(400);
    await request(api.app).get('/api/customers').query({ limit: 101 }).set(as(api, 'owner')).expect(400);
    await request(api.app).get('/api/customers').query({ cursor: '!!' }).set(as(api, 'owner')).expect(400);
    const after = await request(api.app).get('/api/customers').query({ limit: 100 }).set(as(api, 'owner'));
    expect(after.body.items.length).toBe(before.body.items.length);
  });
});
