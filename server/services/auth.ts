import { and, eq, sql } from 'drizzle-orm';
import type { SessionUser, SignInInput } from '../../shared/api/auth';
import type { Actor } from '../auth/actor';
import { hashPassword, verifyPassword } from '../auth/password';
import { FailureCounter, SIGN_IN_LIMITS } from '../auth/rate-limit';
import { signSession, verifySession, type SessionClaims } from '../auth/tokens';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { HttpError, UnauthorizedError } from '../errors';
import { recordAudit } from './audit';

export interface AuthContext {
  db: Db;
  secret: Uint8Array;
  now: () => Date;
  limits: { account: FailureCounter; address: FailureCounter };
}

export function createSignInLimits() {
  return {
    account: new FailureCounter(SIGN_IN_LIMITS.account),
    address: new FailureCounter(SIGN_IN_LIMITS.address),
  };
}

export class RateLimitedError extends HttpError {
  constructor(readonly retryAfterSeconds: number) {
    super(
      429,
      'rate_limited',
      `Too many failed sign-ins: try again in ${Math.ceil(retryAfterSeconds / 60)} min.`,
      {
        retryAfterSeconds,
      },
    );
  }
}

type UserRow = typeof t.users.$inferSelect;

export function sessionUser(
  user: Pick<UserRow, 'id' | 'email' | 'role' | 'name' | 'customerId'>,
): SessionUser {
  return { id: user.id, email: user.email, role: user.role, name: user.name, customerId: user.customerId };
}

/**
 * Checks the password and issues a session token. Every failure looks the same from outside
 * (no telling a wrong address from a wrong password) and counts against the account and the address.
 */
export async function signIn(ctx: AuthContext, input: SignInInput, address: string) {
  const now = ctx.now();
  const accountKey = input.email.toLowerCase();
  const wait = Math.max(
    ctx.limits.account.retryAfterSeconds(accountKey, now.getTime()),
    ctx.limits.address.retryAfterSeconds(address, now.getTime()),
  );
  if (wait > 0) throw new RateLimitedError(wait);
  const [user] = await ctx.db
    .select()
    .from(t.users)
    .where(sql`lower(${t.users.email}) = ${accountKey}`);
  // Verify against a throwaway hash when there is no such user, so timing tells nothing either.
  const ok = await verifyPassword(input.password, user?.passwordHash ?? (await decoyHash()));
  if (!user || !ok || user.disabledAt) {
    ctx.limits.account.fail(accountKey, now.getTime());
    ctx.limits.address.fail(address, now.getTime());
    if (user) {
      await recordAudit(ctx.db, {
        businessId: user.businessId,
        actorId: user.id,
        action: 'auth.sign_in_failed',
        entityType: 'user',
        entityId: user.id,
        details: { address },
        at: now,
      });
    }
    throw new UnauthorizedError('Wrong e-mail or password.', 'bad_credentials');
  }
  ctx.limits.account.clear(accountKey);
  const session = await signSession(ctx.secret, user, now);
  await ctx.db.update(t.users).set({ lastSignInAt: now }).where(eq(t.users.id, user.id));
  await recordAudit(ctx.db, {
    businessId: user.businessId,
    actorId: user.id,
    action: 'auth.sign_in',
    entityType: 'user',
    entityId: user.id,
    details: { address },
    at: now,
  });
  return { token: session.token, user: sessionUser(user), claims: session.claims };
}

let decoy: Promise<string> | undefined;
const decoyHash = () => (decoy ??= hashPassword('not a password anyone has'));

/** The actor a token stands for, or null when it is invalid, expired, revoked or outdated. */
export async function actorFromToken(ctx: Omit<AuthContext, 'limits'>, token: string): Promise<Actor | null> {
  const claims = await verifySession(ctx.secret, token, ctx.now());
  if (!claims) return null;
  const [row] = await ctx.db
    .select({ user: t.users, revoked: t.revokedSessions.jti })
    .from(t.users)
    .leftJoin(t.revokedSessions, eq(t.revokedSessions.jti, claims.jti))
    .where(and(eq(t.users.id, claims.userId), eq(t.users.businessId, claims.businessId)));
  if (!row || row.revoked || row.user.disabledAt || row.user.tokenVersion !== claims.tokenVersion)
    return null;
  return toActor(row.user, claims);
}

function toActor(user: UserRow, claims: SessionClaims): Actor {
  return {
    userId: user.id,
    businessId: user.businessId,
    role: user.role,
    customerId: user.customerId,
    email: user.email,
    name: user.name,
    jti: claims.jti,
    expiresAt: claims.expiresAt,
  };
}

/** Ends this session: its token id is listed as revoked until it would have expired anyway. */
export async function signOut(db: Db, actor: Actor, now: Date) {
  await db
    .insert(t.revokedSessions)
    .values({
      jti: actor.jti,
      businessId: actor.businessId,
      userId: actor.userId,
      expiresAt: actor.expiresAt,
    })
    .onConflictDoNothing();
  await recordAudit(db, {
    businessId: actor.businessId,
    actorId: actor.userId,
    action: 'auth.sign_out',
    entityType: 'user',
    entityId: actor.userId,
    at: now,
  });
}

/**
 * Changes the signed-in person's own password. Bumping the token version ends every other
 * session of theirs; the caller gets a fresh token for this one.
 */
export async function changePassword(
  ctx: Omit<AuthContext, 'limits'>,
  actor: Actor,
  input: { currentPassword: string; newPassword: string },
) {
  const [user] = await ctx.db.select().from(t.users).where(eq(t.users.id, actor.userId));
  if (!user || !(await verifyPassword(input.currentPassword, user.passwordHash))) {
    throw new HttpError(400, 'bad_password', 'The current password is not right.');
  }
  const now = ctx.now();
  const [updated] = await ctx.db
    .update(t.users)
    .set({
      passwordHash: await hashPassword(input.newPassword),
      tokenVersion: user.tokenVersion + 1,
      updatedAt: now,
    })
    .where(eq(t.users.id, user.id))
    .returning();
  await recordAudit(ctx.db, {
    businessId: user.businessId,
    actorId: user.id,
    action: 'auth.password_changed',
    entityType: 'user',
    entityId: user.id,
    at: now,
  });
  const session = await signSession(ctx.secret, updated!, now);
  return { token: session.token, user: sessionUser(updated!), claims: session.claims };
}
