import { Decimal } from 'decimal.js';
import { and, desc, eq } from 'drizzle-orm';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { ESTIMATE_TERMS } from '../../server/pdf/estimate-pdf';
import { jobDocumentAttachments } from '../../server/services/document-attachments';
import { EstimateCreatedSchema, EstimateListSchema, EstimateSchema } from '../../shared/api/estimates';
import { as, seededApi, type Caller, type TestApi } from '../helpers/api';
import { quotableJob, sentEstimate } from './access/documents';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const quote = (jobId: number, body: object = {}) =>
  request(api.app).post(`/api/jobs/${jobId}/estimate`).set(as(api, 'owner')).send(body);
const decide = (id: number, decision: 'approve' | 'decline', caller: Caller, body: object = {}) =>
  request(api.app).post(`/api/estimates/${id}/${decision}`).set(as(api, caller)).send(body);

async function jobOf(id: number) {
  const [job] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, id));
  return job!;
}

const squash = (text: string) => text.replace(/\s+/g, '');
async function pdfText(bytes: Buffer): Promise<string> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), disableFontFace: true }).promise;
  let text = '';
  for (let n = 1; n <= pdf.numPages; n += 1) {
    const content = await (await pdf.getPage(n)).getTextContent();
    text += content.items.map((item) => ('str' in item ? item.str : '')).join(' ');
  }
  await pdf.destroy();
  return squash(text);
}
function getPdf(id: number, caller: Caller = 'owner') {
  return request(api.app)
    .get(`/api/estimates/${id}/pdf`)
    .set(as(api, caller))
    .buffer(true)
    .parse((res, callback) => {
      const stream = res as unknown as NodeJS.ReadableStream;
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => callback(null, Buffer.concat(chunks)));
    });
}

/**
 * The default test lines at the seeded business's 6.25 %, tax once per invoice (SSUTA §324, half
 * up), figured with decimal.js (not the code under test): labour 1.5 h × $95.00 = $142.50 (not
 * taxed); part $189.00 × 1.25 = $236.25 (taxed); subtotal $378.75; tax 236.25 × 0.0625 =
 * 14.765625 → $14.77; total $393.52.
 */
function expectedTotals() {
  const labour = new Decimal(1.5).times(95);
  const part = new Decimal(189).times(1.25);
  const tax = part.times(0.0625).toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
  const cents = (d: Decimal) => d.times(100).toNumber();
  return {
    subtotalCents: cents(labour.plus(part)),
    taxCents: cents(tax),
    totalCents: cents(labour.plus(part).plus(tax)),
  };
}

