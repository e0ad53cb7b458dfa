import { and, count, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createMailer, type Mailer } from '../../server/mail/mailer';
import { nextAttemptAt, retryDelayMs, retryFailedMail } from '../../server/services/mail';
import { OutboxItemSchema, OutboxListSchema } from '../../shared/api/outbox';
import { as, seededApi, type TestApi } from '../helpers/api';
import { freshInvoice } from './access/money';

let api: TestApi;
let fake: FakeSmtp;
beforeAll(async () => {
  api = await seededApi();
  fake = api.mail!;
});
afterAll(() => api.close());

const pad = (n: number) => String(n).padStart(4, '0');
const sendInvoice = (target: TestApi, id: number, query = '') =>
  request(target.app).post(`/api/invoices/${id}/send${query}`).set(as(target, 'owner'));

async function outboxRows(target: TestApi, invoiceId: number) {
  return target.database.db.select().from(t.outbox).where(eq(t.outbox.invoiceId, invoiceId));
}

/** A port nothing listens on: a fake's, closed again. */
async function deadPort(): Promise<number> {
  const probe = await startFakeSmtp();
  await probe.close();
  return probe.port;
}

describe('POST /api/invoices/:id/send', () => {
  it('mails the invoice to the customer with its PDF attached, and the outbox lists it', async () => {
    const invoice = await freshInvoice(api);
    const before = fake.messages.length;
    const response = await sendInvoice(api, invoice.id).expect(202);
    const item = OutboxItemSchema.parse(response.body);
    expect(item).toMatchObject({ kind: 'invoice', status: 'sent', attempts: 1, invoiceId: invoice.id });

    expect(fake.messages).toHaveLength(before + 1);
    const mail = fake.messages.at(-1)!;
    expect(mail.envelopeTo).toEqual(['jules@example.test']);
    expect(mail.subject).toBe(`Invoice ${pad(invoice.number)} from Ridgeback Mobile Moto`);
    expect(mail.attachments).toHaveLength(1);
    const [pdf] = mail.attachments;
    expect(pdf!.filename).toBe(`invoice-${invoice.number}.pdf`);
    expect(pdf!.contentType).toBe('application/pdf');
    // ISO 32000-1 §7.5.2: a PDF file begins with the header "%PDF-" and the version.
    expect(pdf!.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // The body carries total and due date: $ and cents from the stored integer (hand arithmetic).
    expect(mail.text).toContain(`Total: $${(invoice.totalCents / 100).toFixed(2)}`);
    const [stored] = await api.database.db.select().from(t.invoices).where(eq(t.invoices.id, invoice.id));
    expect(mail.text).toContain(`Due by: ${stored!.dueOn}`);
    expect(stored!.sentAt?.toISOString()).toBe(api.clock.now.toISOString());

    const list = await request(api.app).get('/api/outbox').set(as(api, 'owner')).expect(200);
    const listed = OutboxListSchema.parse(list.body).items.find((m) => m.id === item.id);
    // CONTRACT.md: each mail with to, subject, sentAt, attachments: [{filename}].
    expect(listed).toMatchObject({
      to: 'jules@example.test',
      subject: `Invoice ${pad(invoice.number)} from Ridgeback Mobile Moto`,
      sentAt: api.clock.now.toISOString(),
      attachments: [
        {
          filename: `invoice-${invoice.number}.pdf`,
          contentType: 'application/pdf',
          sizeBytes: pdf!.sizeBytes,
        },
      ],
    });
    const audit = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'mail.sent'), eq(t.auditEvents.entityId, String(item.id))));
    expect(audit).toHaveLength(1);
  });

  it('refuses a second send without ?again (409, no second mail); ?again=true sends once more', async () => {
    const invoice = await freshInvoice(api);
    await sendInvoice(api, invoice.id).expect(202);
    const before = fake.messages.length;
    const again = await sendInvoice(api, invoice.id).expect(409);
    expect(again.body.error.code).toBe('conflict');
    expect(again.body.error.message).toMatch(/was already sent; send it again \(again=true\) for one more copy/);
    expect(again.body.error.details).toMatchObject({ waiting: false });
    expect(fake.messages).toHaveLength(before);
    expect(await outboxRows(api, invoice.id)).toHaveLength(1);

    await sendInvoice(api, invoice.id, '?again=maybe').expect(400);
    const resent = await sendInvoice(api, invoice.id, '?again=true').expect(202);
    expect(resent.body.status).toBe('sent');
    expect(fake.messages).toHaveLength(before + 1);
    const rows = await outboxRows(api, invoice.id);
    expect(rows.map((r) => r.idempotencyKey).sort()).toEqual([
      `invoice:${invoice.id}:1`,
      `invoice:${invoice.id}:2`,
    ]);
  });

  it('treats an invoice the seed already mailed as sent', async () => {
    const [seeded] = await api.database.db
      .select({ id: t.invoices.id })
      .from(t.invoices)
      .where(eq(t.invoices.number, 1));
    const before = fake.messages.length;
    await sendInvoice(api, seeded!.id).expect(409);
    expect(fake.messages).toHaveLength(before);
  });

  it('answers 400 for a customer without an e-mail address, and queues nothing', async () => {
    const invoice = await freshInvoice(api, { customerEmail: 'lorna@example.test' });
    await api.database.db
      .update(t.customers)
      .set({ email: null })
      .where(eq(t.customers.email, 'lorna@example.test'));
    const before = fake.messages.length;
    const response = await sendInvoice(api, invoice.id).expect(400);
    expect(response.body.error.message).toMatch(/no e-mail/);
    expect(await outboxRows(api, invoice.id)).toEqual([]);
    expect(fake.messages).toHaveLength(before);
  });

  it('answers 404 for an invoice that does not exist', async () => {
    await sendInvoice(api, 987_654).expect(404);
  });
});

