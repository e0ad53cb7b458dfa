import { randomUUID } from 'node:crypto';
import Decimal from 'decimal.js';
import { and, count, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../../server/db/schema';
import {
  TRIP_CSV_COLUMNS,
  TripListSchema,
  TripSchema,
  TripSummarySchema,
  type Trip,
} from '../../shared/api/trips';
import { as, seededApi, type TestApi } from '../helpers/api';
import { SEED_TODAY } from '../helpers/fixtures';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

const db = () => api.database.db;
const owner = () => as(api, 'owner');
const basics = { destination: 'Rowan Delacroix, Ashgrove Flats', purpose: 'Service call' };

async function tripCount(): Promise<number> {
  const [row] = await db().select({ n: count() }).from(t.trips);
  return row!.n;
}
async function createTrip(body: object, caller = owner()) {
  const response = await request(api.app)
    .post('/api/trips')
    .set(caller)
    .send({ ...basics, ...body })
    .expect(201);
  return TripSchema.parse(response.body);
}
async function allTrips(query: Record<string, string | number> = {}): Promise<Trip[]> {
  const items: Trip[] = [];
  let cursor: string | null = null;
  do {
    const response = await request(api.app)
      .get('/api/trips')
      .query({ ...query, limit: 9, ...(cursor ? { cursor } : {}) })
      .set(as(api, 'bookkeeper'))
      .expect(200);
    const page = TripListSchema.parse(response.body);
    items.push(...page.items);
    cursor = page.nextCursor;
  } while (cursor);
  return items;
}

describe('the mileage log', () => {
  it('starts a trip, then ends it with its miles and the year’s IRS deduction', async () => {
    const open = await createTrip({ startOdometer: 50_000 }, as(api, 'helper'));
    expect(open).toMatchObject({
      endOdometer: null,
      miles: null,
      deductionCents: null,
      odometerUnit: 'mi',
      // The business's today: 2026-11-18T15:00Z is 08:00 in America/Denver.
      tripDate: '2026-11-18',
      startedAt: SEED_TODAY.toISOString(),
      endedAt: null,
      // IRS Notice 2026-10: 72.5 ¢/mi for business use in 2026.
      rateCentsPerMile: 72.5,
    });

    api.clock.set(new Date('2026-11-18T16:10:00Z'));
    const ended = await request(api.app)
      .patch(`/api/trips/${open.id}`)
      .set(as(api, 'helper'))
      .send({ endOdometer: 50_012.3 })
      .expect(200);
    api.clock.set(new Date(SEED_TODAY));
    // Hand arithmetic: 50 012.3 − 50 000 = 12.3 mi; × 72.5 ¢ (IRS Notice 2026-10) = 891.75 ¢,
    // rounded half up to 892 ¢.
    expect(ended.body).toMatchObject({
      endOdometer: 50_012.3,
      miles: 12.3,
      deductionCents: 892,
      endedAt: '2026-11-18T16:10:00.000Z',
    });
  });

  it('logs a trip after the fact on a km odometer, in miles at 1 mi = 1.609344 km (NIST SP 811)', async () => {
    const exact = await createTrip({
      tripDate: '2026-11-02',
      startOdometer: 10_000,
      endOdometer: 10_160.9344,
      odometerUnit: 'km',
    });
    // 160.9344 km ÷ 1.609344 km/mi = 100 mi exactly (NIST SP 811 B.8); × 72.5 ¢ = $72.50 (IRS Notice 2026-10).
    expect(exact).toMatchObject({ miles: 100, deductionCents: 7_250, startedAt: null, endedAt: null });

    const fifty = await createTrip({
      tripDate: '2026-11-03',
      startOdometer: 2_000,
      endOdometer: 2_050,
      odometerUnit: 'km',
    });
    // decimal.js cross-check: 50 ÷ 1.609344 = 31.06855… → 31.069 mi; × 72.5 ¢ = 2 252.5025 ¢ → 2 253 ¢.
    const miles = new Decimal(50).div('1.609344').toDecimalPlaces(3, Decimal.ROUND_HALF_UP);
    expect(fifty.miles).toBe(miles.toNumber());
    expect(fifty.deductionCents).toBe(
      miles.times('72.5').toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber(),
    );
    expect(fifty.deductionCents).toBe(2_253);
  });

  it('takes the rate of the trip’s own date, and none for a year without a known rate', async () => {
    const lastYear = await createTrip({ tripDate: '2025-06-30', startOdometer: 40_000, endOdometer: 40_010 });
    // IRS Notice 2025-05: 70 ¢/mi in 2025; 10 mi × 70 ¢ = $7.00.
    expect(lastYear).toMatchObject({ rateCentsPerMile: 70, deductionCents: 700 });
    const unknown = await createTrip({ tripDate: '2031-01-02', startOdometer: 90_000, endOdometer: 90_010 });
    expect(unknown).toMatchObject({ miles: 10, rateCentsPerMile: null, deductionCents: null });
  });

  it('refuses an end below the start with 400, on create and on end, and changes nothing', async () => {
    const before = await tripCount();
    await request(api.app)
      .post('/api/trips')
      .set(owner())
      .send({ ...basics, startOdometer: 100, endOdometer: 99.9 })
      .expect(400);
    expect(await tripCount()).toBe(before);
    const open = await createTrip({ startOdometer: 100 });
    const response = await request(api.app)
      .patch(`/api/trips/${open.id}`)
      .set(owner())
      .send({ endOdometer: 99.9 })
      .expect(400);
    expect(response.body.error.code).toBe('bad_request');
    await request(api.app)
      .patch(`/api/trips/${open.id}`)
      .set(owner())
      .send({ startOdometer: 200, endOdometer: 150 })
      .expect(400);
    const [row] = await db().select().from(t.trips).where(eq(t.trips.id, open.id));
    expect(row).toMatchObject({ startOdometer: 100, endOdometer: null });
  });

  it('refuses malformed trips with 400 and changes nothing', async () => {
    const before = await tripCount();
    for (const body of [
      { purpose: 'x', startOdometer: 1 },
      { ...basics },
      { ...basics, startOdometer: -1 },
      { ...basics, startOdometer: 1, odometerUnit: 'h' },
      { ...basics, startOdometer: 1, tripDate: '2026-02-30' },
      { ...basics, startOdometer: 1, clientId: 'not-a-uuid' },
      { ...basics, startOdometer: 1, miles: 4 },
    ]) {
      await request(api.app).post('/api/trips').set(owner()).send(body).expect(400);
    }
    await request(api.app)
      .post('/api/trips')
      .set(owner())
      .send({ ...basics, startOdometer: 1, jobId: 999_999 })
      .expect(404);
    expect(await tripCount()).toBe(before);
  });

  it('replays an offline trip with the same clientId once (201, then 200 with the same trip)', async () => {
    const clientId = randomUUID();
    const body = { ...basics, startOdometer: 70_000, endOdometer: 70_008, clientId };
    const first = await request(api.app).post('/api/trips').set(as(api, 'helper')).send(body).expect(201);
    const before = await tripCount();
    const again = await request(api.app).post('/api/trips').set(as(api, 'helper')).send(body).expect(200);
    expect(again.body).toEqual(first.body);
    expect(await tripCount()).toBe(before);
  });

  it('lists by date and job, pages with a cursor, and reads one', async () => {
    const all = await allTrips();
    expect(all.length).toBe(await tripCount());
    expect(new Set(all.map((trip) => trip.id)).size).toBe(all.length);
    const week = await allTrips({ from: '2026-11-09', to: '2026-11-15' });
    expect(week.map((trip) => trip.id)).toEqual(
      all
        .filter((trip) => trip.tripDate >= '2026-11-09' && trip.tripDate <= '2026-11-15')
        .map((trip) => trip.id),
    );
    expect(week.length).toBeGreaterThan(0);
    const withJob = all.find((trip) => trip.jobId !== null)!;
    expect((await allTrips({ jobId: withJob.jobId! })).map((trip) => trip.id)).toEqual(
      all.filter((trip) => trip.jobId === withJob.jobId).map((trip) => trip.id),
    );
    const one = await request(api.app).get(`/api/trips/${withJob.id}`).set(as(api, 'helper')).expect(200);
    expect(one.body).toEqual(withJob);
    await request(api.app).get('/api/trips/999999').set(owner()).expect(404);
    await request(api.app).get('/api/trips').set(as(api, 'customer')).expect(403);
  });

  it('deletes a trip (owner only) and keeps what it said in the audit trail', async () => {
    const trip = await createTrip({ startOdometer: 80_000, endOdometer: 80_004 });
    await request(api.app).delete(`/api/trips/${trip.id}`).set(as(api, 'helper')).expect(403);
    await request(api.app).delete(`/api/trips/${trip.id}`).set(owner()).expect(204);
    await request(api.app).get(`/api/trips/${trip.id}`).set(owner()).expect(404);
    await request(api.app).delete(`/api/trips/${trip.id}`).set(owner()).expect(404);
    const audits = await db()
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'trip.deleted'), eq(t.auditEvents.entityId, String(trip.id))));
    expect(audits).toHaveLength(1);
    expect(audits[0]!.details).toMatchObject({ startOdometer: 80_000, endOdometer: 80_004 });
  });
});

