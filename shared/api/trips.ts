import { z } from 'zod';
import {
  IsoDateSchema,
  IsoDateTimeSchema,
  IdSchema,
  ListQuerySchema,
  listResponseSchema,
  optionalText,
  text,
} from './common';

export const TRIPS_PATH = '/api/trips';
export const TRIPS_SUMMARY_PATH = `${TRIPS_PATH}/summary`;
export const TRIPS_EXPORT_PATH = `${TRIPS_PATH}/export.csv`;
export const tripPath = (id: number) => `${TRIPS_PATH}/${id}`;

/** A van's odometer counts miles or kilometres; deductions are always figured in miles. */
export const ODOMETER_UNITS = ['mi', 'km'] as const;
export const OdometerUnitSchema = z.enum(ODOMETER_UNITS);
export type OdometerUnit = z.infer<typeof OdometerUnitSchema>;

/** Far above any van's odometer; a guard against a slipped digit, not a limit of the log. */
const MAX_ODOMETER = 10_000_000;
const odometer = () => z.number().finite().min(0).max(MAX_ODOMETER);

/** One entry of the mileage log, with the columns IRS Publication 463's sample log asks for. */
export const TripSchema = z.object({
  id: z.number().int(),
  jobId: z.number().int().nullable(),
  /** YYYY-MM-DD on the business's calendar. */
  tripDate: z.string(),
  startOdometer: z.number(),
  endOdometer: z.number().nullable(),
  odometerUnit: OdometerUnitSchema,
  miles: z
    .number()
    .nullable()
    .describe(
      'endOdometer − startOdometer, in miles (km ÷ 1.609344), to 0.001 mi; null while the trip is open',
    ),
  origin: z.string().nullable(),
  destination: z.string(),
  purpose: z.string(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  rateCentsPerMile: z
    .number()
    .nullable()
    .describe(
      'IRS business standard mileage rate in force on tripDate (72.5 for 2026); null when none is known',
    ),
  deductionCents: z
    .number()
    .int()
    .nullable()
    .describe('miles × rate, rounded half up to the cent; null while open or when no rate is known'),
  createdAt: z.string(),
});
export type Trip = z.infer<typeof TripSchema>;

/**
 * Start a trip (no end odometer yet) or log one after the fact with both odometers. `clientId`
 * makes an offline replay land once.
 */
export const CreateTripInputSchema = z
  .strictObject({
    jobId: IdSchema.nullish(),
    /** The business's today when left out. */
    tripDate: IsoDateSchema.optional(),
    startOdometer: odometer(),
    endOdometer: odometer().nullish(),
    odometerUnit: OdometerUnitSchema.optional(),
    origin: optionalText(200),
    destination: text(200),
    purpose: text(500),
    /** Defaults to now for a trip started without an end odometer. */
    startedAt: IsoDateTimeSchema.nullish(),
    endedAt: IsoDateTimeSchema.nullish(),
    clientId: z.uuid().optional(),
  })
  .refine((trip) => trip.endOdometer == null || trip.endOdometer >= trip.startOdometer, {
    message: 'endOdometer must be at least startOdometer',
    path: ['endOdometer'],
  });
export type CreateTripInput = z.infer<typeof CreateTripInputSchema>;

/** End a trip (set its end odometer) or correct it; the end must not be below the start. */
export const UpdateTripInputSchema = z
  .strictObject({
    jobId: IdSchema.nullish(),
    tripDate: IsoDateSchema.optional(),
    startOdometer: odometer().optional(),
    endOdometer: odometer().nullish(),
    origin: optionalText(200),
    destination: text(200).optional(),
    purpose: text(500).optional(),
    startedAt: IsoDateTimeSchema.nullish(),
    /** Defaults to now when an open trip is given its end odometer. */
    endedAt: IsoDateTimeSchema.nullish(),
  })
  .refine((value) => Object.keys(value).length > 0, { message: 'Nothing to change' });
export type UpdateTripInput = z.infer<typeof UpdateTripInputSchema>;

export const TripListQuerySchema = ListQuerySchema.extend({
  /** tripDate on or after. */
  from: IsoDateSchema.optional(),
  /** tripDate on or before. */
  to: IsoDateSchema.optional(),
  jobId: IdSchema.optional(),
});
export type TripListQuery = z.infer<typeof TripListQuerySchema>;
export const TripListSchema = listResponseSchema(TripSchema);

export const TripSummaryQuerySchema = z.object({
  year: z.coerce.number().int().min(1900).max(9999),
});
export type TripSummaryQuery = z.infer<typeof TripSummaryQuerySchema>;

/** Miles and deduction over some finished trips; open trips (no end odometer) are left out. */
export const MileageTotalsSchema = z.object({
  trips: z.number().int().describe('Finished trips counted'),
  miles: z.number().describe('Sum of the trips’ miles (km odometers converted), to 0.001 mi'),
  deductionCents: z
    .number()
    .int()
    .nullable()
    .describe(
      'For each IRS rate period: the period’s miles × its rate, rounded half up to the cent once; summed. Null when some miles fall on days with no known rate',
    ),
});
export type MileageTotals = z.infer<typeof MileageTotalsSchema>;

export const TripSummarySchema = z.object({
  year: z.number().int(),
  /** Twelve entries, January first; a month without trips has zeros. */
  months: z.array(MileageTotalsSchema.extend({ month: z.string().describe('YYYY-MM') })),
  /**
   * The tax year's figures, from the year's own miles (not the sum of the rounded months, which
   * can differ from it by a cent or two).
   */
  total: MileageTotalsSchema,
});
export type TripSummary = z.infer<typeof TripSummarySchema>;

export const TripExportQuerySchema = z.object({
  from: IsoDateSchema.optional(),
  to: IsoDateSchema.optional(),
});
export type TripExportQuery = z.infer<typeof TripExportQuerySchema>;

/** The CSV's header row: IRS Publication 463's sample-log columns, then unit, rate and deduction. */
export const TRIP_CSV_COLUMNS = [
  'Date',
  'Destination',
  'Business purpose',
  'Odometer start',
  'Odometer end',
  'Odometer unit',
  'Miles',
  'Rate (cents/mi)',
  'Deduction (USD)',
] as const;
