import { and, asc, desc, eq, gte, isNotNull, lt, lte, sql } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/common';
import {
  TRIP_CSV_COLUMNS,
  type CreateTripInput,
  type MileageTotals,
  type Trip,
  type TripExportQuery,
  type TripListQuery,
  type TripSummary,
  type UpdateTripInput,
} from '../../shared/api/trips';
import { clean, round } from '../../shared/evaluators/types';
import { IRS_BUSINESS_RATES, mileageDeductionCents, rateOn } from '../../shared/mileage';
import { convert } from '../../shared/units';
import type { Actor } from '../auth/actor';
import { queryRows, type Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { businessToday } from './business-calendar';
import { found, iso, scoped } from './scope';

type Row = typeof t.trips.$inferSelect;
type OdometerUnit = Trip['odometerUnit'];
const tripScope = { businessId: t.trips.businessId };

/** Miles are kept to a thousandth: the finest step mileageDeductionCents takes exactly. */
const MILES_PLACES = 3;

/** An odometer distance in miles; a km odometer is converted at 1 mi = 1.609344 km (shared/units.ts). */
function toMiles(distance: number, unit: OdometerUnit): number {
  return round(convert(clean(distance), unit, 'mi'), MILES_PLACES);
}

/** A van odometer counts mi or km; the column's type also allows engine hours, which no van has. */
function odometerUnit(unit: Row['odometerUnit']): OdometerUnit {
  if (unit === 'h') throw new Error('a trip odometer cannot count hours');
  return unit;
}

export function toTrip(row: Row): Trip {
  const unit = odometerUnit(row.odometerUnit);
  const miles = row.endOdometer === null ? null : toMiles(row.endOdometer - row.startOdometer, unit);
  const rate = rateOn(row.tripDate);
  return {
    id: row.id,
    jobId: row.jobId,
    tripDate: row.tripDate,
    startOdometer: row.startOdometer,
    endOdometer: row.endOdometer,
    odometerUnit: unit,
    miles,
    origin: row.origin,
    destination: row.destination,
    purpose: row.purpose,
    startedAt: iso(row.startedAt),
    endedAt: iso(row.endedAt),
    rateCentsPerMile: rate ? rate.tenthsOfCentPerMile / 10 : null,
    deductionCents: rate && miles !== null ? mileageDeductionCents(miles, rate.tenthsOfCentPerMile) : null,
    createdAt: row.createdAt.toISOString(),
  };
}

export async function listTrips(db: Db, actor: Actor, query: TripListQuery): Promise<ListResponse<Trip>> {
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.trips)
    .where(
      scoped(
        actor,
        tripScope,
        after ? lt(t.trips.id, after) : undefined,
        query.from ? gte(t.trips.tripDate, query.from) : undefined,
        query.to ? lte(t.trips.tripDate, query.to) : undefined,
        query.jobId ? eq(t.trips.jobId, query.jobId) : undefined,
      ),
    )
    .orderBy(desc(t.trips.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toTrip);
}

export async function getTrip(db: Db, actor: Actor, id: number): Promise<Trip> {
  const [row] = await db
    .select()
    .from(t.trips)
    .where(scoped(actor, tripScope, eq(t.trips.id, id)));
  return toTrip(found(row, 'trip'));
}

/** A trip may name a job of the same business only. */
async function checkJob(db: Db, actor: Actor, jobId: number | null | undefined) {
  if (jobId === null || jobId === undefined) return;
  const [job] = await db
    .select({ id: t.jobs.id })
    .from(t.jobs)
    .where(and(eq(t.jobs.businessId, actor.businessId), eq(t.jobs.id, jobId)));
  found(job, 'job');
}

/**
 * Starts a trip, or logs a finished one. A repeat of the same `clientId` (an offline queue
 * replayed) returns the trip it made the first time, with `created: false`.
 */
export async function createTrip(
  db: Db,
  actor: Actor,
  input: CreateTripInput,
  now: Date,
): Promise<{ trip: Trip; created: boolean }> {
  await checkJob(db, actor, input.jobId);
  const open = input.endOdometer === null || input.endOdometer === undefined;
  const [row] = await db
    .insert(t.trips)
    .values({
      businessId: actor.businessId,
      jobId: input.jobId ?? null,
      tripDate: input.tripDate ?? (await businessToday(db, actor.businessId, now)),
      startOdometer: input.startOdometer,
      endOdometer: input.endOdometer ?? null,
      odometerUnit: input.odometerUnit ?? 'mi',
      origin: input.origin ?? null,
      destination: input.destination,
      purpose: input.purpose,
      // A trip started now began now; one logged afterwards keeps only the times it was given.
      startedAt: input.startedAt ? new Date(input.startedAt) : open ? now : null,
      endedAt: input.endedAt ? new Date(input.endedAt) : null,
      clientId: input.clientId ?? null,
      createdBy: actor.userId,
      createdAt: now,
    })
    .onConflictDoNothing({ target: [t.trips.businessId, t.trips.clientId] })
    .returning();
  if (row) return { trip: toTrip(row), created: true };
  const [existing] = await db
    .select()
    .from(t.trips)
    .where(and(eq(t.trips.businessId, actor.businessId), eq(t.trips.clientId, input.clientId!)));
  return { trip: toTrip(found(existing, 'trip')), created: false };
}

const optionalInstant = (value: string | null) => (value === null ? null : new Date(value));

/** Ends a trip (its end odometer, and now as its end time unless given) or corrects it. */
export async function updateTrip(
  db: Db,
  actor: Actor,
  id: number,
  input: UpdateTripInput,
  now: Date,
): Promise<Trip> {
  const [current] = await db
    .select()
    .from(t.trips)
    .where(scoped(actor, tripScope, eq(t.trips.id, id)));
  const trip = found(current, 'trip');
  await checkJob(db, actor, input.jobId);
  const start = input.startOdometer ?? trip.startOdometer;
  const end = input.endOdometer === undefined ? trip.endOdometer : input.endOdometer;
  if (end !== null && end < start) {
    throw new BadRequestError(`Invalid body: endOdometer: ${end} is below the start, ${start}`, [
      { path: 'endOdometer', message: 'must be at least startOdometer' },
    ]);
  }
  const ending = trip.endOdometer === null && end !== null;
  const endedAt =
    input.endedAt !== undefined
      ? optionalInstant(input.endedAt)
      : ending && trip.endedAt === null
        ? now
        : undefined;
  const [row] = await db
    .update(t.trips)
    .set({
      jobId: input.jobId,
      tripDate: input.tripDate,
      startOdometer: input.startOdometer,
      endOdometer: input.endOdometer,
      origin: input.origin,
      destination: input.destination,
      purpose: input.purpose,
      startedAt: input.startedAt === undefined ? undefined : optionalInstant(input.startedAt),
      endedAt,
    })
    .where(eq(t.trips.id, id))
    .returning();
  return toTrip(row!);
}

export async function deleteTrip(db: Db, actor: Actor, id: number, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .delete(t.trips)
      .where(scoped(actor, tripScope, eq(t.trips.id, id)))
      .returning();
    const trip = found(row, 'trip');
    // The log is tax evidence: what was removed is kept in the audit trail.
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'trip.deleted',
      entityType: 'trip',
      entityId: id,
      details: {
        tripDate: trip.tripDate,
        startOdometer: trip.startOdometer,
        endOdometer: trip.endOdometer,
        odometerUnit: trip.odometerUnit,
        destination: trip.destination,
        purpose: trip.purpose,
      },
      at: now,
    });
  });
}

