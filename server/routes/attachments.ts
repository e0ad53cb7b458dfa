import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import {
  ATTACHMENT_CAPTION_MAX,
  ATTACHMENT_FILE_FIELD,
  ATTACHMENT_FILE_PATH,
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_PATH,
  ATTACHMENTS_PATH,
  AttachmentListQuerySchema,
  AttachmentParamsSchema,
  CreateAttachmentFieldsSchema,
} from '../../shared/api/attachments';
import { IdParamsSchema } from '../../shared/api/common';
import { allow } from '../auth/middleware';
import { BadRequestError, HttpError } from '../errors';
import { parse } from '../http/validate';
import {
  createAttachment,
  deleteAttachment,
  getAttachmentFile,
  listAttachments,
} from '../services/attachments';
import type { RouteDeps } from './deps';

/**
 * One file and a couple of short text fields, held in memory up to the cap: a refused upload
 * never touches the disk. Names without an explicit charset are read as UTF-8, as browsers send them
 * (WHATWG HTML, multipart/form-data encoding).
 */
const receiveOne = multer({
  storage: multer.memoryStorage(),
  limits: {
    fileSize: ATTACHMENT_MAX_BYTES,
    files: 1,
    fields: 4,
    parts: 5,
    fieldNameSize: 100,
    fieldSize: ATTACHMENT_CAPTION_MAX * 4,
    headerPairs: 20,
  },
  defParamCharset: 'utf8',
  // The raw name reaches sanitiseFilename, the one place that decides what is kept of it.
  preservePath: true,
}).single(ATTACHMENT_FILE_FIELD);

/** Multer's and the multipart parser's errors, in the API's error format (4xx), never a 500. */
function uploadError(error: unknown): HttpError {
  if (error instanceof multer.MulterError) {
    if (error.code === 'LIMIT_FILE_SIZE') {
      return new HttpError(
        413,
        'file_too_large',
        `The file is larger than ${ATTACHMENT_MAX_BYTES / 1024 / 1024} MB.`,
      );
    }
    if (error.code === 'LIMIT_UNEXPECTED_FILE') {
      return new BadRequestError(`Send one file, in the multipart field "${ATTACHMENT_FILE_FIELD}".`);
    }
    return new BadRequestError(`The upload was refused: ${error.message.toLowerCase()}.`);
  }
  // Busboy's own errors: a malformed or truncated multipart body.
  return new BadRequestError('The upload could not be read as multipart/form-data.');
}

const receiveFile: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) {
    return next(new HttpError(415, 'unsupported_media_type', 'Send the file as multipart/form-data.'));
  }
  receiveOne(req, res, (error?: unknown) => next(error === undefined ? undefined : uploadError(error)));
};

/** Only printable ASCII, minus the quote, backslash and percent, survives in the plain `filename`. */
const asciiFallback = (filename: string) => filename.replace(/[^\x20-\x7e]|["\\%]/g, '_');

/** RFC 8187 §3.2.1 (which RFC 5987 became): UTF-8, percent-encoded outside attr-char. */
const extValue = (filename: string) =>
  `UTF-8''${encodeURIComponent(filename).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`)}`;

/**
 * `attachment` with a quoted ASCII `filename` every client reads, and `filename*` for the real name
 * when it is not plain ASCII (RFC 6266 §4.3 and Appendix D).
 */
export function contentDisposition(filename: string): string {
  const fallback = asciiFallback(filename);
  const plain = `attachment; filename="${fallback}"`;
  return fallback === filename ? plain : `${plain}; filename*=${extValue(filename)}`;
}

export function attachmentsRouter({ db, now, uploadsDir }: RouteDeps) {
  const router = Router();

  router.get(ATTACHMENTS_PATH, allow('attachments', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(AttachmentListQuerySchema, req.query, 'query');
    res.json(await listAttachments(db, req.actor!, id, query));
  });
  router.post(ATTACHMENTS_PATH, allow('attachments', 'create'), receiveFile, async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    // Multer's body has no prototype; the schema reads a plain copy.
    const fields = parse(CreateAttachmentFieldsSchema, { ...req.body });
    if (!req.file)
      throw new BadRequestError(`Attach the file in the multipart field "${ATTACHMENT_FILE_FIELD}".`);
    const file = { buffer: req.file.buffer, originalname: req.file.originalname };
    res
      .status(201)
      .json(await createAttachment(db, req.actor!, id, fields, file, { uploadsDir, now: now() }));
  });
  router.get(ATTACHMENT_FILE_PATH, allow('attachments', 'read'), async (req, res) => {
    const { id, attachmentId } = parse(AttachmentParamsSchema, req.params, 'path');
    const file = await getAttachmentFile(db, req.actor!, id, attachmentId, uploadsDir);
    res.set({
      'Content-Type': file.contentType,
      'Content-Disposition': contentDisposition(file.filename),
      'X-Content-Type-Options': 'nosniff',
      // A customer's photos are theirs: no shared cache keeps them; nothing in them runs as this site.
      'Cache-Control': 'private, no-store',
      'Content-Security-Policy': "default-src 'none'; sandbox",
    });
    await new Promise<void>((resolve, reject) => {
      res.sendFile(file.path, { cacheControl: false, dotfiles: 'allow' }, (error) =>
        error && !res.headersSent ? reject(error) : resolve(),
      );
    });
  });
  router.delete(ATTACHMENT_PATH, allow('attachments', 'delete'), async (req, res) => {
    const { id, attachmentId } = parse(AttachmentParamsSchema, req.params, 'path');
    await deleteAttachment(db, req.actor!, id, attachmentId, { uploadsDir, now: now() });
    res.status(204).end();
  });
  return router;
}
