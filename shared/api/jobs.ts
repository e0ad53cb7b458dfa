import { z } from 'zod';
import {
  IdSchema,
  IsoDateSchema,
  IsoDateTimeSchema,
  ListQuerySchema,
  listResponseSchema,
  optionalText,
  text,
} from './common';

/**
 * A work order's life in the trade's own words (PRODUCT.md, "Jobs"), in the order a job normally
 * moves; `cancelled` can end any open job.
 */
export const JOB_STATUSES = [
  'booked',
  'on_site',
  'diagnosing',
  'awaiting_approval',
  'repairing',
  'complete',
  'invoiced',
  'paid',
  'cancelled',
] as const;
export const JobStatusSchema = z.enum(JOB_STATUSES);
export type JobStatus = z.infer<typeof JobStatusSchema>;

export const LINE_ITEM_KINDS = ['labour', 'part', 'trip', 'supplies', 'other'] as const;
export const LineItemKindSchema = z.enum(LINE_ITEM_KINDS);
export type LineItemKind = z.infer<typeof LineItemKindSchema>;

export const ESTIMATE_STATUSES = ['draft', 'sent', 'approved', 'declined'] as const;
export const EstimateStatusSchema = z.enum(ESTIMATE_STATUSES);

export const JOBS_PATH = '/api/jobs';
export const jobPath = (id: number) => `${JOBS_PATH}/${id}`;
export const jobStatusPath = (id: number) => `${JOBS_PATH}/${id}/status`;
export const jobNotesPath = (id: number) => `${JOBS_PATH}/${id}/notes`;

/** The statuses in the trade's words, as CLI and dashboard show them. */
export const JOB_STATUS_LABELS: Record<JobStatus, string> = {
  booked: 'booked',
  on_site: 'on site',
  diagnosing: 'diagnosing',
  awaiting_approval: 'awaiting approval',
  repairing: 'repairing',
  complete: 'complete',
  invoiced: 'invoiced',
  paid: 'paid',
  cancelled: 'cancelled',
};

/**
 * Set only by the invoicing and payment code (issuing an invoice, settling it), never chosen by
 * hand, so a job's status cannot claim money that the books do not show.
 */
export const BILLING_JOB_STATUSES = ['invoiced', 'paid'] as const satisfies readonly JobStatus[];

/**
 * The moves a person may make by hand. Going back is allowed where the work really goes back: a
 * quote sent back for more diagnosis, a repair that turns up a new fault, a completed job
 * reopened. Once billed, paid or cancelled a job is out of the hand-moved workflow.
 */
export const JOB_TRANSITIONS: Record<JobStatus, readonly JobStatus[]> = {
  booked: ['on_site', 'cancelled'],
  on_site: ['diagnosing', 'cancelled'],
  diagnosing: ['awaiting_approval', 'repairing', 'complete', 'cancelled'],
  awaiting_approval: ['repairing', 'cancelled', 'diagnosing'],
  repairing: ['complete', 'diagnosing'],
  complete: ['repairing'],
  invoiced: [],
  paid: [],
  cancelled: [],
};

export function canTransition(from: JobStatus, to: JobStatus): boolean {
  return JOB_TRANSITIONS[from].includes(to);
}

/** Why a hand move is refused, in one line naming the moves that are allowed. */
export function transitionRefusal(from: JobStatus, to: JobStatus): string {
  const allowed = JOB_TRANSITIONS[from].map((status) => JOB_STATUS_LABELS[status]);
  const billing = (BILLING_JOB_STATUSES as readonly JobStatus[]).includes(to)
    ? ` A job becomes ${JOB_STATUS_LABELS[to]} only through its invoice.`
    : '';
  const moves =
    allowed.length === 0
      ? `A ${JOB_STATUS_LABELS[from]} job cannot be moved by hand.`
      : `A ${JOB_STATUS_LABELS[from]} job can move to ${allowed.join(' or ')}, not ${JOB_STATUS_LABELS[to]}.`;
  return moves + billing;
}

