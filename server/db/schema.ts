/**
 * The whole job as tables. Rules every table keeps:
 * - every row a business owns carries `business_id`, so one schema serves one van or a hosted
 *   service of many businesses, and every query can scope by it (PRODUCT.md, "the path past one
 *   machine");
 * - money is integer cents; measured values are stored in the canonical unit of their quantity,
 *   with the unit the mechanic typed kept beside them;
 * - every timestamp is `timestamp with time zone`; calendar days (trip dates, due dates) are `date`;
 * - rows written from the field carry an optional `client_id`, unique per business, so an offline
 *   queue replayed twice still lands once.
 * Column names are snake_case in SQL (drizzle `casing: 'snake_case'`).
 */
import { sql } from 'drizzle-orm';
import {
  bigint,
  boolean,
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { ROLES } from '../../shared/api/users';
import { MACHINE_KINDS, METER_UNITS, SPEC_SOURCES } from '../../shared/api/machines';
import { ESTIMATE_STATUSES, JOB_STATUSES, LINE_ITEM_KINDS } from '../../shared/api/jobs';
import { CHECK_RUN_STATUSES, QUANTITIES, VERDICTS } from '../../shared/api/readings';
import { INVOICE_STATUSES, PAYMENT_METHODS, TAX_ROUNDING } from '../../shared/api/invoices';
import { MAIL_STATUSES, REMINDER_STATUSES, SERVICE_ITEMS } from '../../shared/api/reminders';
import { ESTIMATE_DECIDED_VIA } from '../../shared/api/estimates';

export const roleEnum = pgEnum('role', ROLES);
export const machineKindEnum = pgEnum('machine_kind', MACHINE_KINDS);
export const meterUnitEnum = pgEnum('meter_unit', METER_UNITS);
export const specSourceEnum = pgEnum('spec_source', SPEC_SOURCES);
export const jobStatusEnum = pgEnum('job_status', JOB_STATUSES);
export const lineItemKindEnum = pgEnum('line_item_kind', LINE_ITEM_KINDS);
export const estimateStatusEnum = pgEnum('estimate_status', ESTIMATE_STATUSES);
export const estimateDecidedViaEnum = pgEnum('estimate_decided_via', ESTIMATE_DECIDED_VIA);
export const quantityEnum = pgEnum('quantity', QUANTITIES);
export const verdictEnum = pgEnum('verdict', VERDICTS);
export const checkRunStatusEnum = pgEnum('check_run_status', CHECK_RUN_STATUSES);
export const invoiceStatusEnum = pgEnum('invoice_status', INVOICE_STATUSES);
export const paymentMethodEnum = pgEnum('payment_method', PAYMENT_METHODS);
export const taxRoundingEnum = pgEnum('tax_rounding', TAX_ROUNDING);
export const serviceItemEnum = pgEnum('service_item', SERVICE_ITEMS);
export const reminderStatusEnum = pgEnum('reminder_status', REMINDER_STATUSES);
export const mailStatusEnum = pgEnum('mail_status', MAIL_STATUSES);

const tstz = () => timestamp({ withTimezone: true, mode: 'date' });
const id = () => integer().primaryKey().generatedAlwaysAsIdentity();
const createdAt = () => tstz().notNull().defaultNow();
const updatedAt = () => tstz().notNull().defaultNow();
const businessRef = () =>
  integer()
    .notNull()
    .references(() => businesses.id, { onDelete: 'cascade' });

/** One mechanic's business and its money settings (rates, markup, tax, terms). */
export const businesses = pgTable(
  'businesses',
  {
    id: id(),
    slug: text().notNull(),
    name: text().notNull(),
    ownerName: text().notNull(),
    email: text().notNull(),
    phone: text(),
    addressLines: text()
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    timezone: text().notNull().default('America/Denver'),
    currency: text().notNull().default('USD'),
    labourRateCents: integer().notNull(),
    /** Parts markup in basis points: 2500 = 25 %. */
    partsMarkupBps: integer().notNull().default(0),
    tripFeeBaseCents: integer().notNull().default(0),
    /** Per mile beyond `tripFeeFreeMiles`, in cents. */
    tripFeePerMileCents: integer().notNull().default(0),
    tripFeeFreeMiles: integer().notNull().default(0),
    shopSuppliesBps: integer().notNull().default(0),
    /** Sales tax in parts per million of the price: 62500 = 6.25 %, 88750 = 8.875 %. */
    taxRatePpm: integer().notNull().default(0),
    taxRounding: taxRoundingEnum().notNull().default('per_invoice'),
    invoiceTermsDays: integer().notNull().default(14),
    invoiceFooter: text(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex('businesses_slug_key').on(t.slug)],
);

export const customers = pgTable(
  'customers',
  {
    id: id(),
    businessId: businessRef(),
    name: text().notNull(),
    email: text(),
    phone: text(),
    addressLines: text()
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    town: text(),
    notes: text(),
    archivedAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('customers_business_name_idx').on(t.businessId, t.name)],
);

/** Sign-ins. A customer sign-in is tied to one customer record and sees only that customer's rows. */
export const users = pgTable(
  'users',
  {
    id: id(),
    businessId: businessRef(),
    email: text().notNull(),
    name: text().notNull(),
    role: roleEnum().notNull(),
    passwordHash: text().notNull(),
    customerId: integer().references(() => customers.id, { onDelete: 'cascade' }),
    /** Bumped on sign-out-everywhere and password change; tokens carry it and die with it. */
    tokenVersion: integer().notNull().default(0),
    disabledAt: tstz(),
    lastSignInAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('users_email_key').on(sql`lower(${t.email})`),
    check('users_customer_role_check', sql`(${t.role} = 'customer') = (${t.customerId} is not null)`),
  ],
);

/**
 * Sessions signed out before they expire. A token whose id is listed here is refused; rows past
 * their expiry can be dropped, since the token would be refused for its age anyway.
 */
export const revokedSessions = pgTable(
  'revoked_sessions',
  {
    jti: uuid().primaryKey(),
    businessId: businessRef(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: tstz().notNull(),
    revokedAt: tstz().notNull().defaultNow(),
  },
  (t) => [index('revoked_sessions_expires_idx').on(t.expiresAt)],
);

/**
 * A machine and the specs read from its service manual. A null spec means "use Vanbay's generic
 * default", which every screen labels "generic — confirm in the service manual".
 */
export const machines = pgTable(
  'machines',
  {
    id: id(),
    businessId: businessRef(),
    customerId: integer()
      .notNull()
      .references(() => customers.id, { onDelete: 'cascade' }),
    kind: machineKindEnum().notNull(),
    year: integer(),
    make: text().notNull(),
    model: text().notNull(),
    /** A 17-character VIN where the machine has one (checked against 49 CFR 565.15). */
    vin: text(),
    /** HIN, frame or engine serial: free text for machines without a VIN. */
    otherId: text(),
    meterUnit: meterUnitEnum().notNull(),
    meterReading: doublePrecision(),
    meterReadAt: tstz(),
    fuelPressureMinKpa: doublePrecision(),
    fuelPressureMaxKpa: doublePrecision(),
    holdMaxDropKpa: doublePrecision(),
    holdMinutes: doublePrecision(),
    flowMinLph: doublePrecision(),
    specsNote: text(),
    notes: text(),
    archivedAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('machines_customer_idx').on(t.businessId, t.customerId),
    index('machines_vin_idx').on(t.businessId, t.vin),
  ],
);

export const jobs = pgTable(
  'jobs',
  {
    id: id(),
    businessId: businessRef(),
    customerId: integer()
      .notNull()
      .references(() => customers.id),
    machineId: integer()
      .notNull()
      .references(() => machines.id),
    status: jobStatusEnum().notNull().default('booked'),
    complaint: text().notNull(),
    /** Where the work happens: the customer's address, a trailhead, a roadside. */
    location: text(),
    scheduledAt: tstz(),
    arrivedAt: tstz(),
    completedAt: tstz(),
    cancelledAt: tstz(),
    /** The machine's odometer or hour meter at this visit, in the machine's `meterUnit`. */
    meterReading: doublePrecision(),
    diagnosis: text(),
    workDone: text(),
    clientId: uuid(),
    createdBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('jobs_business_status_idx').on(t.businessId, t.status),
    index('jobs_business_scheduled_idx').on(t.businessId, t.scheduledAt),
    index('jobs_business_completed_idx').on(t.businessId, t.completedAt),
    index('jobs_machine_history_idx').on(t.machineId, t.scheduledAt),
    index('jobs_customer_idx').on(t.customerId),
    uniqueIndex('jobs_client_id_key').on(t.businessId, t.clientId),
  ],
);

/** Status moves and free notes on a job: its timeline. */
export const jobEvents = pgTable(
  'job_events',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    fromStatus: jobStatusEnum(),
    toStatus: jobStatusEnum(),
    note: text(),
    actorId: integer().references(() => users.id, { onDelete: 'set null' }),
    clientId: uuid(),
    at: tstz().notNull().defaultNow(),
  },
  (t) => [
    index('job_events_job_idx').on(t.jobId, t.at),
    uniqueIndex('job_events_client_id_key').on(t.businessId, t.clientId),
  ],
);

/** A guided check walked on a job; the server re-evaluates its steps, never trusting the client. */
export const checkRuns = pgTable(
  'check_runs',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    procedureKey: text().notNull(),
    procedureVersion: integer().notNull(),
    status: checkRunStatusEnum().notNull().default('in_progress'),
    verdict: verdictEnum(),
    /** Ranked probable causes, next action and suggested line items, as the engine produced them. */
    findings: jsonb(),
    /**
     * The machine's limits when the run started (kPa, minutes, L/h; null = generic), so a later
     * edit of the machine's specs never changes how a stored run re-walks.
     */
    spec: jsonb(),
    startedAt: tstz().notNull().defaultNow(),
    finishedAt: tstz(),
    clientId: uuid(),
    createdBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('check_runs_job_idx').on(t.jobId),
    index('check_runs_business_started_idx').on(t.businessId, t.startedAt),
    // The week report counts the checks finished in a week.
    index('check_runs_business_finished_idx').on(t.businessId, t.finishedAt),
    uniqueIndex('check_runs_client_id_key').on(t.businessId, t.clientId),
  ],
);

export const checkSteps = pgTable(
  'check_steps',
  {
    id: id(),
    businessId: businessRef(),
    checkRunId: integer()
      .notNull()
      .references(() => checkRuns.id, { onDelete: 'cascade' }),
    seq: integer().notNull(),
    stepKey: text().notNull(),
    /** The answer as given: a reading, a series of points, or an observation. */
    answer: jsonb().notNull(),
    verdict: verdictEnum(),
    reason: text(),
    figures: jsonb(),
    cautionAcknowledgedAt: tstz(),
    answeredAt: tstz().notNull().defaultNow(),
  },
  (t) => [uniqueIndex('check_steps_run_seq_key').on(t.checkRunId, t.seq)],
);

/** Every measurement: the canonical value and unit, and what the mechanic typed. */
export const readings = pgTable(
  'readings',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    checkRunId: integer().references(() => checkRuns.id, { onDelete: 'set null' }),
    stepKey: text(),
    quantity: quantityEnum().notNull(),
    value: doublePrecision().notNull(),
    unit: text().notNull(),
    enteredValue: doublePrecision().notNull(),
    enteredUnit: text().notNull(),
    note: text(),
    takenAt: tstz().notNull().defaultNow(),
    clientId: uuid(),
    createdBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('readings_job_idx').on(t.jobId, t.takenAt),
    index('readings_run_idx').on(t.checkRunId),
    uniqueIndex('readings_client_id_key').on(t.businessId, t.clientId),
  ],
);

