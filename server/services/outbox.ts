import { desc, eq, lt } from 'drizzle-orm';
import { z } from 'zod';
import type { ListResponse } from '../../shared/api/common';
import type { OutboxItem, OutboxListQuery } from '../../shared/api/outbox';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { decodeCursor, toPage } from '../http/pagination';
import { iso, scoped } from './scope';

type Row = typeof t.outbox.$inferSelect;

/** The attachments column as the mailer writes it: `[{ filename, contentType, sizeBytes }]`. */
const StoredAttachmentsSchema = z.array(
  z.object({
    filename: z.string(),
    contentType: z.string().nullish(),
    sizeBytes: z.number().int().nullish(),
  }),
);

export function toOutboxItem(row: Row): OutboxItem {
  return {
    id: row.id,
    kind: row.kind,
    to: row.to,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    lastError: row.lastError,
    attachments: StoredAttachmentsSchema.parse(row.attachments).map((a) => ({
      filename: a.filename,
      contentType: a.contentType ?? null,
      sizeBytes: a.sizeBytes ?? null,
    })),
    invoiceId: row.invoiceId,
    jobId: row.jobId,
    sentAt: iso(row.sentAt),
    createdAt: row.createdAt.toISOString(),
  };
}

/** Mail the business has sent or queued, newest first; read-only (sending is the mailer's). */
export async function listOutbox(
  db: Db,
  actor: Actor,
  query: OutboxListQuery,
): Promise<ListResponse<OutboxItem>> {
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.outbox)
    .where(
      scoped(
        actor,
        { businessId: t.outbox.businessId },
        after ? lt(t.outbox.id, after) : undefined,
        query.status ? eq(t.outbox.status, query.status) : undefined,
        query.kind ? eq(t.outbox.kind, query.kind) : undefined,
      ),
    )
    .orderBy(desc(t.outbox.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toOutboxItem);
}
