import Decimal from 'decimal.js';
import { and, count, eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { InvoiceDetailSchema, InvoiceListSchema, type Invoice } from '../../shared/api/invoices';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';
import { completeJob, freshInvoice } from './access/money';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());
afterEach(() => api.clock.set(new Date(SEED_TODAY)));

const db = () => api.database.db;
const owner = () => as(api, 'owner');

async function lastNumber(): Promise<number> {
  const [row] = await db().select({ n: t.invoiceCounters.lastNumber }).from(t.invoiceCounters);
  return row!.n;
}
async function invoiceCount(): Promise<number> {
  const [row] = await db().select({ n: count() }).from(t.invoices);
  return row!.n;
}
async function jobStatus(jobId: number) {
  const [row] = await db().select({ status: t.jobs.status }).from(t.jobs).where(eq(t.jobs.id, jobId));
  return row!.status;
}
async function allInvoices(query: Record<string, string | number>, caller = owner()): Promise<Invoice[]> {
  const items: Invoice[] = [];
  let cursor: string | null = null;
  do {
    const response = await request(api.app)
      .get('/api/invoices')
      .query({ ...query, limit: 7, ...(cursor ? { cursor } : {}) })
      .set(caller)
      .expect(200);
    const page = InvoiceListSchema.parse(response.body);
    items.push(...page.items);
    cursor = page.nextCursor;
  } while (cursor);
  return items;
}

