import { z } from 'zod';
import { findProcedure, PROCEDURE_KEYS } from '../procedures/index';
import { IdSchema, ListQuerySchema, listResponseSchema } from './common';
import { LineItemKindSchema } from './jobs';
import { CheckRunStatusSchema, QuantitySchema, StepKeySchema, VerdictSchema } from './readings';

/** A job's guided-check runs: `/api/jobs/:id/checks`. */
export const JOB_CHECKS_PATH = '/api/jobs/:id/checks';
export const jobChecksPath = (jobId: number) => `/api/jobs/${jobId}/checks`;

export const CheckRunParamsSchema = z.object({ id: IdSchema, runId: IdSchema });

/** A procedure by its key (`fuel-delivery`) or a short name the CLI accepts (`fuel`). */
export const ProcedureNameSchema = z
  .string()
  .trim()
  .min(1)
  .max(40)
  .refine((name) => findProcedure(name) !== null, {
    message: `unknown procedure (one of ${PROCEDURE_KEYS.join(', ')})`,
  });

/**
 * One answered step as a client sends it. A client's own `verdict`, `reason` and `figures` are
 * accepted and dropped here, before the server sees them: every verdict is the server's walk.
 */
export const StepAnswerInputSchema = z
  .strictObject({
    stepKey: StepKeySchema,
    /** One value per field key; the engine checks each against the step's fields. */
    answer: z.record(z.string().max(60), z.unknown()),
    cautionAcknowledged: z.boolean().optional(),
    verdict: z.unknown().optional(),
    reason: z.unknown().optional(),
    figures: z.unknown().optional(),
  })
  .transform(({ stepKey, answer, cautionAcknowledged }) => ({
    stepKey,
    answer,
    cautionAcknowledged: cautionAcknowledged ?? false,
  }));
export type StepAnswerInput = z.infer<typeof StepAnswerInputSchema>;

/**
 * Starts a run; with `steps`, saves a whole run walked offline at once. `status` asks for the
 * state it should be saved in and is refused when the steps say otherwise.
 */
export const CreateCheckRunInputSchema = z.strictObject({
  procedure: ProcedureNameSchema,
  clientId: z.uuid().optional(),
  steps: z.array(StepAnswerInputSchema).max(100).optional(),
  status: z.enum(['paused', 'finished']).optional(),
});
export type CreateCheckRunInput = z.infer<typeof CreateCheckRunInputSchema>;

export const FigureSchema = z.union([
  z.number(),
  z.string(),
  z.boolean(),
  z.null(),
  z.array(z.union([z.number(), z.string()])),
]);

export const EvaluationSchema = z.object({
  verdict: VerdictSchema,
  reason: z.string(),
  figures: z.record(z.string(), FigureSchema),
});
export type EvaluationView = z.infer<typeof EvaluationSchema>;

const ChoiceOptionSchema = z.object({
  value: z.string(),
  label: z.string(),
  verdict: VerdictSchema.optional(),
  reason: z.string().optional(),
});

const fieldBase = {
  key: z.string(),
  label: z.string(),
  hint: z.string().optional(),
  optional: z.boolean().optional(),
  showWhen: z.object({ field: z.string(), in: z.array(z.string()) }).optional(),
};

/** A step's field, as the engine's procedure data defines it (shared/procedures/types.ts). */
export const FieldSchema = z.discriminatedUnion('type', [
  z.object({
    ...fieldBase,
    type: z.literal('measurement'),
    quantity: QuantitySchema,
    defaultUnit: z.string(),
  }),
  z.object({ ...fieldBase, type: z.literal('choice'), options: z.array(ChoiceOptionSchema) }),
  z.object({ ...fieldBase, type: z.literal('choices'), options: z.array(ChoiceOptionSchema) }),
  z.object({
    ...fieldBase,
    type: z.literal('series'),
    quantity: QuantitySchema,
    defaultUnit: z.string(),
    minPoints: z.number().int(),
  }),
  z.object({
    ...fieldBase,
    type: z.literal('list'),
    quantity: QuantitySchema,
    defaultUnit: z.string(),
    itemLabel: z.string(),
    minItems: z.number().int(),
    maxItems: z.number().int(),
    sameCountAs: z.string().optional(),
  }),
]);

/** The caution to show and acknowledge before a hazardous step, its deferral to the manual last. */
export const CautionSchema = z.object({
  key: z.string(),
  title: z.string(),
  lines: z.array(z.string()),
});

