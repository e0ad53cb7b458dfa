import type { Db } from '../db/client';
import * as t from '../db/schema';

/** Anything that can run an insert: the database or a transaction inside it. */
type Writer = Pick<Db, 'insert'>;

export interface AuditEntry {
  businessId: number;
  actorId: number | null;
  /** What happened, as `resource.verb`: `auth.sign_in`, `user.role_changed`, `payment.recorded`. */
  action: string;
  entityType: string;
  entityId?: string | number | null;
  details?: Record<string, unknown>;
  at: Date;
}

/** Records sign-ins, role changes, money changes and deletions; never a password or a token. */
export async function recordAudit(db: Writer, entry: AuditEntry): Promise<void> {
  await db.insert(t.auditEvents).values({
    businessId: entry.businessId,
    actorId: entry.actorId,
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId === undefined || entry.entityId === null ? null : String(entry.entityId),
    details: entry.details ?? null,
    at: entry.at,
  });
}
