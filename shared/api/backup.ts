/**
 * The backup document: one business's whole data as logical rows, so a backup made on PGlite
 * restores onto PostgreSQL and back. Rows travel as PostgreSQL stores them: keyed by SQL column
 * name, ids kept, timestamps ISO 8601 with their offset (to the microsecond), dates YYYY-MM-DD,
 * jsonb as JSON. It holds the users' password hashes, so that people can sign in again after a
 * restore: the file is as sensitive as the database itself and should be kept like it.
 */
import { z } from 'zod';
import { IsoDateTimeSchema } from './common';

export const BACKUP_PATH = '/api/backup';
export const BACKUP_RESTORE_PATH = '/api/backup/restore';

export const BACKUP_FORMAT = 'vanbay-backup';
export const BACKUP_VERSION = 1;

/**
 * A restore is posted as this media type rather than application/json: the API's shared JSON
 * parser (100 kB) passes it by, and the restore route reads it with its own, larger limit.
 */
export const BACKUP_CONTENT_TYPE = 'application/vnd.vanbay.backup+json';

/** The largest backup a restore accepts, in bytes (attachments inline as base64 take most of it). */
export const BACKUP_MAX_BYTES = 200 * 1024 * 1024;

/** `<businessId>/<sha256 of the bytes>`: the attachments' storage key, under which a file travels. */
export const BACKUP_FILE_KEY = /^(\d+)\/([0-9a-f]{64})$/;

/** The name a download is offered under; `day` is the business's own calendar day. */
export const backupFilename = (slug: string, day: string) => `vanbay-backup-${slug}-${day}.json`;

const RowSchema = z.record(z.string(), z.unknown());

export const BackupDocumentSchema = z.strictObject({
  format: z.literal(BACKUP_FORMAT, { error: 'this is not a Vanbay backup' }),
  version: z.literal(BACKUP_VERSION, {
    error: `only version ${BACKUP_VERSION} of the backup format can be read here`,
  }),
  createdAt: IsoDateTimeSchema,
  /** The tag of the last migration in drizzle/ when the backup was made. */
  schemaMigration: z.string().min(1).max(200),
  /** The business's own row; `slug` names which business the backup is of. */
  business: z.looseObject({ id: z.number().int().positive(), slug: z.string().min(1).max(200) }),
  /** Every business-owned table, in foreign-key order, each with its rows. */
  tables: z.record(
    z
      .string()
      .max(63)
      .regex(/^[a-z][a-z0-9_]*$/),
    z.array(RowSchema),
  ),
  /** Attachment bytes, base64, by storage key; each is checked against the hash in its key. */
  files: z.record(z.string().regex(BACKUP_FILE_KEY), z.string()).default({}),
});
export type BackupDocument = z.infer<typeof BackupDocumentSchema>;

export const RestoreQuerySchema = z.strictObject({
  /** Restore a backup of another business (another slug) onto this one. */
  force: z.enum(['true', 'false']).optional(),
});

export const RestoreResultSchema = z.object({
  /** The business restored onto (its slug is kept even when the backup's differs). */
  business: z.string(),
  backupCreatedAt: z.string(),
  schemaMigration: z.string(),
  /** Rows restored, per table. */
  tables: z.record(z.string(), z.number().int().nonnegative()),
  /** Attachment files restored. */
  files: z.number().int().nonnegative(),
});
export type RestoreResult = z.infer<typeof RestoreResultSchema>;

/** Rows per table of a backup document. */
export function backupCounts(document: Pick<BackupDocument, 'tables'>): Record<string, number> {
  return Object.fromEntries(Object.entries(document.tables).map(([name, rows]) => [name, rows.length]));
}