describe('when SMTP fails', () => {
  let failing: TestApi;
  let deadMailer: Mailer;
  let back: FakeSmtp;
  let backMailer: Mailer;
  beforeAll(async () => {
    deadMailer = createMailer({ host: '127.0.0.1', port: await deadPort() });
    failing = await seededApi({ mailer: deadMailer });
    back = await startFakeSmtp();
    backMailer = createMailer({ host: back.host, port: back.port });
  });
  afterAll(async () => {
    deadMailer.close();
    backMailer.close();
    await back.close();
    await failing.close();
  });

  it('records the mail as failed with its error, then sends it once when the server is back', async () => {
    const invoice = await freshInvoice(failing);
    const response = await sendInvoice(failing, invoice.id).expect(202);
    const item = OutboxItemSchema.parse(response.body);
    expect(item).toMatchObject({ status: 'failed', attempts: 1, sentAt: null });
    expect(item.lastError).toMatch(/ECONNREFUSED|connect/i);
    const list = await request(failing.app)
      .get('/api/outbox')
      .query({ status: 'failed' })
      .set(as(failing, 'owner'))
      .expect(200);
    expect(OutboxListSchema.parse(list.body).items.map((m) => m.id)).toContain(item.id);
    // Waiting for its retry, it is not sent again on a plain request either, and the answer says it
    // waits (never sent) rather than "already sent".
    const waiting = await sendInvoice(failing, invoice.id).expect(409);
    expect(waiting.body.error.message).toMatch(/is waiting in the outbox and is tried again on its own/);
    expect(waiting.body.error.details).toEqual({ mailIds: [item.id], waiting: true });

    const start = failing.clock.now.getTime();
    // 1 minute of backoff after the first failure (server/services/mail.ts, RETRY_BASE_MS).
    const early = await retryFailedMail(failing.database.db, backMailer, new Date(start + 30_000));
    expect(early).toEqual({ attempted: 0, sent: 0, failed: 0 });
    expect(back.messages).toHaveLength(0);

    const retried = await retryFailedMail(failing.database.db, backMailer, new Date(start + 61_000));
    expect(retried).toMatchObject({ sent: 1, failed: 0 });
    expect(back.messages).toHaveLength(1);
    const [pdf] = back.messages[0]!.attachments;
    expect(pdf!.filename).toBe(`invoice-${invoice.number}.pdf`);
    // ISO 32000-1 §7.5.2: "%PDF-" header.
    expect(pdf!.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const [row] = await outboxRows(failing, invoice.id);
    expect(row).toMatchObject({ status: 'sent', attempts: 2, lastError: null });
    const [stored] = await failing.database.db.select().from(t.invoices).where(eq(t.invoices.id, invoice.id));
    expect(stored!.sentAt?.getTime()).toBe(start + 61_000);

    // Retried again, and twice at once: it is sent, so nothing goes out.
    const later = new Date(start + 3 * 3_600_000);
    const passes = await Promise.all([
      retryFailedMail(failing.database.db, backMailer, later),
      retryFailedMail(failing.database.db, backMailer, later),
    ]);
    expect(passes.map((p) => p.sent)).toEqual([0, 0]);
    expect(back.messages).toHaveLength(1);
  });

  it('sends a failed mail once even when two retry passes race for it', async () => {
    const invoice = await freshInvoice(failing);
    const before = back.messages.length;
    await sendInvoice(failing, invoice.id).expect(202);
    const later = new Date(failing.clock.now.getTime() + 3_600_000);
    const passes = await Promise.all([
      retryFailedMail(failing.database.db, backMailer, later),
      retryFailedMail(failing.database.db, backMailer, later),
    ]);
    expect(passes.reduce((sum, p) => sum + p.sent, 0)).toBe(1);
    expect(back.messages.filter((m) => m.subject.includes(pad(invoice.number)))).toHaveLength(1);
    expect(back.messages).toHaveLength(before + 1);
  });

  it('with ?again tries the waiting failed mail now instead of queueing a copy', async () => {
    const invoice = await freshInvoice(failing);
    await sendInvoice(failing, invoice.id).expect(202);
    const retried = await sendInvoice(failing, invoice.id, '?again=true').expect(202);
    expect(retried.body).toMatchObject({ status: 'failed', attempts: 2 });
    expect(await outboxRows(failing, invoice.id)).toHaveLength(1);
  });

  it('takes up an attempt the server was stopped in, once no attempt could still be running, and sends it once', async () => {
    const invoice = await freshInvoice(failing);
    await sendInvoice(failing, invoice.id).expect(202);
    // What a server killed mid-send leaves: its claim (attempt 2, queued) and nothing after it.
    const claimedAt = new Date(failing.clock.now.getTime() + 60 * 60_000);
    await failing.database.db
      .update(t.outbox)
      .set({ status: 'queued', attempts: 2, attemptedAt: claimedAt })
      .where(eq(t.outbox.invoiceId, invoice.id));
    const mine = () => back.messages.filter((m) => m.subject.includes(pad(invoice.number)));
    const at = (minutes: number) => new Date(claimedAt.getTime() + minutes * 60_000);

    // Five minutes on, it could still be under way: neither the retry pass nor a send again touches it.
    await retryFailedMail(failing.database.db, backMailer, at(5));
    expect(mine()).toHaveLength(0);
    failing.clock.set(at(5));
    const refused = await sendInvoice(failing, invoice.id, '?again=true').expect(409);
    expect(refused.body.error.message).toMatch(/is being sent right now/);

    // Ten minutes on (INTERRUPTED_AFTER_MS), no attempt can still be running: the pass sends it.
    await retryFailedMail(failing.database.db, backMailer, at(10));
    expect(mine()).toHaveLength(1);
    const [row] = await outboxRows(failing, invoice.id);
    expect(row).toMatchObject({ status: 'sent', attempts: 3, lastError: null });
    expect(row!.attemptedAt).toEqual(at(10));
    await retryFailedMail(failing.database.db, backMailer, at(90));
    expect(mine()).toHaveLength(1);
  });

  it('takes up a cut-off attempt made before attempts were timed, and lets a send again try it now', async () => {
    const invoice = await freshInvoice(failing);
    await sendInvoice(failing, invoice.id).expect(202);
    await failing.database.db
      .update(t.outbox)
      .set({ status: 'queued', attempts: 2, attemptedAt: null })
      .where(eq(t.outbox.invoiceId, invoice.id));
    const retried = await request(failing.app)
      .post(`/api/invoices/${invoice.id}/send?again=true`)
      .set(as(failing, 'owner'))
      .expect(202);
    // The dead server is still this app's mailer: the attempt is made (3) and fails, one row still.
    expect(retried.body).toMatchObject({ status: 'failed', attempts: 3 });
    expect(await outboxRows(failing, invoice.id)).toHaveLength(1);
  });

  it('keeps retrying with growing gaps: 1, 2, 4 … minutes, at most an hour', () => {
    // Exponential backoff with a cap: common practice for retry queues, no published source.
    expect([1, 2, 3, 4, 7, 8, 20].map(retryDelayMs)).toEqual([
      60_000, 120_000, 240_000, 480_000, 3_600_000, 3_600_000, 3_600_000,
    ]);
    const createdAt = new Date('2026-11-18T15:00:00Z');
    // After 3 failures: 1 + 2 + 4 = 7 minutes from creation (hand arithmetic).
    expect(nextAttemptAt({ createdAt, attempts: 3 }).toISOString()).toBe('2026-11-18T15:07:00.000Z');
    expect(nextAttemptAt({ createdAt, attempts: 0 })).toEqual(createdAt);
  });
});

describe('POST /api/reminders/:id/send', () => {
  it('mails the customer about the item coming due and marks the reminder sent', async () => {
    const [pending] = await api.database.db
      .select({ reminder: t.reminders, customer: t.customers, interval: t.serviceIntervals })
      .from(t.reminders)
      .innerJoin(t.customers, eq(t.customers.id, t.reminders.customerId))
      .innerJoin(t.serviceIntervals, eq(t.serviceIntervals.id, t.reminders.serviceIntervalId))
      .where(eq(t.reminders.status, 'pending'))
      .limit(1);
    expect(pending, 'the seed has a pending reminder').toBeDefined();
    const before = fake.messages.length;
    const response = await request(api.app)
      .post(`/api/reminders/${pending!.reminder.id}/send`)
      .set(as(api, 'owner'))
      .expect(202);
    const item = OutboxItemSchema.parse(response.body);
    expect(item).toMatchObject({ kind: 'reminder', status: 'sent', to: pending!.customer.email });

    expect(fake.messages).toHaveLength(before + 1);
    const mail = fake.messages.at(-1)!;
    expect(mail.envelopeTo).toEqual([pending!.customer.email]);
    expect(mail.subject).toContain(pending!.interval.label.toLowerCase());
    expect(mail.text).toContain(pending!.reminder.dueOn);
    expect(mail.attachments).toEqual([]);

    const [reminder] = await api.database.db
      .select()
      .from(t.reminders)
      .where(eq(t.reminders.id, pending!.reminder.id));
    expect(reminder).toMatchObject({ status: 'sent', mailId: item.id });
    expect(reminder!.sentAt?.toISOString()).toBe(api.clock.now.toISOString());

    await request(api.app)
      .post(`/api/reminders/${pending!.reminder.id}/send`)
      .set(as(api, 'owner'))
      .expect(409);
    expect(fake.messages).toHaveLength(before + 1);
  });
});

describe('an app without mail set up', () => {
  it('answers 503 "mail is not set up" and queues nothing', async () => {
    const bare = await seededApi({ mailer: null });
    try {
      expect(bare.mail).toBeNull();
      const invoice = await freshInvoice(bare);
      const [{ n: before }] = (await bare.database.db.select({ n: count() }).from(t.outbox)) as [
        { n: number },
      ];
      const response = await sendInvoice(bare, invoice.id).expect(503);
      expect(response.body.error.message).toBe('mail is not set up');
      const [{ n: after }] = (await bare.database.db.select({ n: count() }).from(t.outbox)) as [
        { n: number },
      ];
      expect(after).toBe(before);
    } finally {
      await bare.close();
    }
  });
});