describe('POST /api/jobs/:id/estimate', () => {
  it('quotes the job’s lines with shared/money.ts totals, mails the PDF and moves the job to awaiting approval', async () => {
    const jobId = await quotableJob(api);
    const before = api.mail!.messages.length;
    const response = await quote(jobId, { note: 'Parts in stock; half a day.' }).expect(201);
    const estimate = EstimateCreatedSchema.parse(response.body);
    expect(estimate).toMatchObject({ jobId, status: 'sent', ...expectedTotals(), taxRatePpm: 62_500 });
    expect([estimate.subtotalCents, estimate.taxCents, estimate.totalCents]).toEqual([37_875, 1477, 39_352]);
    expect(estimate.lines.map((l) => [l.description, l.lineTotalCents])).toEqual([
      ['Fuel delivery check', 14_250],
      ['Fuel pump assembly', 23_625],
    ]);
    expect(estimate.sentAt).toBe(api.clock.now.toISOString());

    expect((await jobOf(jobId)).status).toBe('awaiting_approval');
    const [event] = await api.database.db
      .select()
      .from(t.jobEvents)
      .where(eq(t.jobEvents.jobId, jobId))
      .orderBy(desc(t.jobEvents.id));
    expect(event).toMatchObject({ fromStatus: 'diagnosing', toStatus: 'awaiting_approval' });

    expect(estimate.mail).toMatchObject({ kind: 'estimate', status: 'sent', jobId });
    expect(api.mail!.messages).toHaveLength(before + 1);
    const mail = api.mail!.messages.at(-1)!;
    expect(mail.envelopeTo).toEqual(['jules@example.test']);
    expect(mail.text).toContain('Estimated total: $393.52');
    const [pdf] = mail.attachments;
    expect(pdf!.filename).toBe(`estimate-${estimate.id}.pdf`);
    // ISO 32000-1 §7.5.2: a PDF file begins with "%PDF-".
    expect(pdf!.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const text = await pdfText(pdf!.content);
    for (const phrase of [
      'Estimate',
      `No. ${estimate.id}`,
      'Fuel delivery check',
      'Fuel pump assembly',
      'Subtotal $378.75',
      'Sales tax 6.25 % $14.77',
      'Estimated total $393.52',
      'Parts in stock; half a day.',
      ESTIMATE_TERMS,
    ]) {
      expect(text, phrase).toContain(squash(phrase));
    }
    const [row] = await api.database.db.select().from(t.outbox).where(eq(t.outbox.id, estimate.mail!.id));
    expect(row!.estimateId).toBe(estimate.id);
  });

  it('keeps what was quoted when the job’s lines change afterwards', async () => {
    const jobId = await quotableJob(api);
    const { id } = (await quote(jobId).expect(201)).body as { id: number };
    await api.database.db.update(t.lineItems).set({ unitPriceCents: 1 }).where(eq(t.lineItems.jobId, jobId));
    const list = EstimateListSchema.parse(
      (await request(api.app).get(`/api/jobs/${jobId}/estimates`).set(as(api, 'owner')).expect(200)).body,
    );
    expect(list.items.find((e) => e.id === id)!.lines.map((l) => l.unitPriceCents)).toEqual([9500, 18_900]);
  });

  it('refuses a second estimate while one waits for an answer (409, nothing mailed)', async () => {
    const jobId = await quotableJob(api);
    await quote(jobId).expect(201);
    const before = api.mail!.messages.length;
    const response = await quote(jobId).expect(409);
    expect(response.body.error.message).toMatch(/still waiting/);
    expect(api.mail!.messages).toHaveLength(before);
  });

  it('refuses a job that is not being diagnosed, one without lines, and an unpriced part', async () => {
    const [complete] = await api.database.db
      .select({ id: t.jobs.id })
      .from(t.jobs)
      .where(eq(t.jobs.status, 'paid'))
      .limit(1);
    expect((await quote(complete!.id).expect(409)).body.error.code).toBe('conflict');
    await quote(await quotableJob(api, { lines: [] })).expect(409);
    const unpriced = await quotableJob(api, {
      lines: [
        { kind: 'part', description: 'Inline filter', quantityMilli: 1000, unitPriceCents: 0, taxable: true },
      ],
    });
    expect((await quote(unpriced).expect(409)).body.error.message).toMatch(/Inline filter/);
    const estimates = await api.database.db.select().from(t.estimates).where(eq(t.estimates.jobId, unpriced));
    expect(estimates).toEqual([]);
    expect((await jobOf(unpriced)).status).toBe('diagnosing');
  });

  it('makes the estimate without mail for a customer with no e-mail address', async () => {
    const jobId = await quotableJob(api, { customerEmail: 'rowan@example.test' });
    const job = await jobOf(jobId);
    await api.database.db.update(t.customers).set({ email: null }).where(eq(t.customers.id, job.customerId));
    const before = api.mail!.messages.length;
    const created = EstimateCreatedSchema.parse((await quote(jobId).expect(201)).body);
    expect(created.mail).toBeNull();
    expect(api.mail!.messages).toHaveLength(before);
    await api.database.db
      .update(t.customers)
      .set({ email: 'rowan@example.test' })
      .where(eq(t.customers.id, job.customerId));
  });

  it.each(['{"note": 5}', '{"extra": true}'])('answers 400 for the body %s', async (body) => {
    const jobId = await quotableJob(api);
    await request(api.app)
      .post(`/api/jobs/${jobId}/estimate`)
      .set(as(api, 'owner'))
      .set('Content-Type', 'application/json')
      .send(body)
      .expect(400);
    expect(await api.database.db.select().from(t.estimates).where(eq(t.estimates.jobId, jobId))).toEqual([]);
  });
});

describe('the customer’s answer', () => {
  async function customerUser() {
    const [user] = await api.database.db
      .select()
      .from(t.users)
      .where(eq(t.users.email, 'jules@example.test'));
    return user!;
  }

  it('approval by the signed-in customer is recorded with the time and the person, and moves the job to repairing', async () => {
    const jobId = await quotableJob(api);
    const { id } = (await quote(jobId).expect(201)).body as { id: number };
    api.clock.set(new Date('2026-11-18T18:30:00Z'));
    try {
      const approved = EstimateSchema.parse(
        (await decide(id, 'approve', 'customer', { note: 'Go ahead.' }).expect(200)).body,
      );
      const user = await customerUser();
      expect(approved).toMatchObject({
        status: 'approved',
        decidedAt: '2026-11-18T18:30:00.000Z',
        decidedById: user.id,
        decidedByName: user.name,
        decidedVia: 'customer',
        decisionNote: 'Go ahead.',
      });
      expect((await jobOf(jobId)).status).toBe('repairing');
      const [event] = await api.database.db
        .select()
        .from(t.jobEvents)
        .where(eq(t.jobEvents.jobId, jobId))
        .orderBy(desc(t.jobEvents.id));
      expect(event).toMatchObject({
        fromStatus: 'awaiting_approval',
        toStatus: 'repairing',
        actorId: user.id,
      });
      const audit = await api.database.db
        .select()
        .from(t.auditEvents)
        .where(and(eq(t.auditEvents.action, 'estimate.approved'), eq(t.auditEvents.entityId, String(id))));
      expect(audit).toHaveLength(1);
      // Answered once: a second answer is a conflict and changes nothing.
      await decide(id, 'decline', 'customer').expect(409);
      expect((await jobOf(jobId)).status).toBe('repairing');
      // The PDF now carries the answer (18:30 UTC is 11:30 in Denver, still 18 Nov).
      const text = await pdfText((await getPdf(id, 'customer').expect(200)).body as Buffer);
      expect(text).toContain(squash(`Approved on 18 Nov 2026 by ${user.name}: “Go ahead.”`));
    } finally {
      api.clock.set(new Date('2026-11-18T15:00:00Z'));
    }
  });

  it('the owner records a decline on the customer’s word, which must say how it was given; the job stays put', async () => {
    const jobId = await quotableJob(api);
    const { id } = (await quote(jobId).expect(201)).body as { id: number };
    const refused = await decide(id, 'decline', 'owner').expect(400);
    expect(refused.body.error.message).toMatch(/note/);
    expect((await api.database.db.select().from(t.estimates).where(eq(t.estimates.id, id)))[0]!.status).toBe(
      'sent',
    );

    const declined = EstimateSchema.parse(
      (await decide(id, 'decline', 'owner', { note: 'By phone, 14:05' }).expect(200)).body,
    );
    expect(declined).toMatchObject({
      status: 'declined',
      decidedVia: 'owner_for_customer',
      decisionNote: 'By phone, 14:05',
    });
    expect(declined.decidedByName).toBe('Morgan Avery');
    expect((await jobOf(jobId)).status).toBe('awaiting_approval');
    // Declined, the job can be quoted again.
    await quote(jobId).expect(201);
  });

  it('hides another customer’s estimate (404) and refuses roles that do not answer (403)', async () => {
    const theirs = await sentEstimate(api, 'rowan@example.test');
    expect((await decide(theirs, 'approve', 'customer').expect(404)).body.error.code).toBe('not_found');
    await decide(theirs, 'approve', 'bookkeeper', { note: 'x' }).expect(403);
    await decide(theirs, 'approve', 'helper', { note: 'x' }).expect(403);
    await decide(theirs, 'approve', 'anonymous').expect(401);
    await decide(987_654, 'approve', 'owner', { note: 'x' }).expect(404);
    const [row] = await api.database.db.select().from(t.estimates).where(eq(t.estimates.id, theirs));
    expect(row!.status).toBe('sent');
  });

  it('lists a customer’s own estimates, the demo seed’s too, and hides other customers’ jobs', async () => {
    const [seeded] = await api.database.db
      .select({ estimate: t.estimates, job: t.jobs })
      .from(t.estimates)
      .innerJoin(t.jobs, eq(t.jobs.id, t.estimates.jobId))
      .limit(1);
    const list = EstimateListSchema.parse(
      (await request(api.app).get(`/api/jobs/${seeded!.job.id}/estimates`).set(as(api, 'owner')).expect(200))
        .body,
    );
    // The seed's estimates keep no tax breakdown: null, not guessed.
    expect(list.items[0]).toMatchObject({
      id: seeded!.estimate.id,
      subtotalCents: null,
      totalCents: seeded!.estimate.totalCents,
    });
    const own = await quotableJob(api);
    await quote(own).expect(201);
    const mine = EstimateListSchema.parse(
      (await request(api.app).get(`/api/jobs/${own}/estimates`).set(as(api, 'customer')).expect(200)).body,
    );
    expect(mine.items).toHaveLength(1);
    const other = await quotableJob(api, { customerEmail: 'rowan@example.test' });
    await request(api.app).get(`/api/jobs/${other}/estimates`).set(as(api, 'customer')).expect(404);
    await request(api.app).get(`/api/jobs/${own}/estimates`).set(as(api, 'helper')).expect(403);
  });
});

describe('attachments rendered again for a retry', () => {
  it('gives an estimate mail its estimate PDF and a report mail the report, from the outbox row alone', async () => {
    const [owner] = await api.database.db.select().from(t.users).where(eq(t.users.role, 'owner'));
    const actor = {
      userId: owner!.id,
      businessId: owner!.businessId,
      role: 'owner' as const,
      customerId: null,
      email: owner!.email,
      name: owner!.name,
      jti: 'retry-test',
      expiresAt: api.clock.now,
    };
    const created = EstimateCreatedSchema.parse((await quote(await quotableJob(api)).expect(201)).body);
    const [row] = await api.database.db.select().from(t.outbox).where(eq(t.outbox.id, created.mail!.id));
    const [estimatePdf] = (await jobDocumentAttachments(api.database.db, actor, row!, api.clock.now))!;
    expect(estimatePdf!.filename).toBe(`estimate-${created.id}.pdf`);
    expect(await pdfText(estimatePdf!.content)).toContain(squash(`No. ${created.id}`));
    const report = { kind: 'report', jobId: created.jobId, estimateId: null };
    const [reportPdf] = (await jobDocumentAttachments(api.database.db, actor, report, api.clock.now))!;
    expect(reportPdf!.filename).toBe(`report-job-${created.jobId}.pdf`);
    expect(await pdfText(reportPdf!.content)).toContain(squash('Diagnostic report'));
    expect(
      await jobDocumentAttachments(api.database.db, actor, { ...report, kind: 'invoice' }, api.clock.now),
    ).toBeNull();
  });
});
