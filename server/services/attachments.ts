import { createHash, randomUUID } from 'node:crypto';
import { mkdir, open, rename, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import { and, count, desc, eq, lt, sql } from 'drizzle-orm';
import {
  ATTACHMENT_FILENAME_MAX,
  attachmentFilePath,
  type Attachment,
  type AttachmentContentType,
  type AttachmentListQuery,
  type CreateAttachmentFields,
} from '../../shared/api/attachments';
import type { ListResponse } from '../../shared/api/common';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, HttpError, NotFoundError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { recordAudit } from './audit';
import { found, scoped } from './scope';

type Row = typeof t.attachments.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** The bytes and the name the client gave; nothing else the client declared is trusted. */
export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
}

export interface StoredFile {
  path: string;
  filename: string;
  contentType: AttachmentContentType;
  sizeBytes: number;
}

const startsWith = (bytes: Uint8Array, signature: readonly number[], offset = 0) =>
  bytes.length >= offset + signature.length && signature.every((byte, i) => bytes[offset + i] === byte);
const ascii = (bytes: Uint8Array, start: number, end: number) =>
  String.fromCharCode(...bytes.subarray(start, Math.min(end, bytes.length)));

/** PNG signature (ISO/IEC 15948 §5.2); JPEG's SOI marker and the first marker's FF (ITU-T T.81, JFIF). */
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const JPEG_SIGNATURE = [0xff, 0xd8, 0xff];

/**
 * HEIF brands of ISO/IEC 23008-12 (from memory): HEVC-coded still images, HEVC image sequences,
 * and the format's generic still (mif1) and sequence (msf1) brands.
 */
const HEIF_MAJOR_BRANDS: Record<string, AttachmentContentType> = {
  heic: 'image/heic',
  heix: 'image/heic',
  heim: 'image/heic',
  heis: 'image/heic',
  hevc: 'image/heic-sequence',
  hevx: 'image/heic-sequence',
  hevm: 'image/heic-sequence',
  hevs: 'image/heic-sequence',
  mif1: 'image/heif',
  msf1: 'image/heif-sequence',
};
/** AV1 images share HEIF's generic brands; their own brands mark them (AV1 Image File Format, §9). */
const AVIF_BRANDS = new Set(['avif', 'avis']);

/** An ISO BMFF `ftyp` box: size, "ftyp", major brand, minor version, compatible brands. */
function heifType(bytes: Uint8Array): AttachmentContentType | null {
  if (bytes.length < 16 || ascii(bytes, 4, 8) !== 'ftyp') return null;
  const boxSize = ((bytes[0]! << 24) | (bytes[1]! << 16) | (bytes[2]! << 8) | bytes[3]!) >>> 0;
  const compatible: string[] = [];
  for (let at = 16; at + 4 <= Math.min(boxSize, bytes.length, 256); at += 4) {
    compatible.push(ascii(bytes, at, at + 4));
  }
  const major = HEIF_MAJOR_BRANDS[ascii(bytes, 8, 12)];
  if (!major) return null;
  const generic = major === 'image/heif' || major === 'image/heif-sequence';
  if (generic && compatible.some((brand) => AVIF_BRANDS.has(brand))) return null;
  if (generic) {
    const coded = compatible
      .map((brand) => HEIF_MAJOR_BRANDS[brand])
      .find((type) => type?.startsWith('image/heic'));
    if (coded) return coded;
  }
  return major;
}

/**
 * What the file is, from its first bytes: JPEG, PNG, WebP (RIFF "WEBP", RFC 9649 §2.5), the HEIF
 * family, or PDF ("%PDF-" header, ISO 32000-1 §7.5.2). Anything else is null and refused.
 */
export function sniffContentType(bytes: Uint8Array): AttachmentContentType | null {
  if (startsWith(bytes, JPEG_SIGNATURE)) return 'image/jpeg';
  if (startsWith(bytes, PNG_SIGNATURE)) return 'image/png';
  if (ascii(bytes, 0, 4) === 'RIFF' && ascii(bytes, 8, 12) === 'WEBP') return 'image/webp';
  if (ascii(bytes, 0, 5) === '%PDF-') return 'application/pdf';
  return heifType(bytes);
}

const EXTENSION: Record<AttachmentContentType, string> = {
  'image/jpeg': '.jpg',
  'image/png': '.png',
  'image/webp': '.webp',
  'image/heic': '.heic',
  'image/heic-sequence': '.heics',
  'image/heif': '.heif',
  'image/heif-sequence': '.heifs',
  'application/pdf': '.pdf',
};