/** One aggregate row: finished trips of one odometer unit on days of one IRS rate (or none). */
interface MileageGroup {
  month: string | null;
  unit: OdometerUnit;
  tenths: number | null;
  trips: number;
  /** Sum of end − start as exact decimal text. */
  distance: string;
}

/**
 * Sums finished trips in SQL, grouped by odometer unit and by the IRS rate period their date
 * falls in (the rate table of shared/mileage.ts joined as a VALUES list), and with `byMonth`
 * also per month (grouping sets: the month rows, and the whole range's rows with month null).
 * The odometer floats are summed as numeric so 48250.7 − 48210.4 adds as exactly 40.3.
 */
async function mileageGroups(
  db: Db,
  businessId: number,
  from: string,
  to: string,
  byMonth: boolean,
): Promise<MileageGroup[]> {
  const rates = sql.join(
    IRS_BUSINESS_RATES.map(
      (rate) => sql`(${rate.from}::date, ${rate.to}::date, ${rate.tenthsOfCentPerMile}::int)`,
    ),
    sql`, `,
  );
  const month = sql`to_char(${t.trips.tripDate}, 'YYYY-MM')`;
  const grouping = byMonth
    ? sql`grouping sets ((${month}, ${t.trips.odometerUnit}, r.tenths), (${t.trips.odometerUnit}, r.tenths))`
    : sql`${t.trips.odometerUnit}, r.tenths`;
  return queryRows<MileageGroup>(
    db,
    sql`select ${byMonth ? month : sql`null`} as month, ${t.trips.odometerUnit} as unit, r.tenths as tenths,
          count(*)::int as trips,
          sum(${t.trips.endOdometer}::numeric - ${t.trips.startOdometer}::numeric)::text as distance
        from ${t.trips}
        left join (values ${rates}) as r(rate_from, rate_to, tenths)
          on ${t.trips.tripDate} between r.rate_from and r.rate_to
        where ${t.trips.businessId} = ${businessId} and ${t.trips.endOdometer} is not null
          and ${t.trips.tripDate} between ${from}::date and ${to}::date
        group by ${grouping}`,
  );
}

