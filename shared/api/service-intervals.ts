import { z } from 'zod';
import { IdSchema, IsoDateSchema, ListQuerySchema, listResponseSchema, text } from './common';
import { MeterUnitSchema, SpecSourceSchema } from './machines';
import { IntervalLimitKindSchema, IntervalStatusSchema, ServiceItemSchema } from './reminders';
import { VerdictSchema } from './readings';

/** A machine's service items, each due by distance, engine hours or months, whichever comes first. */
export const SERVICE_INTERVALS_PATH = '/api/machines/:id/intervals';
export const SERVICE_INTERVAL_PATH = `${SERVICE_INTERVALS_PATH}/:intervalId`;
export const serviceIntervalsPath = (machineId: number) => `/api/machines/${machineId}/intervals`;

/** Where an interval stands on `asOf` (the business's calendar day), as the evaluator judged it. */
export const IntervalStateSchema = z.object({
  asOf: z.string(),
  status: IntervalStatusSchema,
  verdict: VerdictSchema,
  /** One line a customer could read, with the numbers and their units. */
  reason: z.string(),
  /** The limit that comes first; null when none could be judged. */
  dueBy: IntervalLimitKindSchema.nullable(),
  dueOn: z.string().nullable(),
  /** In the machine's meter unit. */
  dueAtMeter: z.number().nullable(),
  remainingDays: z.number().int().nullable(),
  remainingMeter: z.number().nullable(),
});
export type IntervalState = z.infer<typeof IntervalStateSchema>;

export const ServiceIntervalSchema = z.object({
  id: z.number().int(),
  machineId: z.number().int(),
  item: ServiceItemSchema,
  label: z.string(),
  everyKm: z.number().nullable(),
  everyHours: z.number().nullable(),
  everyMonths: z.number().int().nullable(),
  lastDoneOn: z.string().nullable(),
  /** In the machine's meter unit (`meterUnit`). */
  lastDoneMeter: z.number().nullable(),
  meterUnit: MeterUnitSchema,
  source: SpecSourceSchema,
  state: IntervalStateSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type ServiceInterval = z.infer<typeof ServiceIntervalSchema>;

const distance = z.number().positive().max(1_000_000);
const hours = z.number().positive().max(100_000);
/** Whole months: the evaluator adds calendar months, and 40 years covers any real interval. */
const months = z.number().int().positive().max(480);
const meter = z.number().nonnegative().max(10_000_000);

const limitFields = {
  everyKm: distance,
  /** Converted to kilometres on the way in (1 mi = 1.609 344 km exactly). */
  everyMiles: distance,
  everyHours: hours,
  everyMonths: months,
};
const LIMIT_KEYS = ['everyKm', 'everyMiles', 'everyHours', 'everyMonths'] as const;

function oneDistanceUnit(value: { everyKm?: number | null; everyMiles?: number | null }) {
  return value.everyKm === undefined || value.everyMiles === undefined;
}
const ONE_DISTANCE_UNIT = {
  message: 'Give the distance in everyKm or everyMiles, not both',
  path: ['everyMiles'],
};

export const CreateServiceIntervalInputSchema = z
  .strictObject({
    item: ServiceItemSchema,
    label: text(120),
    everyKm: limitFields.everyKm.optional(),
    everyMiles: limitFields.everyMiles.optional(),
    everyHours: limitFields.everyHours.optional(),
    everyMonths: limitFields.everyMonths.optional(),
    lastDoneOn: IsoDateSchema,
    /** In the machine's meter unit. */
    lastDoneMeter: meter.optional(),
    source: SpecSourceSchema.optional(),
  })
  .refine((value) => LIMIT_KEYS.some((key) => value[key] !== undefined), {
    message: 'Set at least one limit: everyKm, everyMiles, everyHours or everyMonths',
    path: ['everyMonths'],
  })
  .refine(oneDistanceUnit, ONE_DISTANCE_UNIT);
export type CreateServiceIntervalInput = z.infer<typeof CreateServiceIntervalInputSchema>;

/**
 * A change, or "done": `lastDoneOn` with `lastDoneMeter`. A limit set to null is removed; the
 * interval must keep at least one (checked against the stored row).
 */
export const UpdateServiceIntervalInputSchema = z
  .strictObject({
    item: ServiceItemSchema.optional(),
    label: text(120).optional(),
    everyKm: limitFields.everyKm.nullish(),
    everyMiles: limitFields.everyMiles.nullish(),
    everyHours: limitFields.everyHours.nullish(),
    everyMonths: limitFields.everyMonths.nullish(),
    lastDoneOn: IsoDateSchema.optional(),
    lastDoneMeter: meter.nullish(),
    source: SpecSourceSchema.optional(),
  })
  .refine((value) => Object.keys(value).length > 0, { message: 'Nothing to change' })
  .refine(oneDistanceUnit, ONE_DISTANCE_UNIT);
export type UpdateServiceIntervalInput = z.infer<typeof UpdateServiceIntervalInputSchema>;

export const ServiceIntervalParamsSchema = z.object({ id: IdSchema, intervalId: IdSchema });

export const ServiceIntervalListQuerySchema = ListQuerySchema;
export type ServiceIntervalListQuery = z.infer<typeof ServiceIntervalListQuerySchema>;
export const ServiceIntervalListSchema = listResponseSchema(ServiceIntervalSchema);
