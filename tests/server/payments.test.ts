import { and, asc, count, eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { PaymentListSchema, RecordedPaymentSchema } from '../../shared/api/invoices';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';
import { freshInvoice } from './access/money';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const db = () => api.database.db;
const owner = () => as(api, 'owner');

function pay(invoiceId: number, body: object) {
  return request(api.app).post(`/api/invoices/${invoiceId}/payments`).set(owner()).send(body);
}
async function invoiceRow(id: number) {
  const [row] = await db().select().from(t.invoices).where(eq(t.invoices.id, id));
  return row!;
}
async function jobStatus(jobId: number) {
  const [row] = await db().select({ status: t.jobs.status }).from(t.jobs).where(eq(t.jobs.id, jobId));
  return row!.status;
}
async function paymentCount(invoiceId: number) {
  const [row] = await db().select({ n: count() }).from(t.payments).where(eq(t.payments.invoiceId, invoiceId));
  return row!.n;
}

describe('recording payments', () => {
  it('takes part payments, then settles the invoice and moves the job to paid', async () => {
    // The default test job totals $393.52 (hand arithmetic in invoices.test.ts).
    const invoice = await freshInvoice(api);
    expect(invoice.totalCents).toBe(39_352);

    const first = RecordedPaymentSchema.parse(
      (await pay(invoice.id, { method: 'cash', amountCents: 10_000 }).expect(201)).body,
    );
    // Hand arithmetic: 39 352 − 10 000 = 29 352 ¢ left.
    expect(first.invoice).toMatchObject({ status: 'part_paid', paidCents: 10_000, balanceCents: 29_352 });
    expect(first.payment).toMatchObject({ method: 'cash', amountCents: 10_000, reference: null });
    expect(first.payment.receivedAt).toBe(SEED_TODAY.toISOString());
    expect(await jobStatus(invoice.jobId)).toBe('invoiced');

    const second = RecordedPaymentSchema.parse(
      (
        await pay(invoice.id, {
          method: 'cheque',
          amountCents: 29_352,
          reference: 'Cheque 2214',
          receivedAt: '2026-11-17T10:30:00-07:00',
        }).expect(201)
      ).body,
    );
    expect(second.invoice).toMatchObject({ status: 'paid', paidCents: 39_352, balanceCents: 0 });
    expect(second.payment.receivedAt).toBe('2026-11-17T17:30:00.000Z');
    expect(await jobStatus(invoice.jobId)).toBe('paid');

    const events = await db()
      .select()
      .from(t.jobEvents)
      .where(eq(t.jobEvents.jobId, invoice.jobId))
      .orderBy(asc(t.jobEvents.id));
    expect(events.map((e) => [e.fromStatus, e.toStatus])).toEqual([
      ['complete', 'invoiced'],
      ['invoiced', 'paid'],
    ]);
    const audits = await db()
      .select()
      .from(t.auditEvents)
      .where(eq(t.auditEvents.action, 'payment.recorded'))
      .orderBy(asc(t.auditEvents.id));
    const mine = audits.filter((a) => (a.details as { invoiceId: number }).invoiceId === invoice.id);
    expect(mine.map((a) => (a.details as { amountCents: number }).amountCents)).toEqual([10_000, 29_352]);

    const detail = await request(api.app).get(`/api/invoices/${invoice.id}`).set(owner()).expect(200);
    expect(detail.body.payments.map((p: { amountCents: number }) => p.amountCents)).toEqual([29_352, 10_000]);
  });

  it('refuses to overpay (409) and changes nothing', async () => {
    const invoice = await freshInvoice(api);
    await pay(invoice.id, { method: 'card', amountCents: 39_000 }).expect(201);
    // Hand arithmetic: 352 ¢ left; 353 is one cent too many.
    const response = await pay(invoice.id, { method: 'card', amountCents: 353 }).expect(409);
    expect(response.body.error.details).toEqual({ balanceCents: 352 });
    expect(await paymentCount(invoice.id)).toBe(1);
    expect(await invoiceRow(invoice.id)).toMatchObject({ paidCents: 39_000, balanceCents: 352 });
  });

  it('takes refunds as negative amounts, reopening the balance, never below zero paid', async () => {
    const invoice = await freshInvoice(api);
    await pay(invoice.id, { method: 'card', amountCents: 39_352 }).expect(201);
    expect(await jobStatus(invoice.jobId)).toBe('paid');

    const refund = await pay(invoice.id, { method: 'card', amountCents: -5_000 }).expect(201);
    // Hand arithmetic: 39 352 − 5 000 = 34 352 ¢ paid, 5 000 ¢ open again.
    expect(refund.body.invoice).toMatchObject({
      status: 'part_paid',
      paidCents: 34_352,
      balanceCents: 5_000,
    });
    expect(await jobStatus(invoice.jobId)).toBe('invoiced');
    const audits = await db()
      .select()
      .from(t.auditEvents)
      .where(
        and(
          eq(t.auditEvents.action, 'payment.refunded'),
          eq(t.auditEvents.entityId, String(refund.body.payment.id)),
        ),
      );
    expect(audits).toHaveLength(1);

    await pay(invoice.id, { method: 'card', amountCents: -34_353 }).expect(409);
    const all = await pay(invoice.id, { method: 'card', amountCents: -34_352 }).expect(201);
    expect(all.body.invoice).toMatchObject({ status: 'issued', paidCents: 0, balanceCents: 39_352 });
  });

  it('refuses payments on a void invoice (409)', async () => {
    const invoice = await freshInvoice(api);
    await request(api.app)
      .patch(`/api/invoices/${invoice.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(200);
    await pay(invoice.id, { method: 'cash', amountCents: 100 }).expect(409);
    expect(await paymentCount(invoice.id)).toBe(0);
  });

  it('lets only one of two payments that each fit, but not together, through at once', async () => {
    const invoice = await freshInvoice(api);
    const responses = await Promise.all([
      pay(invoice.id, { method: 'cash', amountCents: 30_000 }),
      pay(invoice.id, { method: 'card', amountCents: 30_000 }),
    ]);
    expect(responses.map((r) => r.status).sort()).toEqual([201, 409]);
    expect(await invoiceRow(invoice.id)).toMatchObject({ paidCents: 30_000, balanceCents: 9_352 });
  });

  it('refuses malformed bodies with 400 and records nothing', async () => {
    const invoice = await freshInvoice(api);
    for (const body of [
      { method: 'cash', amountCents: 0 },
      { method: 'cash', amountCents: 12.5 },
      { method: 'cash', amountCents: '100' },
      { method: 'barter', amountCents: 100 },
      { method: 'cash' },
      { method: 'cash', amountCents: 100, receivedAt: 'yesterday' },
      { method: 'cash', amountCents: 100, invoiceId: 1 },
    ]) {
      await pay(invoice.id, body).expect(400);
    }
    await pay(999_999, { method: 'cash', amountCents: 100 }).expect(404);
    expect(await paymentCount(invoice.id)).toBe(0);
    expect(await invoiceRow(invoice.id)).toMatchObject({ paidCents: 0, status: 'issued' });
  });

  it('keeps balance = total − paid on every invoice (the table’s check, and the rows)', async () => {
    const broken = await queryRows<{ id: number }>(
      db(),
      sql`select id from invoices where balance_cents <> total_cents - paid_cents
          or paid_cents <> coalesce((select sum(amount_cents) from payments p where p.invoice_id = invoices.id), 0)`,
    );
    expect(broken).toEqual([]);
  });
});

describe('listing payments', () => {
  it('pages an invoice’s payments, newest first', async () => {
    const invoice = await freshInvoice(api);
    for (const cents of [100, 200, 300])
      await pay(invoice.id, { method: 'cash', amountCents: cents }).expect(201);
    const first = PaymentListSchema.parse(
      (
        await request(api.app)
          .get(`/api/invoices/${invoice.id}/payments`)
          .query({ limit: 2 })
          .set(as(api, 'bookkeeper'))
          .expect(200)
      ).body,
    );
    expect(first.items.map((p) => p.amountCents)).toEqual([300, 200]);
    const second = await request(api.app)
      .get(`/api/invoices/${invoice.id}/payments`)
      .query({ limit: 2, cursor: first.nextCursor })
      .set(as(api, 'bookkeeper'))
      .expect(200);
    expect(second.body.items.map((p: { amountCents: number }) => p.amountCents)).toEqual([100]);
    expect(second.body.nextCursor).toBeNull();
  });

  it('shows a customer the payments on their own invoices only (404 otherwise)', async () => {
    const mine = await freshInvoice(api);
    const theirs = await freshInvoice(api, { customerEmail: 'rowan@example.test' });
    await pay(mine.id, { method: 'cash', amountCents: 700 }).expect(201);
    await pay(theirs.id, { method: 'cash', amountCents: 900 }).expect(201);
    const own = await request(api.app)
      .get(`/api/invoices/${mine.id}/payments`)
      .set(as(api, 'customer'))
      .expect(200);
    expect(own.body.items.map((p: { amountCents: number }) => p.amountCents)).toEqual([700]);
    await request(api.app).get(`/api/invoices/${theirs.id}/payments`).set(as(api, 'customer')).expect(404);
    // A customer pays through the card link (another part of the API), not by recording payments.
    await request(api.app)
      .post(`/api/invoices/${mine.id}/payments`)
      .set(as(api, 'customer'))
      .send({ method: 'card', amountCents: 100 })
      .expect(403);
  });
});
