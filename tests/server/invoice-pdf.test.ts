import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { differenceInCalendarDays } from 'date-fns';
import { asc, eq, sql } from 'drizzle-orm';
import { execa } from 'execa';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { invoiceTotals } from '../../shared/money';
import { getBinary, readPdf, squash } from '../helpers/pdf';
import { as, seededApi, type Caller, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';
import { freshInvoice } from './access/money';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

function getPdf(invoiceId: number, caller: Caller = 'owner', query = '') {
  return getBinary(api.app, `/api/invoices/${invoiceId}/pdf${query}`, as(api, caller));
}

/** The cross-check formatter: ECMA-402 Intl.NumberFormat, en-US dollars (not the code under test). */
const dollars = (cents: number) =>
  new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' }).format(cents / 100);

async function invoiceByNumber(number: number) {
  const [row] = await api.database.db.select().from(t.invoices).where(eq(t.invoices.number, number));
  return row!;
}

describe('GET /api/invoices/:id/pdf — a seeded invoice', () => {
  it('prints invoice 39 with the stored figures, which shared/money.ts reproduces from the job', async () => {
    const invoice = await invoiceByNumber(39);
    const [customer] = await api.database.db
      .select()
      .from(t.customers)
      .where(eq(t.customers.id, invoice.customerId));
    expect(customer!.email).toBe('jules@example.test');
    const items = await api.database.db
      .select()
      .from(t.lineItems)
      .where(eq(t.lineItems.jobId, invoice.jobId))
      .orderBy(asc(t.lineItems.position));
    // Hand arithmetic, invoice 39 at 6.25 %, tax rounded half up once per invoice (SSUTA §324):
    // labour 1 h × $95.00 = $95.00 (not taxed); supplies $6.50 × 1.25 markup = $8.125 → $8.13
    // (half up); call-out $47.00 (not taxed). Subtotal 95.00 + 8.13 + 47.00 = $150.13; tax
    // 8.13 × 0.0625 = 0.508125 → $0.51; total $150.64; nothing paid, so the balance is $150.64.
    expect([invoice.subtotalCents, invoice.taxCents, invoice.totalCents, invoice.balanceCents]).toEqual([
      15_013, 51, 15_064, 15_064,
    ]);
    const totals = invoiceTotals(items, invoice.taxRatePpm, invoice.taxRounding);
    expect(totals).toMatchObject({
      subtotalCents: invoice.subtotalCents,
      taxCents: invoice.taxCents,
      totalCents: invoice.totalCents,
    });

    const response = await getPdf(invoice.id).expect(200);
    expect(response.headers['content-type']).toMatch(/^application\/pdf/);
    expect(response.headers['content-disposition']).toBe('inline; filename="invoice-39.pdf"');
    const body = response.body as Buffer;
    expect(body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const pages = await readPdf(body);
    const text = squash(pages.map((page) => page.text).join(' '));

    const [machine] = await api.database.db
      .select()
      .from(t.machines)
      .innerJoin(t.jobs, eq(t.jobs.machineId, t.machines.id))
      .where(eq(t.jobs.id, invoice.jobId));
    const expected = [
      'Invoice',
      'No. 0039',
      customer!.name,
      customer!.email!,
      'Ridgeback Mobile Moto',
      'Morgan Avery',
      '41 Quarry Bend Road',
      `${machine!.machines.year} ${machine!.machines.make} ${machine!.machines.model}`,
      `VIN ${machine!.machines.vin}`,
      // Thousands grouped as en-US writes them (ECMA-402 Intl.NumberFormat as the cross-check).
      `${new Intl.NumberFormat('en-US', { maximumFractionDigits: 1 }).format(machine!.jobs.meterReading!)} ${machine!.machines.meterUnit}`,
      ...items.map((item) => item.description),
      'Subtotal',
      dollars(invoice.subtotalCents),
      dollars(invoice.taxCents),
      // 62500 ppm is 6.25 % (parts per million ÷ 10 000, by definition of the unit).
      'Sales tax 6.25 %',
      'Tax rounded half up per invoice (SSUTA §324)',
      `Total ${dollars(invoice.totalCents)}`,
      `Balance due ${dollars(invoice.balanceCents)}`,
      'Net 14 days',
      'Due within 14 days.',
      'Thank you for riding with Ridgeback.',
      'Page 1 of 1',
    ];
    for (const phrase of expected) expect(text, phrase).toContain(squash(phrase));
    // Not paid, not void, not yet due on the seed's today: no stamp, no overdue line, no pay link.
    expect(text).not.toContain('PAID');
    expect(text).not.toContain('Overdue');
    expect(text).not.toContain('Paybycard');
  });

  it('stamps a paid invoice and lists the payment that settled it', async () => {
    const invoice = await invoiceByNumber(1);
    const [payment] = await api.database.db
      .select()
      .from(t.payments)
      .where(eq(t.payments.invoiceId, invoice.id));
    expect(invoice.status).toBe('paid');
    const text = squash(
      (await readPdf((await getPdf(invoice.id).expect(200)).body)).map((p) => p.text).join(' '),
    );
    expect(text).toContain('PAID');
    expect(text).toContain(squash(`Paid to date ${dollars(invoice.paidCents)}`));
    // Balance = total − paid (the invoices_balance_check constraint): 39352 − 39352 = 0.
    expect(text).toContain(squash(`Balance due ${dollars(0)}`));
    const method = { card: 'Card', cash: 'Cash', cheque: 'Cheque', transfer: 'Bank transfer' }[
      payment!.method
    ];
    expect(text).toContain(squash(method));
    expect(text).toContain(squash(dollars(payment!.amountCents)));
  });

  it('says how long an unpaid invoice is past its due date', async () => {
    const invoice = await invoiceByNumber(3);
    expect(invoice.status).toBe('issued');
    // Day count cross-checked with date-fns differenceInCalendarDays (seed today 2026-11-18, Denver).
    const days = differenceInCalendarDays(
      new Date('2026-11-18T12:00:00Z'),
      new Date(`${invoice.dueOn}T12:00:00Z`),
    );
    expect(days).toBeGreaterThan(0);
    expect(SEED_TODAY.toISOString().slice(0, 10)).toBe('2026-11-18');
    const text = squash(
      (await readPdf((await getPdf(invoice.id).expect(200)).body)).map((p) => p.text).join(' '),
    );
    expect(text).toContain(squash(`Overdue: ${days} days past the due date`));
  });

  it('prints the card payment line only when the invoice has a payment link', async () => {
    const { id } = await freshInvoice(api);
    const before = squash((await readPdf((await getPdf(id).expect(200)).body)).map((p) => p.text).join(' '));
    expect(before).not.toContain('Paybycard');
    const url = 'https://pay.ridgeback.test/session/abc123';
    await api.database.db.update(t.invoices).set({ paymentLinkUrl: url }).where(eq(t.invoices.id, id));
    const after = squash((await readPdf((await getPdf(id).expect(200)).body)).map((p) => p.text).join(' '));
    expect(after).toContain(squash(`Pay by card online: ${url}`));
  });

  it('stamps a void invoice VOID and asks for nothing', async () => {
    const { id } = await freshInvoice(api);
    await request(api.app)
      .patch(`/api/invoices/${id}`)
      .set(as(api, 'owner'))
      .send({ status: 'void' })
      .expect(200);
    const text = squash((await readPdf((await getPdf(id).expect(200)).body)).map((p) => p.text).join(' '));
    expect(text).toContain('VOID');
    expect(text).toContain(squash('Void: nothing to pay'));
    expect(text).not.toContain('Balancedue');
  });
});

describe('paper', () => {
  // ANSI Letter is 8.5 × 11 in = 612 × 792 pt; ISO 216 A4 is 210 × 297 mm = 595.28 × 841.89 pt
  // at 72 pt per inch and 25.4 mm per inch (from memory).
  it.each([
    ['', 612, 792],
    ['?paper=letter', 612, 792],
    ['?paper=a4', 595.28, 841.89],
  ])('%s gives %d × %d pt', async (query, width, height) => {
    const invoice = await invoiceByNumber(39);
    const [page] = await readPdf((await getPdf(invoice.id, 'owner', query).expect(200)).body);
    expect(page!.width).toBeCloseTo(width, 1);
    expect(page!.height).toBeCloseTo(height, 1);
  });

  it.each(['?paper=legal', '?paper=', '?paper=a4&paper=letter', '?size=a4'])(
    '%s is a 400 in the error format',
    async (query) => {
      const invoice = await invoiceByNumber(39);
      const response = await request(api.app)
        .get(`/api/invoices/${invoice.id}/pdf${query}`)
        .set(as(api, 'owner'))
        .expect(400);
      expect(response.body.error.code).toBe('bad_request');
    },
  );
});

describe('a long invoice', () => {
  const filler = ['carburettor', 'float bowl', 'gasket', 'jet needle', 'throttle cable', 'air box', 'clamp'];
  /** Descriptions of one to eight printed lines (long enough to straddle a page foot), each unique. */
  const description = (n: number) =>
    `Item ${String(n).padStart(2, '0')} ${Array.from({ length: 1 + ((n * 7) % 41) }, (_, i) => filler[(n + i) % filler.length]).join(' ')}`;

  it('runs to several pages, never splits a line and repeats the table header', async () => {
    const { id } = await freshInvoice(api);
    const [invoice] = await api.database.db.select().from(t.invoices).where(eq(t.invoices.id, id));
    await api.database.db.delete(t.invoiceLines).where(eq(t.invoiceLines.invoiceId, id));
    const descriptions = Array.from({ length: 60 }, (_, i) => description(i + 1));
    await api.database.db.insert(t.invoiceLines).values(
      descriptions.map((text, position) => ({
        businessId: invoice!.businessId,
        invoiceId: id,
        position,
        kind: 'part' as const,
        description: text,
        quantityMilli: 1000 + position,
        unitPriceCents: 1000 + position,
        lineTotalCents: 1000 + position,
        taxCents: 0,
      })),
    );
    const [count] = await api.database.db
      .select({ n: sql<number>`count(*)::int` })
      .from(t.invoiceLines)
      .where(eq(t.invoiceLines.invoiceId, id));
    expect(count!.n).toBe(60);

    const pages = await readPdf((await getPdf(id).expect(200)).body);
    expect(pages.length).toBeGreaterThanOrEqual(3);
    const squashed = pages.map((page) => squash(page.text));
    for (const text of descriptions) {
      const holders = squashed.filter((page) => page.includes(squash(text)));
      expect(holders, text).toHaveLength(1);
    }
    squashed.forEach((page, index) => {
      expect(page).toContain(squash(`Page ${index + 1} of ${pages.length}`));
      expect(page).toContain('0'.repeat(4 - String(invoice!.number).length) + invoice!.number);
    });
    // Every page that carries line items carries the column heads above them.
    for (const page of squashed.filter((p) => p.includes('Item'))) {
      expect(page).toContain(squash('Description Qty Unit price Amount'));
    }
  });
});

describe('who may read it', () => {
  async function firstInvoiceOf(email: string) {
    const [row] = await api.database.db
      .select({ id: t.invoices.id })
      .from(t.invoices)
      .innerJoin(t.customers, eq(t.customers.id, t.invoices.customerId))
      .where(eq(t.customers.email, email))
      .orderBy(asc(t.invoices.id))
      .limit(1);
    return row!.id;
  }

  it('gives a customer their own invoice and hides another customer’s (404)', async () => {
    const own = await firstInvoiceOf('jules@example.test');
    const other = await firstInvoiceOf('rowan@example.test');
    const mine = await getPdf(own, 'customer').expect(200);
    expect(mine.headers['content-type']).toMatch(/^application\/pdf/);
    const theirs = await request(api.app)
      .get(`/api/invoices/${other}/pdf`)
      .set(as(api, 'customer'))
      .expect(404);
    expect(theirs.body.error.code).toBe('not_found');
  });

  it.each([
    ['bookkeeper', 200],
    ['owner', 200],
    ['helper', 403],
    ['anonymous', 401],
  ] as const)('as %s: %d', async (caller, status) => {
    const id = await firstInvoiceOf('rowan@example.test');
    await request(api.app).get(`/api/invoices/${id}/pdf`).set(as(api, caller)).expect(status);
  });

  it('answers 404 for an invoice that does not exist', async () => {
    await request(api.app).get('/api/invoices/999999/pdf').set(as(api, 'owner')).expect(404);
  });
});

describe('the look', () => {
  it('renders page 1 of invoice 1 to tests/e2e/screenshots/invoice-page1.png', async () => {
    const invoice = await invoiceByNumber(1);
    const dir = mkdtempSync(path.join(tmpdir(), 'vanbay-pdf-'));
    const pdfPath = path.join(dir, 'invoice.pdf');
    writeFileSync(pdfPath, (await getPdf(invoice.id).expect(200)).body as Buffer);
    const out = path.resolve('tests/e2e/screenshots');
    mkdirSync(out, { recursive: true });
    await execa('pdftoppm', [
      '-png',
      '-r',
      '80',
      '-f',
      '1',
      '-l',
      '1',
      '-singlefile',
      pdfPath,
      path.join(out, 'invoice-page1'),
    ]);
    // 8.5 in × 80 dpi = 680 px wide (ANSI Letter, from memory): pdftoppm drew the whole sheet.
    const png = readFileSync(path.join(out, 'invoice-page1.png'));
    // The PNG IHDR chunk holds width and height as big-endian words at bytes 16 and 20 (RFC 2083).
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([680, 880]);
  });
});
