import { asc, eq } from 'drizzle-orm';
import * as t from '../../../server/db/schema';
import { statuses, type AccessRow, type Fixtures } from './types';

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
];