describe('issuing an invoice', () => {
  it('bills a complete job from its line items, numbered next, due after the terms', async () => {
    const before = await lastNumber();
    const jobId = await completeJob(api);
    const response = await request(api.app).post('/api/invoices').set(owner()).send({ jobId }).expect(201);
    const invoice = InvoiceDetailSchema.parse(response.body);

    // Hand arithmetic: labour 1.5 h × $95.00 = $142.50 (not taxable); part $189.00 + 25 % markup
    // = $236.25 (taxable). Subtotal $378.75. Tax 6.25 % of $236.25 = $14.765625, rounded half up
    // to the cent (SSUTA §324) = $14.77, once for the invoice (the seeded per_invoice setting).
    expect(invoice.lines.map((l) => l.lineTotalCents)).toEqual([14_250, 23_625]);
    expect(invoice.subtotalCents).toBe(37_875);
    expect(invoice.taxCents).toBe(1_477);
    expect(invoice.totalCents).toBe(39_352);
    expect(invoice.balanceCents).toBe(39_352);
    expect(invoice.paidCents).toBe(0);
    expect(invoice).toMatchObject({
      number: before + 1,
      jobId,
      status: 'issued',
      taxRatePpm: 62_500,
      taxRounding: 'per_invoice',
      customerName: 'Jules Marchetti',
      overdue: false,
      daysOverdue: 0,
      payments: [],
    });
    // The clock reads 2026-11-18T15:00Z = 08:00 in Cinder Valley (America/Denver, UTC−7 in November).
    expect(invoice.issuedOn).toBe('2026-11-18');
    // Hand arithmetic: 2026-11-18 + 14 days (the business's terms) = 2026-12-02.
    expect(invoice.dueOn).toBe('2026-12-02');
    expect(await lastNumber()).toBe(before + 1);
    expect(await jobStatus(jobId)).toBe('invoiced');

    const events = await db().select().from(t.jobEvents).where(eq(t.jobEvents.jobId, jobId));
    expect(events).toEqual([expect.objectContaining({ fromStatus: 'complete', toStatus: 'invoiced' })]);
    const audits = await db()
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'invoice.issued'), eq(t.auditEvents.entityId, String(invoice.id))));
    expect(audits).toHaveLength(1);
    expect(audits[0]!.details).toMatchObject({ number: invoice.number, totalCents: 39_352 });
  });

  it('keeps the lines as billed when the job is edited afterwards', async () => {
    const invoice = await freshInvoice(api);
    await db()
      .update(t.lineItems)
      .set({ unitPriceCents: 1, description: 'changed later' })
      .where(eq(t.lineItems.jobId, invoice.jobId));
    const response = await request(api.app).get(`/api/invoices/${invoice.id}`).set(owner()).expect(200);
    const detail = InvoiceDetailSchema.parse(response.body);
    expect(detail.lines.map((l) => [l.description, l.unitPriceCents])).toEqual([
      ['Fuel delivery check', 9_500],
      ['Fuel pump assembly', 18_900],
    ]);
    expect(detail.totalCents).toBe(39_352);
  });

  it("dates the invoice on the business's calendar, not UTC's", async () => {
    // 2026-11-19T05:30Z is 22:30 on 2026-11-18 in America/Denver (UTC−7 after DST ends on the
    // first Sunday of November, 15 U.S.C. §260a).
    api.clock.set(new Date('2026-11-19T05:30:00Z'));
    const invoice = await freshInvoice(api);
    const response = await request(api.app).get(`/api/invoices/${invoice.id}`).set(owner()).expect(200);
    expect(response.body.issuedOn).toBe('2026-11-18');
  });

  it('rounds per line when the business says so (SSUTA §324 allows either)', async () => {
    await db().update(t.businesses).set({ taxRounding: 'per_line' });
    try {
      const twoTens = await freshInvoice(api, {
        lines: [
          { kind: 'part', description: 'Plug', quantityMilli: 1000, unitPriceCents: 1000, taxable: true },
          { kind: 'part', description: 'Plug', quantityMilli: 1000, unitPriceCents: 1000, taxable: true },
        ],
      });
      const detail = InvoiceDetailSchema.parse(
        (await request(api.app).get(`/api/invoices/${twoTens.id}`).set(owner())).body,
      );
      // Hand arithmetic: 6.25 % of $10.00 = 62.5 ¢, half up to 63 ¢ on each line (SSUTA §324):
      // 126 ¢; rounded once on $20.00 it would be 125 ¢.
      expect(detail.lines.map((l) => l.taxCents)).toEqual([63, 63]);
      expect(detail.taxCents).toBe(126);
      expect(detail.totalCents).toBe(2_126);
      expect(detail.taxRounding).toBe('per_line');

      const example = await freshInvoice(api, {
        lines: [
          { kind: 'part', description: 'Filter', quantityMilli: 1000, unitPriceCents: 1099, taxable: true },
        ],
      });
      // REFERENCES.md, SSUTA §324 example: $10.99 × 6.25 % = 0.686875 → $0.69.
      expect(new Decimal(10.99).times(0.0625).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toNumber()).toBe(
        0.69,
      );
      expect(example.totalCents).toBe(1_099 + 69);
    } finally {
      await db().update(t.businesses).set({ taxRounding: 'per_invoice' });
    }
  });

  it('refuses a job that is not complete, has no lines or is already billed (409), changing nothing', async () => {
    const notDone = await completeJob(api, { status: 'repairing' });
    const noLines = await completeJob(api, { lines: [] });
    const billed = (await freshInvoice(api)).jobId;
    const [numberBefore, countBefore] = [await lastNumber(), await invoiceCount()];
    for (const jobId of [notDone, noLines, billed]) {
      const response = await request(api.app).post('/api/invoices').set(owner()).send({ jobId }).expect(409);
      expect(response.body.error.code).toBe('conflict');
    }
    expect(await lastNumber()).toBe(numberBefore);
    expect(await invoiceCount()).toBe(countBefore);
    expect(await jobStatus(notDone)).toBe('repairing');
    expect(await jobStatus(noLines)).toBe('complete');
  });

  it('refuses bad bodies with 400 and an unknown job with 404', async () => {
    const countBefore = await invoiceCount();
    for (const body of [{}, { jobId: 'x' }, { jobId: 1.5 }, { jobId: -1 }, { jobId: 1, total: 5 }]) {
      await request(api.app).post('/api/invoices').set(owner()).send(body).expect(400);
    }
    await request(api.app).post('/api/invoices').set(owner()).send({ jobId: 999_999 }).expect(404);
    expect(await invoiceCount()).toBe(countBefore);
  });

  it('hands out gapless, unique numbers to 10 invoices issued at once', async () => {
    const before = await lastNumber();
    const jobs = await Promise.all(Array.from({ length: 10 }, () => completeJob(api)));
    const responses = await Promise.all(
      jobs.map((jobId) => request(api.app).post('/api/invoices').set(owner()).send({ jobId })),
    );
    expect(responses.map((r) => r.status)).toEqual(Array(10).fill(201));
    const numbers = responses.map((r) => r.body.number as number).sort((a, b) => a - b);
    // Contiguous from the next number: no gaps, no repeats.
    expect(numbers).toEqual(Array.from({ length: 10 }, (_, i) => before + 1 + i));
    expect(await lastNumber()).toBe(before + 10);
    const duplicates = await queryRows<{ number: number }>(
      db(),
      sql`select number from invoices group by business_id, number having count(*) > 1`,
    );
    expect(duplicates).toEqual([]);
  });

  it('bills one job once even when asked three times at once', async () => {
    const jobId = await completeJob(api);
    const before = await lastNumber();
    const responses = await Promise.all(
      [1, 2, 3].map(() => request(api.app).post('/api/invoices').set(owner()).send({ jobId })),
    );
    expect(responses.map((r) => r.status).sort()).toEqual([201, 409, 409]);
    expect(await lastNumber()).toBe(before + 1);
  });
});

