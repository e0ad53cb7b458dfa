import { z } from 'zod';
import { IdSchema, ListQuerySchema, listResponseSchema, optionalText } from './common';
import { TaxRoundingSchema } from './invoices';
import { EstimateStatusSchema, JOBS_PATH, LineItemKindSchema } from './jobs';
import { OutboxItemSchema } from './outbox';

/**
 * Estimates: a job's line items as quoted, sent to the customer, approved or declined by them
 * (or by the owner on their word, recorded as such). PRODUCT.md, "Estimates and invoices".
 */
export const ESTIMATES_PATH = '/api/estimates';
/** POST: quote the job's lines as they stand now, and mail the estimate. */
export const JOB_ESTIMATE_PATH = `${JOBS_PATH}/:id/estimate`;
export const jobEstimatePath = (jobId: number) => `${JOBS_PATH}/${jobId}/estimate`;
/** GET: the job's estimates, newest first. */
export const JOB_ESTIMATES_PATH = `${JOBS_PATH}/:id/estimates`;
export const jobEstimatesPath = (jobId: number) => `${JOBS_PATH}/${jobId}/estimates`;
export const ESTIMATE_PDF_PATH = `${ESTIMATES_PATH}/:id/pdf`;
export const estimatePdfPath = (id: number) => `${ESTIMATES_PATH}/${id}/pdf`;
export const ESTIMATE_APPROVE_PATH = `${ESTIMATES_PATH}/:id/approve`;
export const estimateApprovePath = (id: number) => `${ESTIMATES_PATH}/${id}/approve`;
export const ESTIMATE_DECLINE_PATH = `${ESTIMATES_PATH}/:id/decline`;
export const estimateDeclinePath = (id: number) => `${ESTIMATES_PATH}/${id}/decline`;

/** Who gave the decision: the customer signed in, or the owner passing on the customer's word. */
export const ESTIMATE_DECIDED_VIA = ['customer', 'owner_for_customer'] as const;
export const EstimateDecidedViaSchema = z.enum(ESTIMATE_DECIDED_VIA);
export type EstimateDecidedVia = z.infer<typeof EstimateDecidedViaSchema>;

/**
 * A line as quoted. Estimates written before lines carried their markup, tax flag and total
 * (the demo seed's) leave those null rather than guess them.
 */
export const EstimateLineSchema = z.object({
  kind: LineItemKindSchema,
  description: z.string(),
  partNumber: z.string().nullable(),
  quantityMilli: z.number().int(),
  /** Before any parts markup; `lineTotalCents` includes it. */
  unitPriceCents: z.number().int(),
  markupBps: z.number().int().nullable(),
  taxable: z.boolean().nullable(),
  lineTotalCents: z.number().int().nullable(),
});
export type EstimateLine = z.infer<typeof EstimateLineSchema>;

export const EstimateSchema = z.object({
  id: z.number().int(),
  jobId: z.number().int(),
  customerId: z.number().int(),
  status: EstimateStatusSchema,
  lines: z.array(EstimateLineSchema),
  /** Null on estimates from before the breakdown was kept; `totalCents` always. */
  subtotalCents: z.number().int().nullable(),
  taxCents: z.number().int().nullable(),
  totalCents: z.number().int(),
  taxRatePpm: z.number().int().nullable(),
  taxRounding: TaxRoundingSchema.nullable(),
  /** The owner's message to the customer, printed on the estimate. */
  note: z.string().nullable(),
  sentAt: z.string().nullable(),
  decidedAt: z.string().nullable(),
  decidedById: z.number().int().nullable(),
  decidedByName: z.string().nullable(),
  decidedVia: EstimateDecidedViaSchema.nullable(),
  /** How the word was given when the owner recorded it ("by phone, 14:05"). */
  decisionNote: z.string().nullable(),
  createdAt: z.string(),
});
export type Estimate = z.infer<typeof EstimateSchema>;

/** What `POST /api/jobs/:id/estimate` answers: the estimate and its mail (null: no e-mail address). */
export const EstimateCreatedSchema = EstimateSchema.extend({ mail: OutboxItemSchema.nullable() });
export type EstimateCreated = z.infer<typeof EstimateCreatedSchema>;

export const CreateEstimateInputSchema = z.strictObject({ note: optionalText(1000) });
export type CreateEstimateInput = z.infer<typeof CreateEstimateInputSchema>;

/** The customer may add a word; the owner must say how the customer gave theirs. */
export const DecideEstimateInputSchema = z.strictObject({ note: optionalText(500) });
export type DecideEstimateInput = z.infer<typeof DecideEstimateInputSchema>;

export const EstimateListQuerySchema = ListQuerySchema;
export type EstimateListQuery = z.infer<typeof EstimateListQuerySchema>;
export const EstimateListSchema = listResponseSchema(EstimateSchema);

export const EstimateParamsSchema = z.object({ id: IdSchema });