describe('the tax-year summary', () => {
  it('totals miles and deduction per month and for the year, matching the trips one by one', async () => {
    const response = await request(api.app)
      .get('/api/trips/summary')
      .query({ year: 2026 })
      .set(as(api, 'bookkeeper'))
      .expect(200);
    const summary = TripSummarySchema.parse(response.body);
    expect(summary.months.map((m) => m.month)).toEqual(
      Array.from({ length: 12 }, (_, i) => `2026-${String(i + 1).padStart(2, '0')}`),
    );
    // Cross-check with decimal.js over the trips as the API lists them: each finished 2026 trip's
    // exact odometer distance (km ÷ 1.609344, NIST SP 811), summed per month; one rate all year,
    // 72.5 ¢/mi (IRS Notice 2026-10), applied to the month's miles and rounded half up.
    const finished = (await allTrips({ from: '2026-01-01', to: '2026-12-31' })).filter(
      (trip) => trip.endOdometer !== null,
    );
    const exactMiles = (trip: Trip) => {
      const distance = new Decimal(trip.endOdometer!).minus(trip.startOdometer);
      return trip.odometerUnit === 'km' ? distance.div('1.609344') : distance;
    };
    let yearMiles = new Decimal(0);
    for (const month of summary.months) {
      const trips = finished.filter((trip) => trip.tripDate.startsWith(month.month));
      const miles = trips.reduce((sum, trip) => sum.plus(exactMiles(trip)), new Decimal(0));
      yearMiles = yearMiles.plus(miles);
      const rounded = miles.toDecimalPlaces(3, Decimal.ROUND_HALF_UP);
      expect(month.trips).toBe(trips.length);
      expect(month.miles).toBe(rounded.toNumber());
      expect(month.deductionCents).toBe(
        rounded.times('72.5').toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber(),
      );
    }
    const roundedYear = yearMiles.toDecimalPlaces(3, Decimal.ROUND_HALF_UP);
    expect(summary.total.trips).toBe(finished.length);
    expect(summary.total.miles).toBe(roundedYear.toNumber());
    expect(summary.total.deductionCents).toBe(
      roundedYear.times('72.5').toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber(),
    );
    // The seed logs six weeks of call-outs ending 2026-11-18: October and November have trips.
    expect(summary.months[9]!.trips).toBeGreaterThan(0);
    expect(summary.months[10]!.trips).toBeGreaterThan(0);
    expect(summary.months[0]).toEqual({ month: '2026-01', trips: 0, miles: 0, deductionCents: 0 });
  });

  it('answers a year with no trips with zeros, and a year with no known rate with a null deduction', async () => {
    const empty = await request(api.app).get('/api/trips/summary?year=2019').set(owner()).expect(200);
    expect(empty.body.total).toEqual({ trips: 0, miles: 0, deductionCents: 0 });
    await createTrip({ tripDate: '2032-05-05', startOdometer: 1_000, endOdometer: 1_020 });
    const unknown = await request(api.app).get('/api/trips/summary?year=2032').set(owner()).expect(200);
    expect(unknown.body.total).toEqual({ trips: 1, miles: 20, deductionCents: null });
    expect(unknown.body.months[4]).toEqual({ month: '2032-05', trips: 1, miles: 20, deductionCents: null });
  });

  it('refuses a missing or bad year with 400', async () => {
    for (const year of [undefined, 'twenty', '2026.5', '99999']) {
      await request(api.app)
        .get('/api/trips/summary')
        .query(year === undefined ? {} : { year })
        .set(owner())
        .expect(400);
    }
  });
});