/** The step to answer next: what to do, the caution first, and the fields to fill. */
export const CurrentStepSchema = z.object({
  key: z.string(),
  title: z.string(),
  prompt: z.string(),
  caution: CautionSchema.nullable(),
  fields: z.array(FieldSchema),
});
export type CurrentStep = z.infer<typeof CurrentStepSchema>;

export const CheckStepSchema = z.object({
  seq: z.number().int(),
  stepKey: z.string(),
  title: z.string(),
  /** The answer as the engine read it (series sorted by time, choices without repeats). */
  answer: z.record(z.string(), z.unknown()),
  evaluation: EvaluationSchema.nullable(),
  /** Keys of the findings this step raised. */
  findings: z.array(z.string()),
  cautionAcknowledged: z.boolean(),
  cautionAcknowledgedAt: z.string().nullable(),
  answeredAt: z.string(),
});
export type CheckStep = z.infer<typeof CheckStepSchema>;

export const SuggestedLineSchema = z.object({
  kind: LineItemKindSchema,
  description: z.string(),
  /** Labour in hours, parts and supplies in units. */
  quantity: z.number(),
});

export const FindingSchema = z.object({
  key: z.string(),
  title: z.string(),
  detail: z.string(),
  nextAction: z.string(),
  lines: z.array(SuggestedLineSchema),
  stepKey: z.string().nullable(),
  verdict: VerdictSchema,
});

export const DiagnosisSchema = z.object({
  starvationMeasured: z.boolean(),
  causes: z.array(
    z.object({
      cause: z.string(),
      title: z.string(),
      score: z.number(),
      likelihood: z.enum(['high', 'medium', 'low']),
      evidence: z.array(z.string()),
      nextAction: z.string(),
    }),
  ),
  verdict: VerdictSchema,
  reason: z.string(),
});

/** What a finished run concluded: findings ranked worst first, the next action, lines, advice. */
export const CheckOutcomeSchema = z.object({
  verdict: VerdictSchema,
  findings: z.array(FindingSchema),
  diagnosis: DiagnosisSchema.nullable(),
  nextAction: z.string(),
  lines: z.array(SuggestedLineSchema),
  advice: z.array(z.string()),
});
export type CheckOutcome = z.infer<typeof CheckOutcomeSchema>;

export const CheckRunSummarySchema = z.object({
  id: z.number().int(),
  jobId: z.number().int(),
  procedureKey: z.string(),
  procedureVersion: z.number().int(),
  title: z.string(),
  status: CheckRunStatusSchema,
  /** The run's final verdict; null until it is finished. */
  verdict: VerdictSchema.nullable(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  clientId: z.string().nullable(),
});
export type CheckRunSummary = z.infer<typeof CheckRunSummarySchema>;

/**
 * The limits a run is judged by, in canonical units: the machine's specs as they were when the
 * run started (a later edit of the machine does not re-judge it); null means the generic default.
 */
export const RunSpecSchema = z.object({
  fuelPressureMinKpa: z.number().nullable(),
  fuelPressureMaxKpa: z.number().nullable(),
  holdMaxDropKpa: z.number().nullable(),
  holdMinutes: z.number().nullable(),
  flowMinLph: z.number().nullable(),
});
export type RunSpec = z.infer<typeof RunSpecSchema>;

/** A run with everything the server's walk of its stored answers derives. */
export const CheckRunSchema = CheckRunSummarySchema.extend({
  spec: RunSpecSchema,
  steps: z.array(CheckStepSchema),
  /** The step to answer next; null once finished. */
  current: CurrentStepSchema.nullable(),
  finished: z.boolean(),
  /** The worst step verdict so far (null before any judged step). */
  verdictSoFar: VerdictSchema.nullable(),
  outcome: CheckOutcomeSchema.nullable(),
  /** Whether the outcome's suggested lines were added to the job (apply-lines). */
  linesApplied: z.boolean(),
});
export type CheckRun = z.infer<typeof CheckRunSchema>;

export const CheckRunListQuerySchema = ListQuerySchema.extend({
  status: CheckRunStatusSchema.optional(),
});
export type CheckRunListQuery = z.infer<typeof CheckRunListQuerySchema>;

export const CheckRunListSchema = listResponseSchema(CheckRunSummarySchema);

/** Answering the current step: `POST /api/jobs/:id/checks/:runId/steps`. */
export const AnswerCheckStepInputSchema = StepAnswerInputSchema;
export type AnswerCheckStepInput = StepAnswerInput;

/** Routes under a run that take no body (back, pause, apply-lines). */
export const EmptyBodySchema = z.strictObject({});