describe('listing invoices', () => {
  it('pages through all of them, newest first, without repeats', async () => {
    const items = await allInvoices({});
    expect(items.length).toBe(await invoiceCount());
    expect(new Set(items.map((i) => i.id)).size).toBe(items.length);
    expect([...items].sort((a, b) => b.id - a.id)).toEqual(items);
  });

  it('derives overdue from the due date on the business calendar, and filters by it', async () => {
    const overdue = await allInvoices({ status: 'overdue' });
    // Independent query of the rule: open balance, not void, due before today (2026-11-18 in Denver).
    const expected = await queryRows<{ id: number }>(
      db(),
      sql`select id from invoices where status <> 'void' and total_cents - paid_cents > 0
          and due_on < '2026-11-18' order by id desc`,
    );
    expect(overdue.map((i) => i.id)).toEqual(expected.map((r) => r.id));
    expect(overdue.every((i) => i.overdue)).toBe(true);
    // The seed's unpaid invoice 3 was due 2026-10-25; hand arithmetic: 6 days to Oct 31 + 18 = 24.
    const third = overdue.find((i) => i.number === 3);
    expect(third).toMatchObject({ status: 'issued', dueOn: '2026-10-25', daysOverdue: 24 });
    // The part-paid one (number 5, due 2026-10-28): 3 + 18 = 21 days.
    expect(overdue.find((i) => i.number === 5)).toMatchObject({ status: 'part_paid', daysOverdue: 21 });
    const notOverdue = (await allInvoices({})).filter((i) => !i.overdue);
    expect(notOverdue.every((i) => i.daysOverdue === 0)).toBe(true);
  });

  it('filters by status, customer, job, open balance and issue dates', async () => {
    const paid = await allInvoices({ status: 'paid' });
    expect(paid.length).toBeGreaterThan(0);
    expect(paid.every((i) => i.status === 'paid' && i.balanceCents === 0)).toBe(true);

    const all = await allInvoices({});
    const someone = all[0]!;
    const theirs = await allInvoices({ customerId: someone.customerId });
    expect(theirs.map((i) => i.id)).toEqual(
      all.filter((i) => i.customerId === someone.customerId).map((i) => i.id),
    );
    expect((await allInvoices({ jobId: someone.jobId })).map((i) => i.jobId)).toEqual([someone.jobId]);

    const unpaid = await allInvoices({ unpaid: 'true' });
    expect(unpaid.map((i) => i.id)).toEqual(
      all.filter((i) => i.balanceCents > 0 && i.status !== 'void').map((i) => i.id),
    );
    const settled = await allInvoices({ unpaid: 'false' });
    expect(settled.length + unpaid.length).toBe(all.length);

    const early = await allInvoices({ from: '2026-10-10', to: '2026-10-14' });
    expect(early.map((i) => i.id)).toEqual(
      all.filter((i) => i.issuedOn >= '2026-10-10' && i.issuedOn <= '2026-10-14').map((i) => i.id),
    );
    // From the seed: invoices 2 to 6 were issued from 2026-10-10 to 2026-10-14.
    expect(early.map((i) => i.number).sort((a, b) => a - b)).toEqual([2, 3, 4, 5, 6]);
  });

  it('refuses bad filters with 400', async () => {
    for (const query of [
      { status: 'late' },
      { from: '2026-13-01' },
      { unpaid: 'yes' },
      { customerId: 'x' },
    ]) {
      await request(api.app).get('/api/invoices').query(query).set(owner()).expect(400);
    }
  });
});

