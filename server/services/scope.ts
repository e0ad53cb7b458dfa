/**
 * Row scoping every service applies: a business sees only its own rows, and a customer sign-in
 * only rows of its own customer record. Out-of-scope rows are "not found", never "forbidden", so
 * a customer cannot even learn that another customer's record exists.
 */
import { and, eq, type SQL } from 'drizzle-orm';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import type { Actor } from '../auth/actor';
import { NotFoundError } from '../errors';

export function scoped(
  actor: Actor,
  columns: { businessId: AnyPgColumn; customerId?: AnyPgColumn },
  ...more: (SQL | undefined)[]
): SQL {
  const conditions: (SQL | undefined)[] = [eq(columns.businessId, actor.businessId), ...more];
  if (actor.role === 'customer') {
    if (!columns.customerId) throw new Error('a customer-visible query must name its customer column');
    conditions.push(eq(columns.customerId, actor.customerId ?? -1));
  }
  return and(...conditions)!;
}

export function found<T>(row: T | undefined, what: string): T {
  if (row === undefined) throw new NotFoundError(`No such ${what}`);
  return row;
}

export const iso = (date: Date | null) => (date ? date.toISOString() : null);
