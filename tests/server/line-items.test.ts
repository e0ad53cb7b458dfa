import Decimal from 'decimal.js';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows } from '../../server/db/client';
import {
  LineItemListSchema,
  LineItemSchema,
  quantityToMilli,
  type LineItem,
} from '../../shared/api/line-items';
import { as, seededApi, type TestApi } from '../helpers/api';

let api: TestApi;
/** A job still open for pricing (not invoiced or paid). */
let openJob: number;
/** A job whose invoice holds its lines. */
let billedJob: number;
/** Another open job, to prove a line is found only under its own job. */
let secondJob: number;

const ids = async (query: ReturnType<typeof sql>) =>
  (await queryRows<{ id: number }>(api.database.db, query)).map((r) => r.id);
const lineCount = async () =>
  (await queryRows<{ n: number }>(api.database.db, sql`select count(*)::int as n from line_items`))[0]!.n;
const auditOf = (itemId: number) =>
  queryRows<{ action: string; details: Record<string, unknown> }>(
    api.database.db,
    sql`select action, details from audit_events where entity_type = 'line_item' and entity_id = ${String(itemId)} order by id`,
  );

beforeAll(async () => {
  api = await seededApi();
  [openJob, secondJob] = (await ids(
    sql`select id from jobs where status not in ('invoiced', 'paid', 'cancelled') order by id limit 2`,
  )) as [number, number];
  [billedJob] = (await ids(sql`select id from jobs where status = 'invoiced' order by id limit 1`)) as [
    number,
  ];
});
afterAll(() => api.close());

async function create(body: object, jobId = openJob): Promise<LineItem> {
  const response = await request(api.app)
    .post(`/api/jobs/${jobId}/line-items`)
    .set(as(api, 'owner'))
    .send(body);
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return LineItemSchema.parse(response.body);
}

/** decimal.js (an exact decimal library, REFERENCES.md "Money") as the cross-check of a line total. */
const decimalTotal = (quantity: string, unitPriceCents: number, markupBps: number) =>
  new Decimal(quantity)
    .times(unitPriceCents)
    .times(new Decimal(10_000 + markupBps).div(10_000))
    .toDecimalPlaces(0, Decimal.ROUND_HALF_UP)
    .toNumber();

describe('adding line items', () => {
  it("prices labour at the business's rate, untaxed, when no price is given", async () => {
    const labour = await create({ kind: 'labour', description: 'Diagnose lean running', quantity: 1.5 });
    // 1.5 h × $95.00 (the demo business's rate) = $142.50 (hand arithmetic).
    expect(labour).toMatchObject({
      quantity: 1.5,
      quantityMilli: 1500,
      unitPriceCents: 9500,
      markupBps: 0,
      taxable: false,
      lineTotalCents: 14_250,
      needsPrice: false,
      checkRunId: null,
    });
  });

  it("marks up parts by the business's parts markup and taxes them by default", async () => {
    const part = await create({
      kind: 'part',
      description: 'In-line fuel filter',
      partNumber: 'KF-2210',
      quantity: 2,
      unitPriceCents: 1899,
    });
    // 2 × $18.99 × 1.25 = $47.475 → $47.48, half up (hand arithmetic; SSUTA §324 rounding).
    expect(part).toMatchObject({
      markupBps: 2500,
      taxable: true,
      partNumber: 'KF-2210',
      lineTotalCents: 4748,
    });
    expect(part.lineTotalCents).toBe(decimalTotal('2', 1899, 2500));
  });

  it('takes quantities to three decimals exactly, from a number or a string', async () => {
    const cases: [number | string, string, number, number, number][] = [
      // quantity as sent, as a decimal, unit price, markup, line total by hand arithmetic
      [0.125, '0.125', 1999, 2500, 312], // 0.125 × 1999 × 1.25 = 312.34375 → 312
      ['1.005', '1.005', 9500, 0, 9548], // 1.005 × 9500 = 9547.5 → 9548 (half up)
      [0.3, '0.3', 3333, 0, 1000], // 0.3 × 3333 = 999.9 → 1000
      ['12', '12', 45, 1000, 594], // 12 × 45 × 1.10 = 594
    ];
    for (const [quantity, decimal, unitPriceCents, markupBps, total] of cases) {
      const line = await create({
        kind: 'supplies',
        description: 'Shop rags',
        quantity,
        unitPriceCents,
        markupBps,
      });
      expect(line.quantityMilli).toBe(Number(new Decimal(decimal).times(1000)));
      expect(line.lineTotalCents).toBe(total);
      expect(line.lineTotalCents).toBe(decimalTotal(decimal, unitPriceCents, markupBps));
    }
  });

  it('defaults trip lines to untaxed and places each new line after the last', async () => {
    const trip = await create({
      kind: 'trip',
      description: 'Call-out, 22 mi',
      quantity: 1,
      unitPriceCents: 4550,
    });
    expect(trip.taxable).toBe(false);
    const after = await create({
      kind: 'other',
      description: 'Disposal of old fuel',
      quantity: 1,
      unitPriceCents: 500,
    });
    expect(after.position).toBe(trip.position + 1);
    expect(after.taxable).toBe(true);
  });

  it('refuses bad quantities, a missing price and unknown fields with 400 and adds nothing', async () => {
    const before = await lineCount();
    const bodies = [
      { kind: 'labour', description: 'x', quantity: 1.0001 },
      { kind: 'labour', description: 'x', quantity: '0.1234' },
      { kind: 'labour', description: 'x', quantity: 0 },
      { kind: 'labour', description: 'x', quantity: -1 },
      { kind: 'labour', description: 'x', quantity: '1e3' },
      { kind: 'labour', description: 'x', quantity: 0.1 + 0.2 },
      { kind: 'part', description: 'Fuel pump', quantity: 1 },
      { kind: 'labour', description: 'x', quantity: 1, unitPriceCents: 12.5 },
      { kind: 'labour', description: 'x', quantity: 1, discount: 10 },
      { kind: 'labour', description: '', quantity: 1 },
      { kind: 'bribe', description: 'x', quantity: 1, unitPriceCents: 1 },
    ];
    for (const body of bodies) {
      const response = await request(api.app)
        .post(`/api/jobs/${openJob}/line-items`)
        .set(as(api, 'owner'))
        .send(body);
      expect(response.status, JSON.stringify(body)).toBe(400);
    }
    expect(await lineCount()).toBe(before);
  });

  it('reads a quantity digit by digit, never through float multiplication', () => {
    // 1.005 × 1000 in binary floating point is 1004.9999999999999; the decimal text is exact.
    expect(1.005 * 1000).not.toBe(1005);
    expect(quantityToMilli(1.005)).toBe(1005);
    expect(quantityToMilli('0.5')).toBe(500);
    expect(quantityToMilli('1000000')).toBe(1_000_000_000);
    expect(quantityToMilli('1000000.001')).toBeNull();
  });
});

