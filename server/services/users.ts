import { and, desc, eq, lt, sql } from 'drizzle-orm';
import type { ListQuery, ListResponse } from '../../shared/api/common';
import type { CreateUserInput, UpdateUserInput, User } from '../../shared/api/users';
import type { Actor } from '../auth/actor';
import { hashPassword } from '../auth/password';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, iso } from './scope';

type Row = typeof t.users.$inferSelect;

/** Never the password hash or the token version: they do not leave the server. */
function toUser(row: Row): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    customerId: row.customerId,
    disabled: row.disabledAt !== null,
    lastSignInAt: iso(row.lastSignInAt),
    createdAt: row.createdAt.toISOString(),
  };
}

export async function listUsers(db: Db, actor: Actor, query: ListQuery): Promise<ListResponse<User>> {
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.users)
    .where(and(eq(t.users.businessId, actor.businessId), after ? lt(t.users.id, after) : undefined))
    .orderBy(desc(t.users.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toUser);
}

/** The owner adds a helper, a bookkeeper, another owner, or a customer's own sign-in. */
export async function createUser(db: Db, actor: Actor, input: CreateUserInput, now: Date): Promise<User> {
  if (input.customerId != null) {
    const [customer] = await db
      .select({ id: t.customers.id })
      .from(t.customers)
      .where(and(eq(t.customers.id, input.customerId), eq(t.customers.businessId, actor.businessId)));
    if (!customer) throw new BadRequestError('No such customer for this sign-in');
  }
  const [taken] = await db
    .select({ id: t.users.id })
    .from(t.users)
    .where(sql`lower(${t.users.email}) = ${input.email.toLowerCase()}`);
  if (taken) throw new ConflictError('A sign-in with this e-mail already exists');
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(t.users)
      .values({
        businessId: actor.businessId,
        email: input.email,
        name: input.name,
        role: input.role,
        customerId: input.customerId ?? null,
        passwordHash: await hashPassword(input.password),
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'user.created',
      entityType: 'user',
      entityId: row!.id,
      details: { role: input.role },
      at: now,
    });
    return toUser(row!);
  });
}

/**
 * Renames, changes a role, or disables. A role change or a disable ends the person's sessions;
 * the owner cannot take away their own owner role or lock themselves out.
 */
export async function updateUser(db: Db, actor: Actor, id: number, input: UpdateUserInput, now: Date) {
  if (id === actor.userId && ((input.role && input.role !== 'owner') || input.disabled)) {
    throw new BadRequestError('You cannot remove your own owner role or disable yourself');
  }
  return db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(t.users)
      .where(and(eq(t.users.id, id), eq(t.users.businessId, actor.businessId)));
    const user = found(current, 'user');
    if (input.role && user.role === 'customer') {
      throw new BadRequestError("A customer's sign-in stays a customer's; add a staff sign-in instead");
    }
    const roleChanged = input.role !== undefined && input.role !== user.role;
    const disabling = input.disabled === true && user.disabledAt === null;
    const [row] = await tx
      .update(t.users)
      .set({
        ...(input.name !== undefined ? { name: input.name } : {}),
        ...(input.role !== undefined ? { role: input.role } : {}),
        ...(input.disabled !== undefined
          ? { disabledAt: input.disabled ? (user.disabledAt ?? now) : null }
          : {}),
        tokenVersion: roleChanged || disabling ? user.tokenVersion + 1 : user.tokenVersion,
        updatedAt: now,
      })
      .where(eq(t.users.id, id))
      .returning();
    if (roleChanged || input.disabled !== undefined) {
      await recordAudit(tx, {
        businessId: actor.businessId,
        actorId: actor.userId,
        action: roleChanged ? 'user.role_changed' : input.disabled ? 'user.disabled' : 'user.enabled',
        entityType: 'user',
        entityId: id,
        details: roleChanged ? { from: user.role, to: input.role } : {},
        at: now,
      });
    }
    return toUser(row!);
  });
}
