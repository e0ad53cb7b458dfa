import { and, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { demoBusiness } from '../../server/db/seed-data';
import { BusinessSettingsSchema, type BusinessSettings } from '../../shared/api/business';
import { InvoiceDetailSchema } from '../../shared/api/invoices';
import { LineItemSchema } from '../../shared/api/line-items';
import { as, seededApi, type TestApi } from '../helpers/api';
import { completeJob, freshInvoice } from './access/money';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const owner = () => as(api, 'owner');

async function settings(): Promise<BusinessSettings> {
  const response = await request(api.app).get('/api/business').set(owner()).expect(200);
  return BusinessSettingsSchema.parse(response.body);
}

describe('the business settings', () => {
  it('reads the seeded profile and money settings, the same for every staff role', async () => {
    const mine = await settings();
    expect(mine).toMatchObject({
      name: demoBusiness.name,
      ownerName: demoBusiness.ownerName,
      addressLines: demoBusiness.addressLines,
      timezone: demoBusiness.timezone,
      labourRateCents: demoBusiness.labourRateCents,
      partsMarkupBps: demoBusiness.partsMarkupBps,
      tripFeeBaseCents: demoBusiness.tripFeeBaseCents,
      tripFeePerMileCents: demoBusiness.tripFeePerMileCents,
      tripFeeFreeMiles: demoBusiness.tripFeeFreeMiles,
      taxRatePpm: demoBusiness.taxRatePpm,
      invoiceTermsDays: demoBusiness.invoiceTermsDays,
    });
    for (const role of ['helper', 'bookkeeper'] as const) {
      const theirs = await request(api.app).get('/api/business').set(as(api, role)).expect(200);
      expect(theirs.body).toEqual(mine);
    }
  });

  it('prices new labour at a changed rate and leaves an issued invoice as billed', async () => {
    const before = await freshInvoice(api);
    const response = await request(api.app)
      .patch('/api/business')
      .set(owner())
      .send({ labourRateCents: 11_000 })
      .expect(200);
    expect(BusinessSettingsSchema.parse(response.body)).toMatchObject({
      labourRateCents: 11_000,
      partsMarkupBps: demoBusiness.partsMarkupBps,
    });
    expect((await settings()).labourRateCents).toBe(11_000);

    const jobId = await completeJob(api, { status: 'repairing', lines: [] });
    const line = await request(api.app)
      .post(`/api/jobs/${jobId}/line-items`)
      .set(owner())
      .send({ kind: 'labour', description: 'Pressure hold test', quantity: 1.5 })
      .expect(201);
    // Hand arithmetic: 1.5 h × $110.00 = $165.00.
    expect(LineItemSchema.parse(line.body)).toMatchObject({ unitPriceCents: 11_000, lineTotalCents: 16_500 });

    const issued = await request(api.app).get(`/api/invoices/${before.id}`).set(owner()).expect(200);
    expect(InvoiceDetailSchema.parse(issued.body).totalCents).toBe(before.totalCents);
  });

  it('issues the next invoice at a changed tax rate and terms', async () => {
    await request(api.app)
      .patch('/api/business')
      .set(owner())
      .send({ taxRatePpm: 88_750, invoiceTermsDays: 30, taxRounding: 'per_invoice' })
      .expect(200);
    const { id } = await freshInvoice(api);
    const invoice = InvoiceDetailSchema.parse(
      (await request(api.app).get(`/api/invoices/${id}`).set(owner()).expect(200)).body,
    );
    // Hand arithmetic: the taxable part is $189.00 + 25 % = $236.25; 8.875 % of it is
    // $20.9671875, rounded half up to $20.97 (SSUTA §324). Labour $142.50 is not taxed.
    expect(invoice).toMatchObject({
      taxRatePpm: 88_750,
      taxCents: 2_097,
      totalCents: 14_250 + 23_625 + 2_097,
    });
    // Thirty calendar days after the issue day (checked with Date arithmetic, UTC so no DST moves it).
    const due = new Date(`${invoice.issuedOn}T00:00:00Z`);
    due.setUTCDate(due.getUTCDate() + 30);
    expect(invoice.dueOn).toBe(due.toISOString().slice(0, 10));
  });

  it('records who changed which setting, from what to what', async () => {
    await request(api.app).patch('/api/business').set(owner()).send({ tripFeeFreeMiles: 20 }).expect(200);
    const events = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'business.updated')));
    expect(events.at(-1)?.details).toEqual({
      tripFeeFreeMiles: { from: demoBusiness.tripFeeFreeMiles, to: 20 },
    });
  });

  it('refuses bad settings with a 400 and changes nothing', async () => {
    const before = await settings();
    const bad: object[] = [
      {},
      { labourRateCents: -1 },
      { labourRateCents: 95.5 },
      { labourRateCents: '9500' },
      { taxRatePpm: 400_000 },
      { taxRounding: 'per_cent' },
      { invoiceTermsDays: 400 },
      { email: 'not an e-mail' },
      { name: '   ' },
      { timezone: 'Pacific/Auckland' },
      { labourRateCents: 12_000, slug: 'someone-else' },
    ];
    for (const body of bad) {
      const response = await request(api.app).patch('/api/business').set(owner()).send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(response.body.error).toMatchObject({ code: 'bad_request', message: expect.any(String) });
    }
    expect(await settings()).toEqual(before);
  });

  it('clears the phone and the footer with null, and keeps the rest', async () => {
    const response = await request(api.app)
      .patch('/api/business')
      .set(owner())
      .send({ phone: null, invoiceFooter: null, addressLines: ['12 Shale Street', 'Cinder Valley'] })
      .expect(200);
    expect(response.body).toMatchObject({
      phone: null,
      invoiceFooter: null,
      addressLines: ['12 Shale Street', 'Cinder Valley'],
      name: demoBusiness.name,
    });
  });
});