describe('changing and removing line items', () => {
  it('audits a change of price with what it was and what it is, but not a move', async () => {
    const line = await create({
      kind: 'part',
      description: 'Fuel pump',
      quantity: 1,
      unitPriceCents: 18_900,
    });
    const priced = await request(api.app)
      .patch(`/api/jobs/${openJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .send({ unitPriceCents: 17_500 })
      .expect(200);
    // $175.00 × 1.25 = $218.75 (hand arithmetic).
    expect(priced.body.lineTotalCents).toBe(21_875);
    await request(api.app)
      .patch(`/api/jobs/${openJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .send({ position: 40 })
      .expect(200);
    const audit = await auditOf(line.id);
    expect(audit.map((a) => a.action)).toEqual(['line_item.created', 'line_item.updated']);
    expect(audit[1]!.details).toMatchObject({
      before: { unitPriceCents: 18_900, lineTotalCents: 23_625 },
      after: { unitPriceCents: 17_500, lineTotalCents: 21_875 },
    });
  });

  it('deletes a line, audited, and finds a line only under its own job', async () => {
    const line = await create({ kind: 'labour', description: 'Road test', quantity: 0.25 });
    await request(api.app)
      .patch(`/api/jobs/${secondJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .send({ quantity: 1 })
      .expect(404);
    await request(api.app)
      .delete(`/api/jobs/${secondJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .expect(404);
    await request(api.app)
      .delete(`/api/jobs/${openJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .expect(204);
    expect((await auditOf(line.id)).map((a) => a.action)).toEqual(['line_item.created', 'line_item.deleted']);
    await request(api.app)
      .delete(`/api/jobs/${openJob}/line-items/${line.id}`)
      .set(as(api, 'owner'))
      .expect(404);
  });

  it('refuses every change once the job is invoiced (409), but still lists its lines', async () => {
    const [billedLine] = await ids(sql`select id from line_items where job_id = ${billedJob} limit 1`);
    const before = await lineCount();
    await request(api.app)
      .post(`/api/jobs/${billedJob}/line-items`)
      .set(as(api, 'owner'))
      .send({ kind: 'labour', description: 'Extra', quantity: 1 })
      .expect(409);
    await request(api.app)
      .patch(`/api/jobs/${billedJob}/line-items/${billedLine}`)
      .set(as(api, 'owner'))
      .send({ unitPriceCents: 1 })
      .expect(409);
    await request(api.app)
      .delete(`/api/jobs/${billedJob}/line-items/${billedLine}`)
      .set(as(api, 'owner'))
      .expect(409);
    expect(await lineCount()).toBe(before);
    const list = await request(api.app)
      .get(`/api/jobs/${billedJob}/line-items`)
      .set(as(api, 'bookkeeper'))
      .expect(200);
    expect(list.body.items.length).toBeGreaterThan(0);
  });
});

describe('listing line items', () => {
  it('lists in position order across pages, without repeats', async () => {
    const seen: LineItem[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get(`/api/jobs/${openJob}/line-items`)
        .query({ limit: 3, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'helper'))
        .expect(200);
      const page = LineItemListSchema.parse(response.body);
      seen.push(...page.items);
      cursor = page.nextCursor;
    } while (cursor);
    const [{ n }] = (await queryRows<{ n: number }>(
      api.database.db,
      sql`select count(*)::int as n from line_items where job_id = ${openJob}`,
    )) as [{ n: number }];
    expect(seen.length).toBe(n);
    expect(new Set(seen.map((l) => l.id)).size).toBe(n);
    const order = seen.map((l) => [l.position, l.id] as const);
    const sorted = [...order].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    expect(order).toEqual(sorted);
  });

  it('shows lines to staff only; prices are set by the owner alone', async () => {
    await request(api.app).get(`/api/jobs/${openJob}/line-items`).set(as(api, 'bookkeeper')).expect(200);
    await request(api.app).get(`/api/jobs/${openJob}/line-items`).set(as(api, 'customer')).expect(403);
    await request(api.app)
      .post(`/api/jobs/${openJob}/line-items`)
      .set(as(api, 'helper'))
      .send({ kind: 'labour', description: 'x', quantity: 1 })
      .expect(403);
    await request(api.app)
      .get(`/api/jobs/${openJob}/line-items`)
      .query({ cursor: 'aWQ6OTk5OTk5' })
      .set(as(api, 'owner'))
      .expect(400);
  });
});