/**
 * The job's work and parts. Quantities are in thousandths (1.5 h = 1500) so labour hours and
 * part counts stay exact integers; the invoice snapshots these rows when it is issued.
 */
export const lineItems = pgTable(
  'line_items',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    kind: lineItemKindEnum().notNull(),
    description: text().notNull(),
    partNumber: text(),
    quantityMilli: integer().notNull(),
    unitPriceCents: integer().notNull(),
    markupBps: integer().notNull().default(0),
    taxable: boolean().notNull().default(true),
    position: integer().notNull().default(0),
    /** Set when the line came from a check's suggestion rather than by hand. */
    checkRunId: integer().references(() => checkRuns.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('line_items_job_idx').on(t.jobId, t.position)],
);

/**
 * A job's lines as quoted to the customer, and the customer's answer: when, by whom, and whether
 * the customer gave it signed in or the owner recorded it on their word.
 */
export const estimates = pgTable(
  'estimates',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    status: estimateStatusEnum().notNull().default('draft'),
    /** Totals by shared/money.ts at the rate and rounding below; null on estimates from before. */
    subtotalCents: integer(),
    taxCents: integer(),
    totalCents: integer().notNull(),
    taxRatePpm: integer(),
    taxRounding: taxRoundingEnum(),
    /** The lines as quoted, so a later edit of the job does not rewrite what was approved. */
    lines: jsonb().notNull(),
    /** The owner's message to the customer, printed on the estimate. */
    note: text(),
    sentAt: tstz(),
    decidedAt: tstz(),
    decidedBy: integer().references(() => users.id, { onDelete: 'set null' }),
    decidedVia: estimateDecidedViaEnum(),
    /** How the customer gave their word, when the owner recorded it. */
    decisionNote: text(),
    createdBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('estimates_job_idx').on(t.jobId),
    // Approved or declined exactly when a decision time is recorded.
    check(
      'estimates_decision_check',
      sql`(${t.status} in ('approved', 'declined')) = (${t.decidedAt} is not null)`,
    ),
  ],
);

