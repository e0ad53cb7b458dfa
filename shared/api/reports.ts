import { z } from 'zod';
import { IsoDateSchema } from './common';
import { ServiceItemSchema } from './reminders';
import { MeterUnitSchema } from './machines';

export const WEEK_REPORT_PATH = '/api/reports/week';

/** How many of the machines coming due a week report lists; machinesDueTotal counts them all. */
export const MACHINES_DUE_LISTED = 20;

export const WeekReportQuerySchema = z.object({
  /** The first of the seven days, on the business's calendar; any weekday may start a week. */
  start: IsoDateSchema,
});
export type WeekReportQuery = z.infer<typeof WeekReportQuerySchema>;

const cents = () => z.number().int();

/** Open balances as they stood at the end of the week's last day. */
const BalancesSchema = z.object({
  count: z.number().int(),
  balanceCents: cents(),
});

export const MachineDueSchema = z.object({
  machineId: z.number().int(),
  machine: z.string().describe('Make and model'),
  customerId: z.number().int(),
  customerName: z.string(),
  serviceIntervalId: z.number().int(),
  item: ServiceItemSchema,
  label: z.string(),
  status: z.enum(['due_soon', 'due', 'overdue']),
  dueBy: z.enum(['distance', 'hours', 'months']).nullable(),
  /** The months limit's date; null when only a meter limit applies. */
  dueOn: z.string().nullable(),
  dueAtMeter: z.number().nullable(),
  meterUnit: MeterUnitSchema,
  reason: z.string(),
});
export type MachineDue = z.infer<typeof MachineDueSchema>;

/**
 * The week review (PRODUCT.md, "Week review"), for the dashboard's home and `vanbay week --json`.
 * The week is the seven calendar days from `start` in the business's time zone: instants (jobs
 * completed, payments received, checks finished) count from 00:00 on `start` to 00:00 the day
 * after `end`; calendar days (invoices' issuedOn, trips' tripDate) from `start` to `end`.
 */
export const WeekReportSchema = z.object({
  start: z.string().describe('First day, YYYY-MM-DD'),
  end: z.string().describe('Last day, YYYY-MM-DD (start + 6)'),
  timezone: z.string().describe('The business time zone the days are read in'),
  jobsDone: z
    .number()
    .int()
    .describe(
      'Jobs whose completedAt falls in the week, cancelled jobs excluded, whatever they became since',
    ),
  hoursBilled: z
    .number()
    .describe('Sum of the labour lines’ quantities, in hours, on invoices issued in the week, void excluded'),
  revenueCents: cents().describe(
    'Sum of totalCents (tax included) of invoices issued in the week, void excluded',
  ),
  collectedCents: cents().describe('Sum of payments received in the week, refunds (negative) netted'),
  revenueByDay: z
    .array(z.object({ date: z.string(), cents: cents() }))
    .describe('Seven entries, start to end: revenueCents split by issuedOn'),
  unpaid: BalancesSchema.describe(
    'Invoices issued by the end day and not voided by the week’s end whose total less payments received by then is above 0',
  ),
  overdue: BalancesSchema.describe('The unpaid ones whose dueOn is before the end day'),
  miles: z
    .number()
    .describe('Miles of the finished trips dated in the week (km odometers converted), to 0.001 mi'),
  deductionCents: cents()
    .nullable()
    .describe(
      'The IRS standard-rate deduction for those miles: miles × the rate in force, rounded half up once per rate period; null when a trip falls on a day with no known rate',
    ),
  checks: z
    .object({ pass: z.number().int(), warn: z.number().int(), fail: z.number().int() })
    .describe('Guided checks finished in the week (finishedAt in the week), counted by verdict'),
  machinesDue: z
    .array(MachineDueSchema)
    .max(MACHINES_DUE_LISTED)
    .describe(
      'The most urgent service intervals due soon, due or overdue on the end day (the shared service-interval evaluator, with the machine’s meter reading as last recorded before the week’s end), at most 20: by status (overdue, due, due soon), then the months limit’s date (none last), then machine id and interval id',
    ),
  machinesDueTotal: z
    .number()
    .int()
    .describe(
      'How many service intervals are due soon, due or overdue on the end day in all, listed or not; the reminders list has every one',
    ),
});
export type WeekReport = z.infer<typeof WeekReportSchema>;
