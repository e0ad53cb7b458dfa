import { z } from 'zod';
import { IdSchema, IsoDateSchema, ListQuerySchema, listResponseSchema } from './common';
import { MeterUnitSchema } from './machines';
import { VerdictSchema } from './readings';

export const SERVICE_ITEMS = ['fuel_filter', 'in_tank_strainer', 'oil', 'spark_plug', 'other'] as const;
export const ServiceItemSchema = z.enum(SERVICE_ITEMS);

export const REMINDER_STATUSES = ['pending', 'sent', 'dismissed', 'done'] as const;
export const ReminderStatusSchema = z.enum(REMINDER_STATUSES);

export const MAIL_STATUSES = ['queued', 'sent', 'failed'] as const;
export const MailStatusSchema = z.enum(MAIL_STATUSES);
export type ServiceItem = z.infer<typeof ServiceItemSchema>;

/** A reminder still waiting on the customer: at most one per interval is open at a time. */
export const OPEN_REMINDER_STATUSES = ['pending', 'sent'] as const satisfies readonly ReminderStatus[];
export type ReminderStatus = z.infer<typeof ReminderStatusSchema>;

/** The service-interval evaluator's statuses (shared/evaluators/service-interval.ts), least urgent first. */
export const INTERVAL_STATUSES = ['ok', 'due_soon', 'due', 'overdue'] as const;
export const IntervalStatusSchema = z.enum(INTERVAL_STATUSES);
export type IntervalStatus = z.infer<typeof IntervalStatusSchema>;
/** What the due list shows unless asked otherwise. */
export const DUE_STATUSES = ['due_soon', 'due', 'overdue'] as const satisfies readonly IntervalStatus[];

/** Which limit of an interval comes first. */
export const INTERVAL_LIMIT_KINDS = ['distance', 'hours', 'months'] as const;
export const IntervalLimitKindSchema = z.enum(INTERVAL_LIMIT_KINDS);

export const REMINDERS_PATH = '/api/reminders';
export const REMINDER_PATH = `${REMINDERS_PATH}/:id`;

export const ReminderSchema = z.object({
  id: z.number().int(),
  serviceIntervalId: z.number().int(),
  machineId: z.number().int(),
  customerId: z.number().int(),
  dueOn: z.string(),
  status: ReminderStatusSchema,
  sentAt: z.string().nullable(),
  createdAt: z.string(),
});
export type Reminder = z.infer<typeof ReminderSchema>;

/** One line of the due list: an interval as judged on `asOf`, whose machine and customer, and its reminder. */
export const DueItemSchema = z.object({
  serviceIntervalId: z.number().int(),
  asOf: z.string(),
  machine: z.object({
    id: z.number().int(),
    make: z.string(),
    model: z.string(),
    meterUnit: MeterUnitSchema,
  }),
  customer: z.object({ id: z.number().int(), name: z.string(), email: z.string().nullable() }),
  item: ServiceItemSchema,
  label: z.string(),
  status: IntervalStatusSchema,
  verdict: VerdictSchema,
  reason: z.string(),
  dueBy: IntervalLimitKindSchema.nullable(),
  dueOn: z.string().nullable(),
  /** In the machine's meter unit. */
  dueAtMeter: z.number().nullable(),
  /** Negative when past due. `meter` is in the machine's meter unit. */
  remaining: z.object({ days: z.number().int().nullable(), meter: z.number().nullable() }),
  /** This interval's reminder for the current round (open, or written since it was last done). */
  reminder: z
    .object({ id: z.number().int(), status: ReminderStatusSchema, sentAt: z.string().nullable() })
    .nullable(),
});
export type DueItem = z.infer<typeof DueItemSchema>;

/** `status=due,overdue` (or repeated `status=`): which statuses to list. */
const StatusFilterSchema = z
  .union([z.string(), z.array(z.string())])
  .transform((value) => (Array.isArray(value) ? value : [value]).flatMap((part) => part.split(',')))
  .pipe(z.array(IntervalStatusSchema).min(1).max(INTERVAL_STATUSES.length));

export const DueListQuerySchema = ListQuerySchema.extend({
  /** The calendar day to judge on; the business's today when left out. */
  on: IsoDateSchema.optional(),
  status: StatusFilterSchema.optional(),
});
export type DueListQuery = z.infer<typeof DueListQuerySchema>;

export const DueListSchema = listResponseSchema(DueItemSchema);

export const CreateReminderInputSchema = z.strictObject({ serviceIntervalId: IdSchema });
export type CreateReminderInput = z.infer<typeof CreateReminderInputSchema>;

/** Closing a reminder; `done` also records the service as done today. Sending is the mailer's. */
export const UpdateReminderInputSchema = z.strictObject({ status: z.enum(['dismissed', 'done']) });
export type UpdateReminderInput = z.infer<typeof UpdateReminderInputSchema>;
