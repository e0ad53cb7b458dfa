import { count, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { OutboxListSchema, type OutboxItem } from '../../shared/api/outbox';
import { as, seededApi, type TestApi } from '../helpers/api';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

async function allMail(query: Record<string, string> = {}): Promise<OutboxItem[]> {
  const items: OutboxItem[] = [];
  let cursor: string | null = null;
  do {
    const response = await request(api.app)
      .get('/api/outbox')
      .query({ ...query, limit: 11, ...(cursor ? { cursor } : {}) })
      .set(as(api, 'owner'))
      .expect(200);
    const page = OutboxListSchema.parse(response.body);
    items.push(...page.items);
    cursor = page.nextCursor;
  } while (cursor);
  return items;
}

describe('the outbox', () => {
  it('lists every mail, newest first, with to, subject, sentAt and attachment names', async () => {
    const items = await allMail();
    const [stored] = await api.database.db.select({ n: count() }).from(t.outbox);
    expect(items.length).toBe(stored!.n);
    expect(new Set(items.map((m) => m.id)).size).toBe(items.length);
    expect([...items].sort((a, b) => b.id - a.id)).toEqual(items);

    // The seed mails each invoice with its PDF, named by the invoice number.
    const [first] = await api.database.db.select().from(t.invoices).where(eq(t.invoices.number, 1));
    const mail = items.find((m) => m.invoiceId === first!.id);
    expect(mail).toMatchObject({
      kind: 'invoice',
      to: 'jules@example.test',
      subject: 'Invoice 0001 from Ridgeback Mobile Moto',
      status: 'sent',
      attachments: [{ filename: 'invoice-1.pdf', contentType: 'application/pdf', sizeBytes: null }],
    });
    expect(mail!.sentAt).not.toBeNull();
  });

  it('filters by kind and status', async () => {
    const reminders = await allMail({ kind: 'reminder' });
    expect(reminders.length).toBeGreaterThan(0);
    expect(reminders.every((m) => m.kind === 'reminder' && m.attachments.length === 0)).toBe(true);
    const [stored] = await api.database.db
      .select({ n: count() })
      .from(t.outbox)
      .where(eq(t.outbox.kind, 'reminder'));
    expect(reminders.length).toBe(stored!.n);
    expect(await allMail({ status: 'failed' })).toEqual([]);
    await request(api.app).get('/api/outbox').query({ status: 'lost' }).set(as(api, 'owner')).expect(400);
  });

  it('is the owner’s alone, and read-only here', async () => {
    for (const caller of ['helper', 'bookkeeper', 'customer'] as const) {
      await request(api.app).get('/api/outbox').set(as(api, caller)).expect(403);
    }
    await request(api.app).get('/api/outbox').expect(401);
    await request(api.app)
      .post('/api/outbox')
      .set(as(api, 'owner'))
      .send({ to: 'x@example.test', subject: 'x' })
      .expect(404);
  });
});
