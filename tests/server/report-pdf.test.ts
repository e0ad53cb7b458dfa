import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { unit as mathUnit } from 'mathjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import { CHART_COLOUR, GENERIC_LABEL, MANUAL_GOVERNS, MANUAL_LABEL } from '../../server/pdf/report-pdf';
import { OutboxItemSchema, OutboxListSchema } from '../../shared/api/outbox';
import { CAUTIONS, DEFER_LINE } from '../../shared/procedures/cautions';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { getBinary, readPdf, squash } from '../helpers/pdf';
import { as, seededApi, type Caller, type TestApi } from '../helpers/api';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const OUTPUT = path.resolve('tests/server/output');

function getReport(jobId: number, caller: Caller = 'owner', query = '') {
  return getBinary(api.app, `/api/jobs/${jobId}/report.pdf${query}`, as(api, caller));
}

const textOf = async (bytes: Buffer) => squash((await readPdf(bytes)).map((p) => p.text).join(' '));

/** Jobs of the seed's demo customers with a finished fuel-delivery run on them. */
async function fuelJobOf(email: string) {
  const [row] = await api.database.db
    .select({ job: t.jobs, run: t.checkRuns, machine: t.machines })
    .from(t.jobs)
    .innerJoin(t.customers, eq(t.customers.id, t.jobs.customerId))
    .innerJoin(t.machines, eq(t.machines.id, t.jobs.machineId))
    .innerJoin(t.checkRuns, eq(t.checkRuns.jobId, t.jobs.id))
    .where(and(eq(t.customers.email, email), eq(t.checkRuns.procedureKey, 'fuel-delivery')))
    .orderBy(asc(t.jobs.id))
    .limit(1);
  return row!;
}

async function holdStep(runId: number) {
  const [step] = await api.database.db
    .select()
    .from(t.checkSteps)
    .where(and(eq(t.checkSteps.checkRunId, runId), eq(t.checkSteps.stepKey, 'static-pressure-hold')));
  return step!;
}

