import { and, asc, eq } from 'drizzle-orm';
import * as t from '../../../server/db/schema';
import type { TestApi } from '../../helpers/api';
import { DEFAULT_LINES, type TestLine } from './money';
import { statuses, type AccessRow, type Fixtures } from './types';

/**
 * A job being diagnosed with line items ready to quote, written straight to the tables (the jobs
 * and line-item routes belong to other parts of the API).
 */
export async function quotableJob(
  api: TestApi,
  options: { customerEmail?: string; lines?: TestLine[]; status?: 'diagnosing' | 'awaiting_approval' } = {},
): Promise<number> {
  const db = api.database.db;
  const [customer] = await db
    .select({ id: t.customers.id, businessId: t.customers.businessId })
    .from(t.customers)
    .where(eq(t.customers.email, options.customerEmail ?? 'jules@example.test'));
  const [machine] = await db
    .select({ id: t.machines.id })
    .from(t.machines)
    .where(and(eq(t.machines.customerId, customer!.id)))
    .orderBy(asc(t.machines.id))
    .limit(1);
  const [job] = await db
    .insert(t.jobs)
    .values({
      businessId: customer!.businessId,
      customerId: customer!.id,
      machineId: machine!.id,
      status: options.status ?? 'diagnosing',
      complaint: 'Test job: stumbles on acceleration.',
    })
    .returning({ id: t.jobs.id });
  const lines = options.lines ?? DEFAULT_LINES;
  if (lines.length > 0) {
    await db.insert(t.lineItems).values(
      lines.map((line, position) => ({
        businessId: customer!.businessId,
        jobId: job!.id,
        position,
        ...line,
      })),
    );
  }
  return job!.id;
}

/** An estimate waiting for an answer on a fresh job awaiting approval, written straight to the table. */
export async function sentEstimate(api: TestApi, customerEmail = 'jules@example.test'): Promise<number> {
  const jobId = await quotableJob(api, { customerEmail, status: 'awaiting_approval' });
  const [job] = await api.database.db.select().from(t.jobs).where(eq(t.jobs.id, jobId));
  const [estimate] = await api.database.db
    .insert(t.estimates)
    .values({
      businessId: job!.businessId,
      jobId,
      status: 'sent',
      totalCents: 1000,
      lines: [{ kind: 'labour', description: 'Matrix labour', quantityMilli: 1000, unitPriceCents: 1000 }],
      sentAt: api.clock.now,
    })
    .returning({ id: t.estimates.id });
  return estimate!.id;
}

/** The first seeded estimate on a customer's jobs. */
async function seededEstimateOf(f: Fixtures, customerId: number): Promise<number> {
  const [row] = await f.api.database.db
    .select({ id: t.estimates.id })
    .from(t.estimates)
    .innerJoin(t.jobs, eq(t.jobs.id, t.estimates.jobId))
    .where(eq(t.jobs.customerId, customerId))
    .orderBy(asc(t.estimates.id))
    .limit(1);
  return (
    row?.id ??
    sentEstimate(f.api, customerId === f.ownCustomerId ? 'jules@example.test' : 'rowan@example.test')
  );
}

/** The first seeded invoice of a customer. */
async function firstInvoiceOf(f: Fixtures, customerId: number): Promise<number> {
  const [row] = await f.api.database.db
    .select({ id: t.invoices.id })
    .from(t.invoices)
    .where(eq(t.invoices.customerId, customerId))
    .orderBy(asc(t.invoices.id))
    .limit(1);
  return row!.id;
}

/** Reading the PDF is reading the invoice: the `invoices` read row of the policy table. */
export const documentRows: AccessRow[] = [
  {
    name: 'GET /api/invoices/:own/pdf',
    method: 'get',
    path: async (f) => `/api/invoices/${await firstInvoiceOf(f, f.ownCustomerId)}/pdf`,
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: "GET /api/invoices/:other/pdf (another customer's)",
    method: 'get',
    path: async (f) => `/api/invoices/${await firstInvoiceOf(f, f.otherCustomerId)}/pdf`,
    expect: statuses(200, 403, 200, 404),
  },
  // The report is the job's checks in plain words: the `checks` read row (owner, helper, customer);
  // another customer's job is a 404 for a customer. Mailing it is the owner's (`invoices` update).
  {
    name: 'GET /api/jobs/:own/report.pdf',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/report.pdf`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/report.pdf (another customer's)",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}/report.pdf`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    name: 'POST /api/jobs/:own/report/send',
    method: 'post',
    path: (f) => `/api/jobs/${f.ownJobId}/report/send`,
    expect: statuses(202, 403, 403, 403),
  },
  // Estimates: quoting is the owner's (`lineItems` create); reading is the money rows (`invoices`
  // list/read: owner, bookkeeper, the job's customer); answering is for the owner (on the
  // customer's word, with a note) and the customer, each caller on a fresh estimate.
  {
    name: 'POST /api/jobs/:id/estimate',
    method: 'post',
    path: async (f) => `/api/jobs/${await quotableJob(f.api)}/estimate`,
    body: () => ({}),
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'GET /api/jobs/:own/estimates',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/estimates`,
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: "GET /api/jobs/:other/estimates (another customer's)",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}/estimates`,
    expect: statuses(200, 403, 200, 404),
  },
  {
    name: 'GET /api/estimates/:own/pdf',
    method: 'get',
    path: async (f) => `/api/estimates/${await seededEstimateOf(f, f.ownCustomerId)}/pdf`,
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: "GET /api/estimates/:other/pdf (another customer's)",
    method: 'get',
    path: async (f) => `/api/estimates/${await seededEstimateOf(f, f.otherCustomerId)}/pdf`,
    expect: statuses(200, 403, 200, 404),
  },
  {
    name: 'POST /api/estimates/:own/approve',
    method: 'post',
    path: async (f) => `/api/estimates/${await sentEstimate(f.api)}/approve`,
    body: () => ({ note: 'Matrix: by phone' }),
    expect: statuses(200, 403, 403, 200),
  },
  {
    name: "POST /api/estimates/:other/approve (another customer's)",
    method: 'post',
    path: async (f) => `/api/estimates/${await sentEstimate(f.api, 'rowan@example.test')}/approve`,
    body: () => ({ note: 'Matrix: by phone' }),
    expect: statuses(200, 403, 403, 404),
  },
  {
    name: 'POST /api/estimates/:own/decline',
    method: 'post',
    path: async (f) => `/api/estimates/${await sentEstimate(f.api)}/decline`,
    body: () => ({ note: 'Matrix: in person' }),
    expect: statuses(200, 403, 403, 200),
  },
];
