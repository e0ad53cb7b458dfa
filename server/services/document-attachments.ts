/**
 * What a job-document mail attaches, rendered again for each attempt (the outbox keeps names and
 * sizes, never bytes): the diagnostic report for a `report` mail, the estimate for an `estimate`
 * mail. For the outbox's retry pass (server/services/mail.ts renderAttachments), which must send
 * a retried mail with the same PDF the first attempt carried.
 */
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import type * as t from '../db/schema';
import type { OutgoingAttachment } from '../mail/mailer';
import { estimatePdf } from './estimate-documents';
import { reportPdf } from './report-documents';

export async function jobDocumentAttachments(
  db: Db,
  actor: Actor,
  row: Pick<typeof t.outbox.$inferSelect, 'kind' | 'jobId' | 'estimateId'>,
  now: Date,
): Promise<OutgoingAttachment[] | null> {
  let pdf: { filename: string; bytes: Buffer } | null = null;
  if (row.kind === 'report' && row.jobId !== null) pdf = await reportPdf(db, actor, row.jobId, { now });
  if (row.kind === 'estimate' && row.estimateId !== null)
    pdf = await estimatePdf(db, actor, row.estimateId, { now });
  return pdf ? [{ filename: pdf.filename, contentType: 'application/pdf', content: pdf.bytes }] : null;
}