describe('GET /api/jobs/:id/report.pdf — a seeded fuel-delivery job, limits from the manual', () => {
  let text: string;
  let fixture: Awaited<ReturnType<typeof fuelJobOf>>;
  beforeAll(async () => {
    fixture = await fuelJobOf('jules@example.test');
    const response = await getReport(fixture.job.id).expect(200);
    expect(response.headers['content-type']).toMatch(/^application\/pdf/);
    expect(response.headers['content-disposition']).toBe(
      `inline; filename="report-job-${fixture.job.id}.pdf"`,
    );
    const body = response.body as Buffer;
    // ISO 32000-1 §7.5.2: a PDF file begins with the header "%PDF-" and the version.
    expect(body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    text = await textOf(body);
  });

  it('names the job, the customer and the machine (VIN and meter)', () => {
    const { job, machine } = fixture;
    for (const phrase of [
      'Diagnostic report',
      `Job ${job.id}`,
      'Ridgeback Mobile Moto',
      'Jules',
      `${machine.year} ${machine.make} ${machine.model}`,
      `VIN ${machine.vin}`,
      // Thousands grouped as en-US writes them (ECMA-402 Intl.NumberFormat as the cross-check).
      `${new Intl.NumberFormat('en-US', { maximumFractionDigits: 1 }).format(job.meterReading!)} ${machine.meterUnit}`,
      job.complaint,
    ]) {
      expect(text, phrase).toContain(squash(phrase));
    }
  });

  it('lists every reading as typed and as stored, the stored pressure cross-checked with mathjs', async () => {
    const readings = await api.database.db
      .select()
      .from(t.readings)
      .where(eq(t.readings.jobId, fixture.job.id));
    expect(readings.length).toBeGreaterThan(5);
    const labels: Record<string, string> = { psi: 'psi', V: 'V', s: 's', mL: 'mL', kPa: 'kPa' };
    for (const reading of readings) {
      const typed = `${reading.enteredValue} ${labels[reading.enteredUnit] ?? reading.enteredUnit}`;
      expect(text, typed).toContain(squash(typed));
      if (reading.enteredUnit === 'psi') {
        // mathjs units (a general-purpose library, not the code under test): psi → kPa.
        const kpa = Math.round(mathUnit(reading.enteredValue, 'psi').toNumber('kPa') * 10) / 10;
        expect(text, `${typed} stored`).toContain(squash(`${typed} ${kpa} kPa`));
      }
    }
  });

  it("names the hold limit from the machine's manual, in psi with kPa beside", () => {
    const kpa = fixture.machine.holdMaxDropKpa!;
    // mathjs: the stored limit in kPa back in psi (the mechanic entered 3 psi).
    const psi = Math.round(mathUnit(kpa, 'kPa').toNumber('psi') * 10) / 10;
    expect(psi).toBe(3);
    expect(text).toContain(
      squash(
        `Largest fall allowed in the hold, after 30 s of settling ${psi} psi (${Math.round(kpa * 10) / 10} kPa) ${MANUAL_LABEL}`,
      ),
    );
    expect(text).toContain(squash(`Length of the hold ${fixture.machine.holdMinutes} min ${MANUAL_LABEL}`));
    // Generic appears only in the note that explains the labels, never on one of this job's limits.
    expect(text.split(squash(GENERIC_LABEL))).toHaveLength(2);
  });

  it('gives the hold its verdict in plain words with the reason the engine derives', async () => {
    const step = await holdStep(fixture.run.id);
    const points = (step.answer as { points: { points: { sec: number; value: number }[] } }).points.points;
    // Hand arithmetic on the stored answer: settled at the 30 s reading, lowest to 300 s.
    const settled = points.find((p) => p.sec >= 30)!.value;
    const lowest = Math.min(...points.filter((p) => p.sec >= 30 && p.sec <= 300).map((p) => p.value));
    const fall = Math.round((settled - lowest) * 10) / 10;
    expect(fall).toBeGreaterThan(3);
    expect(text).toContain(squash(`Static pressure hold`));
    expect(text).toContain(squash(`Fell ${fall} psi`));
    expect(text).toContain('Failed');
    expect(text).toContain('Passed');
    // The dashed line's label: settled start less the 3 psi allowed (hand arithmetic).
    expect(text).toContain(squash(`lowest allowed ${Math.round((settled - 3) * 10) / 10} psi`));
  });

  it('prints the findings the run reached, the work done, the cautions and the manual line', async () => {
    const findings = (fixture.run.findings as { findings: { title: string; nextAction: string }[] }).findings;
    expect(findings.length).toBeGreaterThan(0);
    for (const finding of findings) {
      expect(text, finding.title).toContain(squash(finding.title));
      expect(text, finding.nextAction).toContain(squash(finding.nextAction));
    }
    const lines = await api.database.db
      .select()
      .from(t.lineItems)
      .where(eq(t.lineItems.jobId, fixture.job.id));
    expect(lines.length).toBeGreaterThan(0);
    for (const line of lines) expect(text, line.description).toContain(squash(line.description));
    // The hold was walked, so its caution is printed; the deferral closes the section.
    expect(text).toContain(squash(CAUTIONS['fuel-pressure'].title));
    for (const line of CAUTIONS['fuel-pressure'].lines) expect(text, line).toContain(squash(line));
    expect(text).toContain(squash(DEFER_LINE));
    expect(text).toContain(squash(MANUAL_GOVERNS));
    expect(text).toContain(squash("The service manual's specification governs every limit in this report."));
    // No prices: a report is not an invoice.
    expect(text).not.toMatch(/\$\d/);
  });
});

describe('generic limits', () => {
  it('labels a run judged on generic defaults "generic — confirm in the service manual"', async () => {
    const fixture = await fuelJobOf('rowan@example.test');
    expect(fixture.run.spec).toBeNull();
    expect(fixture.machine.holdMaxDropKpa).toBeNull();
    const text = await textOf((await getReport(fixture.job.id).expect(200)).body);
    // Generic hold limit 3 psi = 20.684 kPa (NIST SP 811 B.8: 1 psi = 6.894 757 kPa).
    expect(text).toContain(
      squash(`Largest fall allowed in the hold, after 30 s of settling 3 psi (20.7 kPa) ${GENERIC_LABEL}`),
    );
    // The manual's label appears only in the note that explains the labels.
    expect(text.split(squash(MANUAL_LABEL))).toHaveLength(2);
  });
});

describe('the hold chart', () => {
  interface Canvas {
    toBuffer(type: 'image/png'): Buffer;
  }
  interface Context {
    getImageData(x: number, y: number, w: number, h: number): { data: Uint8ClampedArray };
  }
  interface Placed {
    str: string;
    x: number;
    y: number;
  }

  /**
   * The page with the chart, rendered by pdf.js onto its own Node canvas, with its text placed in
   * canvas pixels (PDF space has y upwards from the foot of the page; the canvas downwards).
   */
  async function renderChartPage(bytes: Buffer, scale: number) {
    const pdf = await getDocument({ data: new Uint8Array(bytes), disableFontFace: true }).promise;
    try {
      for (let n = 1; n <= pdf.numPages; n += 1) {
        const page = await pdf.getPage(n);
        const viewport = page.getViewport({ scale });
        const content = await page.getTextContent();
        const placed: Placed[] = content.items.flatMap((item) =>
          'str' in item
            ? [
                {
                  str: item.str,
                  x: (item.transform[4] as number) * scale,
                  y: viewport.height - (item.transform[5] as number) * scale,
                },
              ]
            : [],
        );
        const title = placed.find((item) => item.str.startsWith('Pressure hold:'));
        if (!title) continue;
        const factory = pdf.canvasFactory as {
          create(w: number, h: number): { canvas: Canvas; context: Context };
        };
        const { canvas, context } = factory.create(viewport.width, viewport.height);
        await page.render({ canvas: canvas as unknown as HTMLCanvasElement, viewport }).promise;
        return { canvas, context, width: Math.round(viewport.width), placed, titleY: title.y };
      }
      throw new Error('no page carries the hold chart');
    } finally {
      await pdf.destroy();
    }
  }

  /** Per pixel row from `top`, how many pixels match: near a colour, or anything not white. */
  function rowCounts(context: Context, width: number, top: number, height: number, hex: string | null) {
    const target = hex ? [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)) : null;
    const { data } = context.getImageData(0, Math.round(top), width, Math.round(height));
    const counts = new Array<number>(Math.round(height)).fill(0);
    for (let i = 0; i < data.length; i += 4) {
      const [r, g, b] = [data[i]!, data[i + 1]!, data[i + 2]!];
      const hit = target
        ? Math.abs(r - target[0]!) + Math.abs(g - target[1]!) + Math.abs(b - target[2]!) < 40
        : 765 - r - g - b > 30;
      if (hit) counts[Math.floor(i / 4 / width)]! += 1;
    }
    return counts;
  }

  it('draws the readings and the limit line at the allowed low on the pressure axis, and saves a PNG', async () => {
    const fixture = await fuelJobOf('jules@example.test');
    const bytes = (await getReport(fixture.job.id).expect(200)).body as Buffer;
    const text = await textOf(bytes);
    // Ticks every 60 s over the 5 min hold, and the unit the mechanic read the gauge in.
    for (const tick of ['0 s', '60 s', '120 s', '180 s', '240 s', '300 s'])
      expect(text, tick).toContain(squash(tick));
    expect(text).toContain(squash('Pressure hold: psi over seconds since the pump stopped'));
    expect(text).toContain(squash('lowest allowed (settled start less the allowed fall)'));

    const scale = 2;
    const { canvas, context, width, placed, titleY } = await renderChartPage(bytes, scale);
    mkdirSync(OUTPUT, { recursive: true });
    writeFileSync(path.join(OUTPUT, 'report-hold-chart.png'), canvas.toBuffer('image/png'));

    // The plot lies in the 160 pt under the title's line.
    const top = titleY + 10 * scale;
    const height = 160 * scale;
    const series = rowCounts(context, width, top, height, CHART_COLOUR.series).reduce((a, b) => a + b, 0);
    // Seven dots of radius 2.6 pt alone cover about 7 × π × 5.2² ≈ 590 px at 2× (hand arithmetic).
    expect(series).toBeGreaterThan(590);

    // Gridlines: rows more than half the page wide that are not white, top to bottom, one per tick.
    const ink = rowCounts(context, width, top, height, null);
    const lines: number[] = [];
    ink.forEach((count, row) => {
      if (count < width * 0.6) return;
      if (lines.length > 0 && row - lines.at(-1)! <= 2) lines[lines.length - 1] = (lines.at(-1)! + row) / 2;
      else lines.push(row);
    });
    // The pressure axis's tick labels, left of the plot, highest first: one per gridline.
    const ticks = placed
      .filter(
        (item) =>
          /^\d+(\.\d+)?$/.test(item.str) &&
          item.x < 100 * scale &&
          item.y > top &&
          item.y < top + height + 12 * scale,
      )
      .map((item) => Number(item.str))
      .sort((a, b) => b - a);
    expect(ticks.length).toBeGreaterThanOrEqual(3);
    expect(lines).toHaveLength(ticks.length);

    // Where the axis puts the allowed low: the settled 30 s reading less the 3 psi limit (hand arithmetic).
    const step = await holdStep(fixture.run.id);
    const points = (step.answer as { points: { points: { sec: number; value: number }[] } }).points.points;
    const allowedLow = points.find((p) => p.sec >= 30)!.value - 3;
    const rowOf = (value: number) => {
      const first = lines[0]!;
      const last = lines.at(-1)!;
      return first + ((ticks[0]! - value) / (ticks[0]! - ticks.at(-1)!)) * (last - first);
    };
    const limit = rowCounts(context, width, top, height, CHART_COLOUR.limit);
    const limitRow = limit.indexOf(Math.max(...limit));
    // A dashed line across the judged window: hundreds of pixels in one row.
    expect(limit[limitRow]).toBeGreaterThan(300);
    expect(Math.abs(limitRow - rowOf(allowedLow))).toBeLessThanOrEqual(3);
  });
});

