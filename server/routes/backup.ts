import express, { Router, type RequestHandler, type Response } from 'express';
import {
  BACKUP_CONTENT_TYPE,
  BACKUP_MAX_BYTES,
  BACKUP_PATH,
  BACKUP_RESTORE_PATH,
  BackupDocumentSchema,
  RestoreQuerySchema,
} from '../../shared/api/backup';
import { allow } from '../auth/middleware';
import { HttpError } from '../errors';
import { parse } from '../http/validate';
import { restoreBackup, writeBackup } from '../services/backup';
import { contentDisposition } from './attachments';
import type { RouteDeps } from './deps';

/**
 * app.ts parses `application/json` bodies for every /api path at 100 kB before any router runs, so
 * a whole backup is posted as its own media type, which that parser passes by, and read here, after
 * the owner check, with the backup's own limit. A small document sent as application/json still
 * arrives through the shared parser.
 */
const readBackupBody = express.json({ type: BACKUP_CONTENT_TYPE, limit: BACKUP_MAX_BYTES, strict: true });

const receiveBackup: RequestHandler = (req, res, next) => {
  readBackupBody(req, res, (error?: unknown) => {
    const tooLarge = (error as { type?: string } | undefined)?.type === 'entity.too.large';
    next(
      tooLarge
        ? new HttpError(
            413,
            'body_too_large',
            `The backup is larger than ${BACKUP_MAX_BYTES / 1024 / 1024} MB.`,
          )
        : error,
    );
  });
};

/** The client hung up mid-download: nothing to answer, nothing gone wrong here. */
class ClientGoneError extends Error {
  override name = 'ClientGoneError';
}

/** Writes a chunk and waits while the socket's buffer is full; refuses once the client is gone. */
function writerTo(res: Response) {
  return (chunk: string) =>
    new Promise<void>((resolve, reject) => {
      if (res.destroyed) return reject(new ClientGoneError());
      if (res.write(chunk)) return resolve();
      const onDrain = () => {
        res.off('close', onClose);
        resolve();
      };
      const onClose = () => {
        res.off('drain', onDrain);
        reject(new ClientGoneError());
      };
      res.once('drain', onDrain);
      res.once('close', onClose);
    });
}

export function backupRouter({ db, now, uploadsDir }: RouteDeps) {
  const router = Router();

  router.get(BACKUP_PATH, allow('backup', 'read'), async (req, res) => {
    const sink = {
      start: (filename: string) =>
        res.set({
          'Content-Type': 'application/json; charset=utf-8',
          'Content-Disposition': contentDisposition(filename),
          // Password hashes and every customer's details: kept by no cache on the way.
          'Cache-Control': 'private, no-store',
          'X-Content-Type-Options': 'nosniff',
        }),
      write: writerTo(res),
    };
    await writeBackup(db, req.actor!, { uploadsDir, now: now() }, sink).catch((error: unknown) => {
      if (!res.headersSent) throw error;
      // The status line has gone out: cutting the connection is the only way left to say the
      // document is incomplete (the CLI then keeps nothing).
      if (!(error instanceof ClientGoneError)) console.error(error);
      res.destroy();
    });
    if (!res.destroyed) res.end();
  });

  router.post(BACKUP_RESTORE_PATH, allow('backup', 'create'), receiveBackup, async (req, res) => {
    const { force } = parse(RestoreQuerySchema, req.query, 'query');
    const document = parse(BackupDocumentSchema, req.body);
    res.json(
      await restoreBackup(db, req.actor!, document, { force: force === 'true', uploadsDir, now: now() }),
    );
  });
  return router;
}
