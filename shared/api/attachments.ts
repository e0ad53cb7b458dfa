import { z } from 'zod';
import { IdSchema, ListQuerySchema, listResponseSchema, optionalText } from './common';

/** Photos of gauges and wiring, parts receipts: files attached to a job, or to one of its readings. */
export const ATTACHMENTS_PATH = '/api/jobs/:id/attachments';
export const ATTACHMENT_PATH = `${ATTACHMENTS_PATH}/:attachmentId`;
export const ATTACHMENT_FILE_PATH = `${ATTACHMENT_PATH}/file`;

export const attachmentsPath = (jobId: number) => `/api/jobs/${jobId}/attachments`;
export const attachmentFilePath = (jobId: number, attachmentId: number) =>
  `${attachmentsPath(jobId)}/${attachmentId}/file`;

/** The multipart field the file travels in; `caption` and `readingId` ride beside it as text fields. */
export const ATTACHMENT_FILE_FIELD = 'file';
/** 10 MiB: a phone photo at full resolution fits; a video does not. */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;
export const ATTACHMENT_FILENAME_MAX = 120;
export const ATTACHMENT_CAPTION_MAX = 500;

/**
 * What an upload may be, decided from the file's own first bytes, never from its name or the type
 * the client declared. The HEIF family names are those registered by ISO/IEC 23008-12, Annex C.
 */
export const ATTACHMENT_CONTENT_TYPES = [
  'image/jpeg',
  'image/png',
  'image/webp',
  'image/heic',
  'image/heic-sequence',
  'image/heif',
  'image/heif-sequence',
  'application/pdf',
] as const;
export const AttachmentContentTypeSchema = z.enum(ATTACHMENT_CONTENT_TYPES);
export type AttachmentContentType = z.infer<typeof AttachmentContentTypeSchema>;

export const AttachmentSchema = z.object({
  id: z.number().int(),
  jobId: z.number().int(),
  readingId: z.number().int().nullable(),
  filename: z.string(),
  contentType: AttachmentContentTypeSchema,
  sizeBytes: z.number().int().nonnegative(),
  caption: z.string().nullable(),
  createdAt: z.string(),
  /** Where the bytes are downloaded from (same origin, same sign-in). */
  url: z.string(),
});
export type Attachment = z.infer<typeof AttachmentSchema>;

/** The text fields of the multipart upload; numbers arrive as text, so ids are coerced. */
export const CreateAttachmentFieldsSchema = z.strictObject({
  caption: optionalText(ATTACHMENT_CAPTION_MAX),
  readingId: IdSchema.optional(),
});
export type CreateAttachmentFields = z.infer<typeof CreateAttachmentFieldsSchema>;

export const AttachmentParamsSchema = z.object({ id: IdSchema, attachmentId: IdSchema });

export const AttachmentListQuerySchema = ListQuerySchema.extend({
  /** Only the files attached to this reading. */
  readingId: IdSchema.optional(),
});
export type AttachmentListQuery = z.infer<typeof AttachmentListQuerySchema>;

export const AttachmentListSchema = listResponseSchema(AttachmentSchema);