describe('paper and bad input', () => {
  // ANSI Letter is 8.5 × 11 in = 612 × 792 pt; ISO 216 A4 is 210 × 297 mm = 595.28 × 841.89 pt (from memory).
  it.each([
    ['', 612, 792],
    ['?paper=a4', 595.28, 841.89],
  ])('%s gives %d × %d pt', async (query, width, height) => {
    const fixture = await fuelJobOf('jules@example.test');
    const pages = await readPdf((await getReport(fixture.job.id, 'owner', query).expect(200)).body);
    for (const page of pages) {
      expect(page.width).toBeCloseTo(width, 1);
      expect(page.height).toBeCloseTo(height, 1);
    }
    pages.forEach((page, index) =>
      expect(squash(page.text)).toContain(squash(`Page ${index + 1} of ${pages.length}`)),
    );
  });

  it.each(['?paper=legal', '?size=a4'])('%s is a 400 in the error format', async (query) => {
    const fixture = await fuelJobOf('jules@example.test');
    const response = await request(api.app)
      .get(`/api/jobs/${fixture.job.id}/report.pdf${query}`)
      .set(as(api, 'owner'))
      .expect(400);
    expect(response.body.error.code).toBe('bad_request');
  });

  it('answers 404 for a job that does not exist, 400 for an id that is not one', async () => {
    await request(api.app).get('/api/jobs/999999/report.pdf').set(as(api, 'owner')).expect(404);
    await request(api.app).get('/api/jobs/abc/report.pdf').set(as(api, 'owner')).expect(400);
  });

  it('says so when a stored run no longer fits its procedure, instead of failing the whole report', async () => {
    const { job: template } = await fuelJobOf('jules@example.test');
    const [job] = await api.database.db
      .insert(t.jobs)
      .values({
        businessId: template.businessId,
        customerId: template.customerId,
        machineId: template.machineId,
        complaint: 'Matrix: tampered record',
        status: 'diagnosing',
      })
      .returning();
    const [run] = await api.database.db
      .insert(t.checkRuns)
      .values({
        businessId: job!.businessId,
        jobId: job!.id,
        procedureKey: 'fuel-delivery',
        procedureVersion: 1,
      })
      .returning();
    await api.database.db.insert(t.checkSteps).values({
      businessId: job!.businessId,
      checkRunId: run!.id,
      seq: 0,
      stepKey: 'prime-run',
      answer: { primeRun: 'none' },
    });
    const text = await textOf((await getReport(job!.id).expect(200)).body);
    expect(text).toContain(squash("This check's record could not be read again"));
  });
});

