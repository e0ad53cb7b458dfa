import { desc, eq, ilike, isNull, lt, or } from 'drizzle-orm';
import type {
  CreateCustomerInput,
  Customer,
  CustomerListQuery,
  UpdateCustomerInput,
} from '../../shared/api/customers';
import type { ListResponse } from '../../shared/api/common';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, iso, scoped } from './scope';

type Row = typeof t.customers.$inferSelect;
const columns = { businessId: t.customers.businessId, customerId: t.customers.id };

export function toCustomer(row: Row, actor: Actor): Customer {
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    phone: row.phone,
    addressLines: row.addressLines,
    town: row.town,
    notes: actor.role === 'customer' ? null : row.notes,
    archivedAt: iso(row.archivedAt),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

export async function listCustomers(
  db: Db,
  actor: Actor,
  query: CustomerListQuery,
): Promise<ListResponse<Customer>> {
  const after = decodeCursor(query.cursor);
  const pattern = query.q ? `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null;
  const rows = await db
    .select()
    .from(t.customers)
    .where(
      scoped(
        actor,
        columns,
        query.archived === 'true' ? undefined : isNull(t.customers.archivedAt),
        after ? lt(t.customers.id, after) : undefined,
        pattern
          ? or(
              ilike(t.customers.name, pattern),
              ilike(t.customers.email, pattern),
              ilike(t.customers.phone, pattern),
            )
          : undefined,
      ),
    )
    .orderBy(desc(t.customers.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, (row) => toCustomer(row, actor));
}

export async function getCustomer(db: Db, actor: Actor, id: number): Promise<Customer> {
  const [row] = await db
    .select()
    .from(t.customers)
    .where(scoped(actor, columns, eq(t.customers.id, id)));
  return toCustomer(found(row, 'customer'), actor);
}

export async function createCustomer(db: Db, actor: Actor, input: CreateCustomerInput, now: Date) {
  const [row] = await db
    .insert(t.customers)
    .values({
      ...input,
      addressLines: input.addressLines ?? [],
      businessId: actor.businessId,
      createdAt: now,
      updatedAt: now,
    })
    .returning();
  return toCustomer(row!, actor);
}

export async function updateCustomer(
  db: Db,
  actor: Actor,
  id: number,
  input: UpdateCustomerInput,
  now: Date,
) {
  const [row] = await db
    .update(t.customers)
    .set({ ...input, updatedAt: now })
    .where(scoped(actor, columns, eq(t.customers.id, id)))
    .returning();
  return toCustomer(found(row, 'customer'), actor);
}

/** Archived, not deleted: the customer's jobs, invoices and history must outlive them. */
export async function archiveCustomer(db: Db, actor: Actor, id: number, now: Date) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(t.customers)
      .set({ archivedAt: now, updatedAt: now })
      .where(scoped(actor, columns, eq(t.customers.id, id), isNull(t.customers.archivedAt)))
      .returning();
    found(row, 'customer');
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'customer.archived',
      entityType: 'customer',
      entityId: id,
      at: now,
    });
  });
}