/** Hands out invoice numbers with no gaps: taken under a row lock in the invoice's transaction. */
export const invoiceCounters = pgTable('invoice_counters', {
  businessId: integer()
    .primaryKey()
    .references(() => businesses.id, { onDelete: 'cascade' }),
  lastNumber: integer().notNull().default(0),
});

export const invoices = pgTable(
  'invoices',
  {
    id: id(),
    businessId: businessRef(),
    number: integer().notNull(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id),
    customerId: integer()
      .notNull()
      .references(() => customers.id),
    status: invoiceStatusEnum().notNull().default('issued'),
    issuedOn: date({ mode: 'string' }).notNull(),
    dueOn: date({ mode: 'string' }).notNull(),
    subtotalCents: integer().notNull(),
    taxCents: integer().notNull(),
    totalCents: integer().notNull(),
    paidCents: integer().notNull().default(0),
    balanceCents: integer().notNull(),
    taxRatePpm: integer().notNull(),
    taxRounding: taxRoundingEnum().notNull(),
    terms: text(),
    paymentLinkUrl: text(),
    paymentSessionId: text(),
    sentAt: tstz(),
    voidedAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('invoices_business_number_key').on(t.businessId, t.number),
    index('invoices_business_issued_idx').on(t.businessId, t.issuedOn),
    index('invoices_business_status_due_idx').on(t.businessId, t.status, t.dueOn),
    // Only the open few, not years of paid invoices: the week report's unpaid as it stood.
    index('invoices_business_open_idx')
      .on(t.businessId, t.issuedOn)
      .where(sql`${t.balanceCents} > 0`),
    index('invoices_customer_idx').on(t.customerId),
    index('invoices_job_idx').on(t.jobId),
    // A job is billed on one invoice at a time: voiding it frees the job to be billed again.
    uniqueIndex('invoices_job_live_key')
      .on(t.jobId)
      .where(sql`${t.status} <> 'void'`),
    check('invoices_balance_check', sql`${t.balanceCents} = ${t.totalCents} - ${t.paidCents}`),
  ],
);