describe('who may read it', () => {
  it.each([
    ['owner', 200],
    ['helper', 200],
    ['bookkeeper', 403],
    ['anonymous', 401],
  ] as const)('as %s: %d', async (caller, status) => {
    const fixture = await fuelJobOf('rowan@example.test');
    const response = await request(api.app)
      .get(`/api/jobs/${fixture.job.id}/report.pdf`)
      .set(as(api, caller));
    expect(response.status).toBe(status);
  });

  it('gives a customer their own job’s report and hides another customer’s (404)', async () => {
    const own = await fuelJobOf('jules@example.test');
    const other = await fuelJobOf('rowan@example.test');
    await getReport(own.job.id, 'customer').expect(200);
    const theirs = await request(api.app)
      .get(`/api/jobs/${other.job.id}/report.pdf`)
      .set(as(api, 'customer'))
      .expect(404);
    expect(theirs.body.error.code).toBe('not_found');
  });
});

describe('POST /api/jobs/:id/report/send', () => {
  const send = (jobId: number, query = '') =>
    request(api.app).post(`/api/jobs/${jobId}/report/send${query}`).set(as(api, 'owner'));

  it('mails the report to the customer with the PDF attached, once; ?again=true sends it again', async () => {
    const fixture = await fuelJobOf('jules@example.test');
    const fake = api.mail!;
    const before = fake.messages.length;
    const response = await send(fixture.job.id).expect(202);
    const item = OutboxItemSchema.parse(response.body);
    expect(item).toMatchObject({ kind: 'report', status: 'sent', attempts: 1, jobId: fixture.job.id });

    expect(fake.messages).toHaveLength(before + 1);
    const mail = fake.messages.at(-1)!;
    expect(mail.envelopeTo).toEqual(['jules@example.test']);
    expect(mail.subject).toContain('Diagnostic report');
    expect(mail.attachments).toHaveLength(1);
    const [pdf] = mail.attachments;
    expect(pdf!.filename).toBe(`report-job-${fixture.job.id}.pdf`);
    expect(pdf!.contentType).toBe('application/pdf');
    expect(pdf!.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const attached = await textOf(pdf!.content);
    expect(attached).toContain(squash(`Diagnostic report`));
    expect(attached).toContain(squash(DEFER_LINE));

    const list = await request(api.app).get('/api/outbox?kind=report').set(as(api, 'owner')).expect(200);
    const listed = OutboxListSchema.parse(list.body).items.find((m) => m.id === item.id);
    // CONTRACT.md: each mail with to, subject, sentAt, attachments: [{filename}].
    expect(listed).toMatchObject({
      to: 'jules@example.test',
      sentAt: api.clock.now.toISOString(),
      attachments: [{ filename: `report-job-${fixture.job.id}.pdf`, contentType: 'application/pdf' }],
    });

    const repeat = await send(fixture.job.id).expect(409);
    expect(repeat.body.error.code).toBe('conflict');
    expect(fake.messages).toHaveLength(before + 1);
    await send(fixture.job.id, '?again=maybe').expect(400);
    await send(fixture.job.id, '?again=true').expect(202);
    expect(fake.messages).toHaveLength(before + 2);
    const rows = await api.database.db
      .select()
      .from(t.outbox)
      .where(and(eq(t.outbox.kind, 'report'), eq(t.outbox.jobId, fixture.job.id)));
    expect(rows.map((r) => r.idempotencyKey).sort()).toEqual([
      `report:${fixture.job.id}:1`,
      `report:${fixture.job.id}:2`,
    ]);
  });

  it('answers 400 for a customer without an e-mail address, and queues nothing', async () => {
    const fixture = await fuelJobOf('rowan@example.test');
    await api.database.db
      .update(t.customers)
      .set({ email: null })
      .where(eq(t.customers.id, fixture.job.customerId));
    const before = api.mail!.messages.length;
    const response = await send(fixture.job.id).expect(400);
    expect(response.body.error.message).toMatch(/no e-mail/);
    const rows = await api.database.db
      .select()
      .from(t.outbox)
      .where(and(eq(t.outbox.jobId, fixture.job.id), inArray(t.outbox.kind, ['report'])));
    expect(rows).toEqual([]);
    expect(api.mail!.messages).toHaveLength(before);
    await api.database.db
      .update(t.customers)
      .set({ email: 'rowan@example.test' })
      .where(eq(t.customers.id, fixture.job.customerId));
  });

  it('answers 404 for a job that does not exist', async () => {
    await send(987_654).expect(404);
  });
});