export const JobSchema = z.object({
  id: z.number().int(),
  status: JobStatusSchema,
  customerId: z.number().int(),
  machineId: z.number().int(),
  complaint: z.string(),
  /** Where the work happens: an address, a trailhead, a roadside. */
  location: z.string().nullable(),
  scheduledAt: z.string().nullable(),
  arrivedAt: z.string().nullable(),
  completedAt: z.string().nullable(),
  cancelledAt: z.string().nullable(),
  /** The machine's odometer or hour meter at this visit, in the machine's `meterUnit`. */
  meterReading: z.number().nullable(),
  diagnosis: z.string().nullable(),
  workDone: z.string().nullable(),
  /** The CLI's id for an entry made offline; null when made online without one. */
  clientId: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Job = z.infer<typeof JobSchema>;

/** One line of a job's timeline: a status move (maybe with a note) or a note on its own. */
export const JobEventSchema = z.object({
  id: z.number().int(),
  kind: z.enum(['status', 'note']),
  fromStatus: JobStatusSchema.nullable(),
  toStatus: JobStatusSchema.nullable(),
  /** Staff only: null for a customer. */
  note: z.string().nullable(),
  actorName: z.string().nullable(),
  at: z.string(),
});
export type JobEvent = z.infer<typeof JobEventSchema>;

export const JobDetailSchema = JobSchema.extend({
  customerName: z.string(),
  /** As `machineDisplayName` in shared/api/machines.ts writes it. */
  machineName: z.string(),
  /** Oldest first. A customer sees the status moves only. */
  events: z.array(JobEventSchema),
});
export type JobDetail = z.infer<typeof JobDetailSchema>;

const dbId = z.number().int().positive().max(2_147_483_647);
const meterReading = z.number().min(0).max(10_000_000).nullish();

export const CreateJobInputSchema = z.strictObject({
  customerId: dbId,
  /** Must be one of that customer's machines. */
  machineId: dbId,
  complaint: text(2000),
  location: optionalText(200),
  scheduledAt: IsoDateTimeSchema.nullish(),
  meterReading,
  /** Set by the CLI for offline replay: the same clientId again returns the job already made. */
  clientId: z.uuid().optional(),
});
export type CreateJobInput = z.infer<typeof CreateJobInputSchema>;

/** Status is not here: it moves only along JOB_TRANSITIONS, through the status route. */
export const UpdateJobInputSchema = z.strictObject({
  complaint: text(2000).optional(),
  location: optionalText(200),
  scheduledAt: IsoDateTimeSchema.nullish(),
  meterReading,
  diagnosis: optionalText(4000),
  workDone: optionalText(4000),
});
export type UpdateJobInput = z.infer<typeof UpdateJobInputSchema>;

export const JobStatusChangeInputSchema = z.strictObject({
  status: JobStatusSchema,
  note: optionalText(2000),
  /** Offline replay: a move already recorded under this id is answered with the job, not a 409. */
  clientId: z.uuid().optional(),
});
export type JobStatusChangeInput = z.infer<typeof JobStatusChangeInputSchema>;

export const CreateJobNoteInputSchema = z.strictObject({
  note: text(2000),
  clientId: z.uuid().optional(),
});
export type CreateJobNoteInput = z.infer<typeof CreateJobNoteInputSchema>;

/** `status=booked,on_site` (or the key repeated): one or several statuses. */
const StatusFilterSchema = z.preprocess(
  (value) => (Array.isArray(value) ? value.join(',') : value),
  z
    .string()
    .max(200)
    .transform((value) =>
      value
        .split(',')
        .map((part) => part.trim())
        .filter((part) => part !== ''),
    )
    .pipe(z.array(JobStatusSchema).min(1)),
);

export const JobListQuerySchema = ListQuerySchema.extend({
  status: StatusFilterSchema.optional(),
  customerId: IdSchema.optional(),
  machineId: IdSchema.optional(),
  /** Words in the complaint, the customer's name, or the machine's make, model or VIN. */
  q: z.string().trim().max(120).optional(),
  /** Calendar days on `scheduledAt`, in the business's own time zone, both ends included. */
  from: IsoDateSchema.optional(),
  to: IsoDateSchema.optional(),
}).refine((query) => !query.from || !query.to || query.from <= query.to, {
  message: 'from must not be after to',
  path: ['from'],
});
export type JobListQuery = z.infer<typeof JobListQuerySchema>;

/** A job as lists show it: with the names a person reads instead of ids. */
export const JobSummarySchema = JobSchema.extend({
  customerName: z.string(),
  /** As `machineDisplayName` in shared/api/machines.ts writes it. */
  machineName: z.string(),
});
export type JobSummary = z.infer<typeof JobSummarySchema>;

export const JobListSchema = listResponseSchema(JobSummarySchema);