/**
 * The name shown and offered on download: the last path part only, no control or invisible
 * format characters, none of the characters Windows refuses, no leading dots (no hidden files, no
 * `..`), at most ATTACHMENT_FILENAME_MAX characters with the extension kept. The name never
 * reaches the disk: files are stored under their hash.
 */
export function sanitiseFilename(original: string, contentType: AttachmentContentType): string {
  const lastPart = original.split(/[/\\]/).at(-1) ?? '';
  const cleaned = lastPart
    .normalize('NFC')
    .replace(/[\p{Cc}\p{Cf}\p{Zl}\p{Zp}]/gu, '')
    .replace(/[<>:"|?*]/g, '_')
    .replace(/^[\s.]+|[\s.]+$/g, '');
  const name = cleaned === '' ? `attachment${EXTENSION[contentType]}` : cleaned;
  const chars = Array.from(name);
  if (chars.length <= ATTACHMENT_FILENAME_MAX) return name;
  const dot = name.lastIndexOf('.');
  const extension = dot > 0 ? Array.from(name.slice(dot)) : [];
  const kept = extension.length > 0 && extension.length <= 16 ? extension : [];
  return (
    chars
      .slice(0, ATTACHMENT_FILENAME_MAX - kept.length)
      .join('')
      .trimEnd() + kept.join('')
  );
}

/** `<businessId>/<sha256>`: content-addressed, so a name from the client never becomes a path. */
const STORAGE_KEY = /^(\d+)\/([0-9a-f]{64})$/;

function storagePath(uploadsDir: string, storageKey: string): string {
  const parts = STORAGE_KEY.exec(storageKey);
  if (!parts) throw new Error(`Refusing an attachment storage key outside the pattern: ${storageKey}`);
  return path.join(uploadsDir, parts[1]!, parts[2]!);
}

/** Written in full under a temporary name, flushed, then renamed: the final name never holds half a file. */
async function writeFileAtomically(finalPath: string, bytes: Buffer): Promise<void> {
  const dir = path.dirname(finalPath);
  await mkdir(dir, { recursive: true });
  const temp = path.join(dir, `.tmp-${randomUUID()}`);
  const handle = await open(temp, 'wx', 0o600);
  try {
    await handle.writeFile(bytes);
    await handle.sync();
  } catch (error) {
    await handle.close();
    await unlink(temp).catch(() => undefined);
    throw error;
  }
  await handle.close();
  try {
    await rename(temp, finalPath);
  } catch (error) {
    await unlink(temp).catch(() => undefined);
    throw error;
  }
}

/** Uploads and deletions of the same bytes take turns, so a delete never removes a file being reused. */
async function lockStorageKey(tx: Tx, storageKey: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${storageKey}, 0))`);
}

async function rowsUsing(tx: Tx, storageKey: string): Promise<number> {
  const [row] = await tx
    .select({ n: count() })
    .from(t.attachments)
    .where(eq(t.attachments.storageKey, storageKey));
  return row?.n ?? 0;
}

/**
 * Removes a stored file once no row points at it, after the row's own transaction has committed and
 * under the key's lock: an upload of the same bytes either committed first (and keeps the file) or
 * waits and writes it again. A crash in between leaves an unreferenced file, never a missing one.
 */
async function removeIfUnused(db: Db, uploadsDir: string, storageKey: string): Promise<void> {
  await db.transaction(async (tx) => {
    await lockStorageKey(tx, storageKey);
    if ((await rowsUsing(tx, storageKey)) > 0) return;
    await unlink(storagePath(uploadsDir, storageKey)).catch((error: NodeJS.ErrnoException) => {
      if (error.code !== 'ENOENT') throw error;
    });
  });
}

async function loadJob(db: Pick<Db, 'select'>, actor: Actor, jobId: number) {
  const [job] = await db
    .select({ id: t.jobs.id, businessId: t.jobs.businessId })
    .from(t.jobs)
    .where(
      scoped(actor, { businessId: t.jobs.businessId, customerId: t.jobs.customerId }, eq(t.jobs.id, jobId)),
    );
  return found(job, 'job');
}

function toAttachment(row: Row): Attachment {
  return {
    id: row.id,
    jobId: row.jobId,
    readingId: row.readingId,
    filename: row.filename,
    contentType: row.contentType as AttachmentContentType,
    sizeBytes: row.sizeBytes,
    caption: row.caption,
    createdAt: row.createdAt.toISOString(),
    url: attachmentFilePath(row.jobId, row.id),
  };
}

export async function listAttachments(
  db: Db,
  actor: Actor,
  jobId: number,
  query: AttachmentListQuery,
): Promise<ListResponse<Attachment>> {
  const job = await loadJob(db, actor, jobId);
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.attachments)
    .where(
      and(
        eq(t.attachments.businessId, actor.businessId),
        eq(t.attachments.jobId, job.id),
        query.readingId ? eq(t.attachments.readingId, query.readingId) : undefined,
        after ? lt(t.attachments.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.attachments.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toAttachment);
}

export async function createAttachment(
  db: Db,
  actor: Actor,
  jobId: number,
  fields: CreateAttachmentFields,
  file: UploadedFile,
  { uploadsDir, now }: { uploadsDir: string; now: Date },
): Promise<Attachment> {
  const job = await loadJob(db, actor, jobId);
  if (fields.readingId !== undefined) {
    const [reading] = await db
      .select({ id: t.readings.id })
      .from(t.readings)
      .where(
        and(
          eq(t.readings.businessId, actor.businessId),
          eq(t.readings.jobId, job.id),
          eq(t.readings.id, fields.readingId),
        ),
      );
    if (!reading) {
      throw new BadRequestError('Invalid body: readingId: not a reading on this job', [
        { path: 'readingId', message: 'not a reading on this job' },
      ]);
    }
  }
  const contentType = sniffContentType(file.buffer);
  if (!contentType) {
    throw new HttpError(
      415,
      'unsupported_media_type',
      'Only JPEG, PNG, WebP, HEIC/HEIF images and PDF documents can be attached.',
    );
  }
  const sha256 = createHash('sha256').update(file.buffer).digest('hex');
  const storageKey = `${actor.businessId}/${sha256}`;
  const filePath = storagePath(uploadsDir, storageKey);
  try {
    return await db.transaction(async (tx) => {
      await lockStorageKey(tx, storageKey);
      await writeFileAtomically(filePath, file.buffer);
      const [row] = await tx
        .insert(t.attachments)
        .values({
          businessId: actor.businessId,
          jobId: job.id,
          readingId: fields.readingId ?? null,
          filename: sanitiseFilename(file.originalname, contentType),
          contentType,
          sizeBytes: file.buffer.length,
          sha256,
          storageKey,
          caption: fields.caption || null,
          uploadedBy: actor.userId,
          createdAt: now,
        })
        .returning();
      return toAttachment(row!);
    });
  } catch (error) {
    // The row did not land: take the file back out unless another attachment holds the same bytes.
    // A failing clean-up leaves an unreferenced file, never a missing one; the first error is the one told.
    await removeIfUnused(db, uploadsDir, storageKey).catch(() => undefined);
    throw error;
  }
}

async function loadAttachment(db: Pick<Db, 'select'>, actor: Actor, jobId: number, attachmentId: number) {
  const job = await loadJob(db, actor, jobId);
  const [row] = await db
    .select()
    .from(t.attachments)
    .where(
      and(
        eq(t.attachments.businessId, actor.businessId),
        eq(t.attachments.jobId, job.id),
        eq(t.attachments.id, attachmentId),
      ),
    );
  return found(row, 'attachment');
}

export async function getAttachmentFile(
  db: Db,
  actor: Actor,
  jobId: number,
  attachmentId: number,
  uploadsDir: string,
): Promise<StoredFile> {
  const row = await loadAttachment(db, actor, jobId, attachmentId);
  const filePath = storagePath(uploadsDir, row.storageKey);
  const present = await stat(filePath).then(
    (info) => info.isFile(),
    () => false,
  );
  if (!present) throw new NotFoundError('The attachment file is missing from storage');
  return {
    path: filePath,
    filename: row.filename,
    contentType: row.contentType as AttachmentContentType,
    sizeBytes: row.sizeBytes,
  };
}

/** Deletes the row (audited) and the file once no other attachment holds the same bytes. */
export async function deleteAttachment(
  db: Db,
  actor: Actor,
  jobId: number,
  attachmentId: number,
  { uploadsDir, now }: { uploadsDir: string; now: Date },
): Promise<void> {
  const row = await loadAttachment(db, actor, jobId, attachmentId);
  await db.transaction(async (tx) => {
    await lockStorageKey(tx, row.storageKey);
    const [deleted] = await tx
      .delete(t.attachments)
      .where(and(eq(t.attachments.businessId, actor.businessId), eq(t.attachments.id, row.id)))
      .returning({ id: t.attachments.id });
    found(deleted, 'attachment');
    await recordAudit(tx, {
      businessId: actor.businessId,
      actorId: actor.userId,
      action: 'attachment.deleted',
      entityType: 'attachment',
      entityId: row.id,
      details: { jobId: row.jobId, filename: row.filename, sha256: row.sha256, sizeBytes: row.sizeBytes },
      at: now,
    });
  });
  await removeIfUnused(db, uploadsDir, row.storageKey);
}