describe('the CSV for the bookkeeper', () => {
  it('has IRS Publication 463’s log columns plus the deduction, quoted per RFC 4180', async () => {
    await createTrip({
      tripDate: '2026-09-14',
      startOdometer: 47_100,
      endOdometer: 47_112.3,
      destination: '=HYPERLINK("x")',
      purpose: 'Parts run, "urgent" for the Larch 570',
    });
    await createTrip({ tripDate: '2026-09-15', startOdometer: 47_200 }); // still open: not in the log
    const response = await request(api.app)
      .get('/api/trips/export.csv')
      .query({ from: '2026-09-01', to: '2026-09-30' })
      .set(as(api, 'bookkeeper'))
      .expect(200);
    expect(response.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(response.headers['content-disposition']).toContain('attachment');
    const lines = response.text.split('\r\n');
    expect(lines.at(-1)).toBe('');
    expect(lines[0]).toBe(TRIP_CSV_COLUMNS.join(','));
    expect(lines[0]).toBe(
      'Date,Destination,Business purpose,Odometer start,Odometer end,Odometer unit,Miles,Rate (cents/mi),Deduction (USD)',
    );
    // RFC 4180 §2: a field with a comma or a quote is quoted and its quotes doubled; the leading
    // = gets a ' so a spreadsheet shows the text instead of running it (OWASP, "CSV Injection").
    // Hand arithmetic: 12.3 mi × 72.5 ¢ (IRS Notice 2026-10) = 891.75 ¢ → $8.92.
    expect(lines.slice(1, -1)).toEqual([
      `2026-09-14,"'=HYPERLINK(""x"")","Parts run, ""urgent"" for the Larch 570",47100,47112.3,mi,12.3,72.5,8.92`,
    ]);
  });

  it('exports the seeded weeks in date order, each row matching the trip', async () => {
    const response = await request(api.app)
      .get('/api/trips/export.csv?from=2026-11-09&to=2026-11-15')
      .set(owner())
      .expect(200);
    const rows = response.text.trim().split('\r\n').slice(1);
    const trips = (await allTrips({ from: '2026-11-09', to: '2026-11-15' })).filter(
      (trip) => trip.endOdometer !== null,
    );
    expect(rows.length).toBe(trips.length);
    const dates = rows.map((row) => row.slice(0, 10));
    expect([...dates].sort()).toEqual(dates);
    await request(api.app).get('/api/trips/export.csv?from=nope').set(owner()).expect(400);
  });
});