export const invoiceLines = pgTable(
  'invoice_lines',
  {
    id: id(),
    businessId: businessRef(),
    invoiceId: integer()
      .notNull()
      .references(() => invoices.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    kind: lineItemKindEnum().notNull(),
    description: text().notNull(),
    quantityMilli: integer().notNull(),
    unitPriceCents: integer().notNull(),
    lineTotalCents: integer().notNull(),
    taxCents: integer().notNull(),
  },
  (t) => [uniqueIndex('invoice_lines_invoice_position_key').on(t.invoiceId, t.position)],
);

/** Money in (and refunds out, as negative amounts). `providerEventId` makes webhooks land once. */
export const payments = pgTable(
  'payments',
  {
    id: id(),
    businessId: businessRef(),
    invoiceId: integer()
      .notNull()
      .references(() => invoices.id, { onDelete: 'cascade' }),
    method: paymentMethodEnum().notNull(),
    amountCents: integer().notNull(),
    receivedAt: tstz().notNull(),
    reference: text(),
    providerEventId: text(),
    recordedBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('payments_invoice_idx').on(t.invoiceId),
    index('payments_business_received_idx').on(t.businessId, t.receivedAt),
    uniqueIndex('payments_provider_event_key').on(t.providerEventId),
  ],
);

/** Every webhook event seen, by the provider's id, so a redelivery changes nothing. */
export const webhookEvents = pgTable('webhook_events', {
  eventId: text().primaryKey(),
  businessId: businessRef(),
  type: text().notNull(),
  receivedAt: tstz().notNull().defaultNow(),
});

/**
 * The van's mileage log, kept as IRS Publication 463's sample log asks: date, destination,
 * business purpose, odometer at start and end. An open trip has no end odometer yet.
 */
export const trips = pgTable(
  'trips',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer().references(() => jobs.id, { onDelete: 'set null' }),
    tripDate: date({ mode: 'string' }).notNull(),
    startOdometer: doublePrecision().notNull(),
    endOdometer: doublePrecision(),
    /** The van's odometer unit; deductions are figured in miles. */
    odometerUnit: meterUnitEnum().notNull().default('mi'),
    origin: text(),
    destination: text().notNull(),
    purpose: text().notNull(),
    startedAt: tstz(),
    endedAt: tstz(),
    clientId: uuid(),
    createdBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('trips_business_date_idx').on(t.businessId, t.tripDate),
    index('trips_job_idx').on(t.jobId),
    uniqueIndex('trips_client_id_key').on(t.businessId, t.clientId),
    check(
      'trips_odometer_order_check',
      sql`${t.endOdometer} is null or ${t.endOdometer} >= ${t.startOdometer}`,
    ),
  ],
);

