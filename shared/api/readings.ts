import { z } from 'zod';
import { QUANTITIES } from '../quantities';
import { IdSchema, IsoDateTimeSchema, ListQuerySchema, listResponseSchema, optionalText } from './common';

// The list and the canonical units live in a zod-free module (the CLI's `calc` loads it alone).
export { CANONICAL_UNITS, QUANTITIES, type Quantity } from '../quantities';
export const QuantitySchema = z.enum(QUANTITIES);

export const VERDICTS = ['pass', 'warn', 'fail'] as const;
export const VerdictSchema = z.enum(VERDICTS);
export type Verdict = z.infer<typeof VerdictSchema>;

export const CHECK_RUN_STATUSES = ['in_progress', 'paused', 'finished', 'abandoned'] as const;
export const CheckRunStatusSchema = z.enum(CHECK_RUN_STATUSES);

/** A job's readings: `/api/jobs/:id/readings`. */
export const JOB_READINGS_PATH = '/api/jobs/:id/readings';
export const jobReadingsPath = (jobId: number) => `/api/jobs/${jobId}/readings`;

export const ReadingParamsSchema = z.object({ id: IdSchema, readingId: IdSchema });

/** A step key as the procedures spell them (`static-pressure-hold`). */
export const StepKeySchema = z
  .string()
  .trim()
  .min(1)
  .max(60)
  .regex(/^[a-z0-9][a-z0-9_-]*$/, 'a step key is lower-case letters, digits, - and _');

/**
 * A reading as typed: `"43psi"`, `"3 bar"`, `"12.4V"` (the unit inside the text), or a number with
 * its `unit` beside it. The server converts it to the quantity's canonical unit and keeps both.
 */
export const CreateReadingInputSchema = z
  .strictObject({
    quantity: QuantitySchema,
    value: z.union([z.string().trim().min(1).max(40), z.number().finite()]),
    /** Only with a numeric `value`: `psi`, `kPa`, `bar`, `V`, `mL`, `L/h`, `F` … */
    unit: z.string().trim().min(1).max(20).optional(),
    note: optionalText(2000),
    takenAt: IsoDateTimeSchema.optional(),
    stepKey: StepKeySchema.nullish(),
    /** Set by an offline client; the same clientId twice stores one reading. */
    clientId: z.uuid().optional(),
  })
  .superRefine((input, ctx) => {
    if (typeof input.value === 'number' && input.unit === undefined) {
      ctx.addIssue({ code: 'custom', path: ['unit'], message: 'a numeric value needs its unit' });
    }
    if (typeof input.value === 'string' && input.unit !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['unit'],
        message: 'give the unit inside the value (e.g. "43psi") or send a number with unit, not both',
      });
    }
  });
export type CreateReadingInput = z.infer<typeof CreateReadingInputSchema>;

/**
 * What a reading means against the job's machine. `basis: 'reading'` judges this one value
 * (pressure against the fuel band, flow against its minimum); `basis: 'step'` is the verdict of
 * the check step the reading was taken in, as the server's walk of that run decided it.
 */
export const ReadingJudgementSchema = z.object({
  verdict: VerdictSchema,
  reason: z.string(),
  specSource: z.enum(['manual', 'generic']).nullable(),
  basis: z.enum(['reading', 'step']),
});
export type ReadingJudgement = z.infer<typeof ReadingJudgementSchema>;

export const ReadingSchema = z.object({
  id: z.number().int(),
  jobId: z.number().int(),
  quantity: QuantitySchema,
  /** In the canonical unit of the quantity (`unit`): kPa, V, L/h, mL, C, s, ohm, ratio. */
  value: z.number(),
  unit: z.string(),
  enteredValue: z.number(),
  enteredUnit: z.string(),
  takenAt: z.string(),
  note: z.string().nullable(),
  stepKey: z.string().nullable(),
  checkRunId: z.number().int().nullable(),
  clientId: z.string().nullable(),
  judgement: ReadingJudgementSchema.nullable(),
  createdAt: z.string(),
});
export type Reading = z.infer<typeof ReadingSchema>;

export const ReadingListQuerySchema = ListQuerySchema.extend({
  quantity: QuantitySchema.optional(),
  checkRunId: IdSchema.optional(),
});
export type ReadingListQuery = z.infer<typeof ReadingListQuerySchema>;

export const ReadingListSchema = listResponseSchema(ReadingSchema);
