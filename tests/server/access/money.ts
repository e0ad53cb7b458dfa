import { and, asc, eq } from 'drizzle-orm';
import request from 'supertest';
import * as t from '../../../server/db/schema';
import type { LineItemKind } from '../../../shared/api/jobs';
import { as, type TestApi } from '../../helpers/api';
import { statuses, type AccessRow, type Fixtures } from './types';

export interface TestLine {
  kind: LineItemKind;
  description: string;
  quantityMilli: number;
  unitPriceCents: number;
  markupBps?: number;
  taxable: boolean;
}

/** 1.5 h of labour at $95.00 and a $189.00 part with 25 % markup (the seeded business's rates). */
export const DEFAULT_LINES: TestLine[] = [
  {
    kind: 'labour',
    description: 'Fuel delivery check',
    quantityMilli: 1500,
    unitPriceCents: 9500,
    taxable: false,
  },
  {
    kind: 'part',
    description: 'Fuel pump assembly',
    quantityMilli: 1000,
    unitPriceCents: 18_900,
    markupBps: 2500,
    taxable: true,
  },
];

/**
 * A complete job with line items, written straight to the tables: the jobs and line-item routes
 * belong to other parts of the API, and these tests need a job ready to bill.
 */
export async function completeJob(
  api: TestApi,
  options: { customerEmail?: string; lines?: TestLine[]; status?: 'complete' | 'repairing' } = {},
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
  const done = (options.status ?? 'complete') === 'complete';
  const [job] = await db
    .insert(t.jobs)
    .values({
      businessId: customer!.businessId,
      customerId: customer!.id,
      machineId: machine!.id,
      status: options.status ?? 'complete',
      complaint: 'Test job: cuts out under load.',
      completedAt: done ? api.clock.now : null,
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

/** Issues an invoice for a fresh complete job, as the owner. */
export async function freshInvoice(
  api: TestApi,
  options: Parameters<typeof completeJob>[1] = {},
): Promise<{ id: number; number: number; totalCents: number; jobId: number }> {
  const jobId = await completeJob(api, options);
  const response = await request(api.app)
    .post('/api/invoices')
    .set(as(api, 'owner'))
    .send({ jobId })
    .expect(201);
  return response.body;
}

async function ownInvoiceId(f: Fixtures): Promise<number> {
  const [row] = await f.api.database.db
    .select({ id: t.invoices.id })
    .from(t.invoices)
    .where(eq(t.invoices.customerId, f.ownCustomerId))
    .orderBy(asc(t.invoices.id))
    .limit(1);
  return row!.id;
}

async function otherInvoiceId(f: Fixtures): Promise<number> {
  const [row] = await f.api.database.db
    .select({ id: t.invoices.id })
    .from(t.invoices)
    .where(eq(t.invoices.customerId, f.otherCustomerId))
    .orderBy(asc(t.invoices.id))
    .limit(1);
  return row!.id;
}

async function freshTrip(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post('/api/trips')
    .set(as(f.api, 'owner'))
    .send({ startOdometer: 50_000, destination: 'Matrix row, Cinder Valley', purpose: 'Matrix row trip' })
    .expect(201);
  return response.body.id as number;
}

/** The job a POST /api/invoices row bills: made in `path`, read back in `body` (path runs first). */
let jobToBill = 0;

export const moneyRows: AccessRow[] = [
  {
    name: 'GET /api/invoices',
    method: 'get',
    path: () => '/api/invoices',
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: 'GET /api/invoices/:own',
    method: 'get',
    path: async (f) => `/api/invoices/${await ownInvoiceId(f)}`,
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: "GET /api/invoices/:other customer's",
    method: 'get',
    path: async (f) => `/api/invoices/${await otherInvoiceId(f)}`,
    expect: statuses(200, 403, 200, 404),
  },
  {
    name: 'POST /api/invoices',
    method: 'post',
    path: async (f) => {
      jobToBill = await completeJob(f.api);
      return '/api/invoices';
    },
    body: () => ({ jobId: jobToBill }),
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'PATCH /api/invoices/:id (void)',
    method: 'patch',
    path: async (f) => `/api/invoices/${(await freshInvoice(f.api)).id}`,
    body: () => ({ status: 'void' }),
    expect: statuses(200, 403, 403, 403),
  },
  {
    name: 'GET /api/invoices/:own/payments',
    method: 'get',
    path: async (f) => `/api/invoices/${await ownInvoiceId(f)}/payments`,
    expect: statuses(200, 403, 200, 200),
  },
  {
    name: "GET /api/invoices/:other/payments (another customer's)",
    method: 'get',
    path: async (f) => `/api/invoices/${await otherInvoiceId(f)}/payments`,
    expect: statuses(200, 403, 200, 404),
  },
  {
    name: 'POST /api/invoices/:id/payments',
    method: 'post',
    path: async (f) => `/api/invoices/${(await freshInvoice(f.api)).id}/payments`,
    body: () => ({ method: 'cash', amountCents: 1000 }),
    expect: statuses(201, 403, 403, 403),
  },
  {
    // The matrix app has no payment service: the owner gets 503 (tests/server/card-payments.test.ts runs one).
    name: 'POST /api/invoices/:id/payment-link',
    method: 'post',
    path: async (f) => `/api/invoices/${(await freshInvoice(f.api)).id}/payment-link`,
    body: () => ({}),
    expect: statuses(503, 403, 403, 403),
  },
  {
    // No sign-in either way: the payment service's signature is the check, and here none is set up.
    name: 'POST /api/payments/webhook',
    method: 'post',
    path: () => '/api/payments/webhook',
    body: () => ({ id: 'evt_matrix', object: 'event', type: 'checkout.session.completed' }),
    expect: { anonymous: 503, owner: 503, helper: 503, bookkeeper: 503, customer: 503 },
  },
  {
    name: 'GET /api/trips',
    method: 'get',
    path: () => '/api/trips',
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'GET /api/trips/summary',
    method: 'get',
    path: () => '/api/trips/summary?year=2026',
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'GET /api/trips/export.csv',
    method: 'get',
    path: () => '/api/trips/export.csv?from=2026-11-01&to=2026-11-30',
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'GET /api/trips/:id',
    method: 'get',
    path: async (f) => `/api/trips/${await freshTrip(f)}`,
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'POST /api/trips',
    method: 'post',
    path: () => '/api/trips',
    body: () => ({ startOdometer: 60_000, destination: 'Quarry Bend trailhead lot', purpose: 'Call-out' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'PATCH /api/trips/:id (end it)',
    method: 'patch',
    path: async (f) => `/api/trips/${await freshTrip(f)}`,
    body: () => ({ endOdometer: 50_012.5 }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'DELETE /api/trips/:id',
    method: 'delete',
    path: async (f) => `/api/trips/${await freshTrip(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/reports/week',
    method: 'get',
    path: () => '/api/reports/week?start=2026-11-09',
    expect: statuses(200, 403, 200, 403),
  },
  {
    name: 'GET /api/outbox',
    method: 'get',
    path: () => '/api/outbox',
    expect: statuses(200, 403, 403, 403),
  },
];
