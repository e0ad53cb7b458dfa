import { z } from 'zod';
import { ListQuerySchema, listResponseSchema } from './common';
import { MailStatusSchema } from './reminders';

export const OUTBOX_PATH = '/api/outbox';

/** What was attached to a mail: its name and type, never the bytes. */
export const MailAttachmentSchema = z.object({
  filename: z.string(),
  contentType: z.string().nullable(),
  sizeBytes: z.number().int().nullable(),
});

/** One mail the business sent or is sending (CONTRACT.md: `to`, `subject`, `sentAt`, `attachments[].filename`). */
export const OutboxItemSchema = z.object({
  id: z.number().int(),
  kind: z.string().describe('What the mail is for: invoice, reminder, …'),
  to: z.string(),
  subject: z.string(),
  status: MailStatusSchema,
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  attachments: z.array(MailAttachmentSchema),
  invoiceId: z.number().int().nullable(),
  jobId: z.number().int().nullable(),
  sentAt: z.string().nullable(),
  createdAt: z.string(),
});
export type OutboxItem = z.infer<typeof OutboxItemSchema>;
export type MailStatus = z.infer<typeof MailStatusSchema>;

export const OutboxListQuerySchema = ListQuerySchema.extend({
  status: MailStatusSchema.optional(),
  kind: z.string().trim().min(1).max(40).optional(),
});
export type OutboxListQuery = z.infer<typeof OutboxListQuerySchema>;
export const OutboxListSchema = listResponseSchema(OutboxItemSchema);
