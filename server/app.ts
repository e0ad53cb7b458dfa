/**
 * Builds the Express app; it does not listen (server/index.ts does), so tests drive it with
 * supertest and a cloned database.
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import compression from 'compression';
import express, { type ErrorRequestHandler, type RequestHandler } from 'express';
import morgan from 'morgan';
import type { ErrorBody } from '../shared/api/errors';
import type { Db } from './db/client';
import { randomBytes } from 'node:crypto';
import { authenticate } from './auth/middleware';
import { securityHeaders } from './http/security-headers';
import { HttpError, NotFoundError } from './errors';
import { mailNotSetUp, type Mailer } from './mail/mailer';
import { paymentsNotSetUp, type PaymentProvider } from './payments/provider';
import { authRouter } from './routes/auth';
import type { RouteDeps } from './routes/deps';
import { apiRouters } from './routes/index';
import { healthRouter } from './routes/health';
import { paymentWebhookRouter } from './routes/payment-webhook';
import { createSignInLimits } from './services/auth';

export interface AppDeps {
  db: Db;
  /** The built dashboard to serve; omitted in API-only tests and in `npm run dev`. */
  clientDir?: string;
  /** Request log lines go here; omitted means no request log. */
  log?: (line: string) => void;
  /** Signs session tokens (server/auth/secret.ts); a fresh random key when omitted, as in tests. */
  secret?: Uint8Array;
  /** The clock every route reads; tests pass a fixed one. */
  clock?: () => Date;
  /** Where attachment files are stored: the data dir's `uploads/`. */
  uploadsDir: string;
  /** Where mail goes (server/mail/mailer.ts); omitted means the mail routes answer 503. */
  mailer?: Mailer;
  /** Card payments (server/payments/); omitted means the payment-link and webhook routes answer 503. */
  payments?: PaymentProvider;
}

/** JSON bodies larger than this are refused with 413 before any route sees them. */
export const JSON_BODY_LIMIT = '100kb';

export function createApp({
  db,
  clientDir,
  log,
  secret = new Uint8Array(randomBytes(32)),
  clock = () => new Date(),
  uploadsDir,
  mailer = mailNotSetUp,
  payments = paymentsNotSetUp,
}: AppDeps) {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(securityHeaders());
  // gzip for the dashboard's files and the JSON answers; files sent as documents (PDF, CSV, backup,
  // attachments: anything with a Content-Disposition) keep their Content-Length and go out as they are.
  app.use(
    compression({
      filter: (req, res) => !res.hasHeader('Content-Disposition') && compression.filter(req, res),
    }),
  );

  if (log) {
    app.use(
      morgan(':method :url :status :res[content-length] - :response-time ms', {
        stream: { write: (line: string) => log(line.trimEnd()) },
      }),
    );
  }

  // Signed by the payment service over its raw bytes: read before the JSON parser, no session.
  app.use(paymentWebhookRouter({ db, now: clock, payments }));
  app.use('/api', express.json({ limit: JSON_BODY_LIMIT, strict: true }));
  app.use(healthRouter(db));
  const auth = { db, secret, now: clock };
  app.use('/api', authenticate(auth));
  app.use(authRouter({ ...auth, limits: createSignInLimits() }));
  const deps: RouteDeps = { db, now: clock, uploadsDir, mailer, payments };
  for (const router of apiRouters(deps)) app.use(router);
  app.use('/api', (_req, _res, next) => next(new NotFoundError('No such API route')));

  if (clientDir && existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    // Client routes (/jobs/42, …) are the dashboard's: answer them with its shell.
    const shell: RequestHandler = (_req, res) => {
      res.sendFile(path.join(clientDir, 'index.html'), { maxAge: 0 });
    };
    app.get('/{*path}', shell);
  }

  app.use((_req, _res, next) => next(new NotFoundError()));
  app.use(errorHandler);
  return app;
}

/** Maps everything thrown or rejected to CONTRACT.md's `{"error": {code, message, details?}}`. */
const errorHandler: ErrorRequestHandler = (err, _req, res, _next) => {
  const { status, body } = toErrorResponse(err);
  if (status >= 500) console.error(err);
  res.status(status).json(body);
};

function toErrorResponse(err: unknown): { status: number; body: ErrorBody } {
  if (err instanceof HttpError) {
    const error = { code: err.code, message: err.message };
    return {
      status: err.status,
      body: { error: err.details === undefined ? error : { ...error, details: err.details } },
    };
  }
  // body-parser's own errors carry a `type` and a 4xx status.
  const parserError = err as { type?: string; status?: number };
  if (parserError.type === 'entity.parse.failed') {
    return bodyError(400, 'malformed_json', 'The request body is not valid JSON.');
  }
  if (parserError.type === 'entity.too.large') {
    return bodyError(413, 'body_too_large', `The request body is larger than ${JSON_BODY_LIMIT}.`);
  }
  if (parserError.type === 'encoding.unsupported' || parserError.type === 'charset.unsupported') {
    return bodyError(415, 'unsupported_encoding', 'The request body encoding is not supported.');
  }
  if (typeof parserError.status === 'number' && parserError.status >= 400 && parserError.status < 500) {
    return bodyError(parserError.status, 'bad_request', 'The request could not be read.');
  }
  return bodyError(500, 'internal', 'Something went wrong on the server.');
}

function bodyError(status: number, code: string, message: string) {
  return { status, body: { error: { code, message } } };
}