/** Photos and receipts. Bytes live under the data dir; the row keeps where and what. */
export const attachments = pgTable(
  'attachments',
  {
    id: id(),
    businessId: businessRef(),
    jobId: integer()
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    readingId: integer().references(() => readings.id, { onDelete: 'set null' }),
    filename: text().notNull(),
    contentType: text().notNull(),
    sizeBytes: bigint({ mode: 'number' }).notNull(),
    sha256: text().notNull(),
    storageKey: text().notNull(),
    caption: text(),
    uploadedBy: integer().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('attachments_job_idx').on(t.jobId)],
);

/** A service item due by distance, hours or months, whichever comes first. */
export const serviceIntervals = pgTable(
  'service_intervals',
  {
    id: id(),
    businessId: businessRef(),
    machineId: integer()
      .notNull()
      .references(() => machines.id, { onDelete: 'cascade' }),
    item: serviceItemEnum().notNull(),
    label: text().notNull(),
    everyKm: doublePrecision(),
    everyHours: doublePrecision(),
    everyMonths: integer(),
    lastDoneOn: date({ mode: 'string' }),
    /** The machine's meter when last done, in the machine's `meterUnit`. */
    lastDoneMeter: doublePrecision(),
    source: specSourceEnum().notNull().default('generic'),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    /**
     * The months limit's date: lastDoneOn plus everyMonths calendar months, the month's last day
     * where it has no such day (as the evaluator's date-fns addMonths); null without both. Kept by
     * the database on every write, so the week report ranks and counts without working it out for
     * every interval on every request.
     */
    monthsDueOn: date({ mode: 'string' }).generatedAlwaysAs(
      sql`(last_done_on + every_months * interval '1 month')::date`,
    ),
    /*
     * judgedBy, dueSoonOn and meterDueSince: where the interval stands with its machine's meter as
     * last read, so the week report counts the intervals due on a day from indexes instead of
     * judging every one on every request. Kept by the database (trigger service_intervals_standing,
     * migration 0006, with the evaluator's rules: on every write of the interval, and of its
     * machine's meter, unit or archiving); neither the app nor a restore writes them
     * (KEPT_BY_DATABASE).
     */
    /**
     * Who can judge the interval: 'database' (due_soon_on and meter_due_since below say when it is
     * due), 'evaluator' (a stored value the evaluator refuses, or a meter within a millionth of a
     * limit, where float arithmetic in SQL could land on the other side), or null (never done, or
     * its machine archived: not judged at all).
     */
    judgedBy: text(),
    /** From this day on its months limit makes it due soon or worse (null: no months limit, or not judged by the database). */
    dueSoonOn: date({ mode: 'string' }),
    /**
     * Its machine's meter, as last read, makes it due soon or worse: when that reading was taken
     * ('-infinity' when the machine's meter has no time), so a week that ended before it does not
     * know it. Null: the meter does not make it due, or not judged by the database. A string, as
     * '-infinity' is no JavaScript date.
     */
    meterDueSince: timestamp({ withTimezone: true, mode: 'string' }),
  },
  (t) => [
    index('service_intervals_machine_idx').on(t.machineId),
    // The week report's most urgent: the longest overdue by date first, in its listing order.
    index('service_intervals_business_months_due_idx').on(t.businessId, t.monthsDueOn, t.machineId, t.id),
    // The week report's count of those due by date, and of those due by the meter alone (index-only).
    index('service_intervals_business_due_soon_idx').on(t.businessId, t.dueSoonOn),
    index('service_intervals_business_meter_due_idx').on(t.businessId, t.meterDueSince, t.dueSoonOn),
    index('service_intervals_business_evaluator_idx')
      .on(t.businessId)
      .where(sql`${t.judgedBy} = 'evaluator'`),
    check('service_intervals_judged_by_check', sql`${t.judgedBy} in ('database', 'evaluator')`),
    check(
      'service_intervals_some_limit_check',
      sql`${t.everyKm} is not null or ${t.everyHours} is not null or ${t.everyMonths} is not null`,
    ),
  ],
);