/**
 * Totals over some groups: per rate period, the period's miles (each unit converted) times its
 * rate, rounded once; then summed. Unknown-rate miles make the deduction unknown (null).
 */
function totalsOf(groups: readonly MileageGroup[]): MileageTotals {
  const milesByRate = new Map<number | null, number>();
  let trips = 0;
  for (const group of groups) {
    trips += group.trips;
    const miles = convert(Number(group.distance), group.unit, 'mi');
    milesByRate.set(group.tenths, (milesByRate.get(group.tenths) ?? 0) + miles);
  }
  let miles = 0;
  let deductionCents: number | null = 0;
  for (const [tenths, periodMiles] of milesByRate) {
    const rounded = round(periodMiles, MILES_PLACES);
    miles += rounded;
    deductionCents =
      tenths === null || deductionCents === null
        ? null
        : deductionCents + mileageDeductionCents(rounded, tenths);
  }
  return { trips, miles: round(miles, MILES_PLACES), deductionCents };
}

/** Miles and deduction of the finished trips dated from `from` to `to`, both days included. */
export async function mileageTotals(db: Db, businessId: number, from: string, to: string) {
  return totalsOf(await mileageGroups(db, businessId, from, to, false));
}

export async function tripSummary(db: Db, actor: Actor, year: number): Promise<TripSummary> {
  const y = String(year).padStart(4, '0');
  const groups = await mileageGroups(db, actor.businessId, `${y}-01-01`, `${y}-12-31`, true);
  const months = Array.from({ length: 12 }, (_, i) => `${y}-${String(i + 1).padStart(2, '0')}`);
  return {
    year,
    months: months.map((month) => ({ month, ...totalsOf(groups.filter((g) => g.month === month)) })),
    total: totalsOf(groups.filter((g) => g.month === null)),
  };
}

/**
 * RFC 4180 quoting (a field with a comma, quote or line break is quoted, quotes doubled), and
 * for free text a leading ' before = + - @ so a spreadsheet shows it rather than running it
 * (OWASP, "CSV Injection").
 */
function csvField(value: string | number | null, freeText = false): string {
  if (value === null) return '';
  let text = String(value);
  if (freeText && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function dollars(cents: number | null): string | null {
  if (cents === null) return null;
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  return `${sign}${Math.trunc(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

/**
 * The mileage log for the bookkeeper, oldest first: finished trips only (an open trip has no
 * miles yet), the columns of IRS Publication 463's sample log, then unit, rate and deduction.
 */
export async function exportTripsCsv(
  db: Db,
  actor: Actor,
  query: TripExportQuery,
): Promise<{ filename: string; csv: string }> {
  const rows = await db
    .select()
    .from(t.trips)
    .where(
      scoped(
        actor,
        tripScope,
        isNotNull(t.trips.endOdometer),
        query.from ? gte(t.trips.tripDate, query.from) : undefined,
        query.to ? lte(t.trips.tripDate, query.to) : undefined,
      ),
    )
    .orderBy(asc(t.trips.tripDate), asc(t.trips.startOdometer), asc(t.trips.id));
  const lines = rows.map((row) => {
    const trip = toTrip(row);
    return [
      csvField(trip.tripDate),
      csvField(trip.destination, true),
      csvField(trip.purpose, true),
      csvField(trip.startOdometer),
      csvField(trip.endOdometer),
      csvField(trip.odometerUnit),
      csvField(trip.miles),
      csvField(trip.rateCentsPerMile),
      csvField(dollars(trip.deductionCents)),
    ].join(',');
  });
  const header = TRIP_CSV_COLUMNS.map((column) => csvField(column)).join(',');
  const range = `${query.from ?? 'start'}_to_${query.to ?? 'latest'}`;
  // RFC 4180: records end in CRLF.
  return {
    filename: `mileage-log_${range}.csv`,
    csv: [header, ...lines].map((line) => `${line}\r\n`).join(''),
  };
}