describe('a customer sees only their own invoices', () => {
  it('lists only theirs and gets 404 for anyone else’s', async () => {
    const [jules] = await db()
      .select({ id: t.customers.id })
      .from(t.customers)
      .where(eq(t.customers.email, 'jules@example.test'));
    const mine = await allInvoices({}, as(api, 'customer'));
    expect(mine.length).toBeGreaterThan(0);
    expect(mine.every((i) => i.customerId === jules!.id)).toBe(true);
    const expected = await db()
      .select({ n: count() })
      .from(t.invoices)
      .where(eq(t.invoices.customerId, jules!.id));
    expect(mine.length).toBe(expected[0]!.n);

    const others = await allInvoices({ customerId: jules!.id + 1 });
    expect(others.length).toBeGreaterThan(0);
    await request(api.app).get(`/api/invoices/${others[0]!.id}`).set(as(api, 'customer')).expect(404);
    expect(await allInvoices({ customerId: jules!.id + 1 }, as(api, 'customer'))).toEqual([]);
    await request(api.app).get(`/api/invoices/${mine[0]!.id}`).set(as(api, 'customer')).expect(200);
  });
});

describe('voiding an invoice', () => {
  it('voids an unpaid invoice, reopens the job to be billed again, and audits it', async () => {
    const invoice = await freshInvoice(api);
    const response = await request(api.app)
      .patch(`/api/invoices/${invoice.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(200);
    expect(response.body).toMatchObject({ status: 'void', overdue: false });
    expect(response.body.voidedAt).toBe(SEED_TODAY.toISOString());
    expect(await jobStatus(invoice.jobId)).toBe('complete');
    const events = await db().select().from(t.jobEvents).where(eq(t.jobEvents.jobId, invoice.jobId));
    expect(events.map((e) => [e.fromStatus, e.toStatus])).toEqual([
      ['complete', 'invoiced'],
      ['invoiced', 'complete'],
    ]);
    const audits = await db()
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'invoice.voided'), eq(t.auditEvents.entityId, String(invoice.id))));
    expect(audits).toHaveLength(1);

    // Voided, the job may be billed again under the next number.
    const before = await lastNumber();
    const again = await request(api.app)
      .post('/api/invoices')
      .set(owner())
      .send({ jobId: invoice.jobId })
      .expect(201);
    expect(again.body.number).toBe(before + 1);
    await request(api.app)
      .patch(`/api/invoices/${invoice.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(409);
  });

  it('is held by the database too: a second live invoice for a job is refused, a void one is not', async () => {
    const invoice = await freshInvoice(api);
    const copy = (number: number, status: 'issued' | 'void') =>
      db()
        .execute(
          sql`insert into invoices (business_id, number, job_id, customer_id, status, issued_on, due_on,
                subtotal_cents, tax_cents, total_cents, paid_cents, balance_cents, tax_rate_ppm, tax_rounding, terms)
              select business_id, ${number}, job_id, customer_id, ${status}, issued_on, due_on, subtotal_cents,
                tax_cents, total_cents, paid_cents, balance_cents, tax_rate_ppm, tax_rounding, terms
              from invoices where id = ${invoice.id}`,
        )
        .then(
          () => 'stored',
          (e: Error & { cause?: Error }) => String(e.cause?.message ?? e.message),
        );
    const next = (await lastNumber()) + 1_000;
    expect(await copy(next, 'issued')).toMatch(/invoices_job_live_key/);
    expect(await copy(next + 1, 'void')).toBe('stored');
    await db().delete(t.invoices).where(eq(t.invoices.number, next + 1));
  });

  it('refuses to void once anything is paid (409)', async () => {
    const invoice = await freshInvoice(api);
    await request(api.app)
      .post(`/api/invoices/${invoice.id}/payments`)
      .set(owner())
      .send({ method: 'cash', amountCents: 500 })
      .expect(201);
    await request(api.app)
      .patch(`/api/invoices/${invoice.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(409);
    const [row] = await db().select().from(t.invoices).where(eq(t.invoices.id, invoice.id));
    expect(row!.status).toBe('part_paid');
  });

  it('takes only { status: "void" } and only from the owner', async () => {
    const invoice = await freshInvoice(api);
    for (const body of [{ status: 'paid' }, { status: 'void', totalCents: 0 }, {}, { totalCents: 0 }]) {
      await request(api.app).patch(`/api/invoices/${invoice.id}`).set(owner()).send(body).expect(400);
    }
    await request(api.app)
      .patch(`/api/invoices/${invoice.id}`)
      .set(as(api, 'bookkeeper'))
      .send({ status: 'void' })
      .expect(403);
    const [row] = await db().select().from(t.invoices).where(eq(t.invoices.id, invoice.id));
    expect(row!.status).toBe('issued');
  });
});