/**
 * Columns the database keeps itself by trigger (not `generated always as`, which cannot read
 * another table): a backup may carry them, a restore never writes them.
 */
export const KEPT_BY_DATABASE: Readonly<Record<string, readonly string[]>> = {
  service_intervals: ['judged_by', 'due_soon_on', 'meter_due_since'],
};

export const reminders = pgTable(
  'reminders',
  {
    id: id(),
    businessId: businessRef(),
    serviceIntervalId: integer()
      .notNull()
      .references(() => serviceIntervals.id, { onDelete: 'cascade' }),
    machineId: integer()
      .notNull()
      .references(() => machines.id, { onDelete: 'cascade' }),
    customerId: integer()
      .notNull()
      .references(() => customers.id, { onDelete: 'cascade' }),
    dueOn: date({ mode: 'string' }).notNull(),
    status: reminderStatusEnum().notNull().default('pending'),
    sentAt: tstz(),
    mailId: integer().references(() => outbox.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('reminders_business_due_idx').on(t.businessId, t.status, t.dueOn),
    index('reminders_machine_idx').on(t.machineId),
  ],
);

/** Every mail the business sends, kept so a retry never sends twice and the owner can see it. */
export const outbox = pgTable(
  'outbox',
  {
    id: id(),
    businessId: businessRef(),
    kind: text().notNull(),
    to: text().notNull(),
    subject: text().notNull(),
    bodyText: text().notNull(),
    /** `[{ filename, contentType, sizeBytes }]`: what was attached, not the bytes. */
    attachments: jsonb()
      .notNull()
      .default(sql`'[]'::jsonb`),
    status: mailStatusEnum().notNull().default('queued'),
    attempts: integer().notNull().default(0),
    /**
     * When the latest attempt claimed the row. Still `queued` long after it, the attempt was cut
     * off (the server stopped mid-send) and the retry pass takes the row up again.
     */
    attemptedAt: tstz(),
    lastError: text(),
    idempotencyKey: text().notNull(),
    invoiceId: integer().references(() => invoices.id, { onDelete: 'set null' }),
    jobId: integer().references(() => jobs.id, { onDelete: 'set null' }),
    /** The estimate a mail of kind `estimate` carries, so a retry renders it again. */
    estimateId: integer().references(() => estimates.id, { onDelete: 'set null' }),
    sentAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('outbox_idempotency_key').on(t.businessId, t.idempotencyKey),
    index('outbox_business_created_idx').on(t.businessId, t.createdAt),
  ],
);

/** Who did what that matters later: sign-ins, role changes, money changes, deletions. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: id(),
    businessId: businessRef(),
    actorId: integer().references(() => users.id, { onDelete: 'set null' }),
    action: text().notNull(),
    entityType: text().notNull(),
    entityId: text(),
    details: jsonb(),
    at: tstz().notNull().defaultNow(),
  },
  (t) => [index('audit_events_business_at_idx').on(t.businessId, t.at)],
);
