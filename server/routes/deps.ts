import type { Db } from '../db/client';
import type { Mailer } from '../mail/mailer';
import type { PaymentProvider } from '../payments/provider';

/** What every resource router is built from. */
export interface RouteDeps {
  db: Db;
  /** The clock: tests pass a fixed one. */
  now: () => Date;
  /** Where uploaded attachment files are kept (the data dir's `uploads/`). */
  uploadsDir: string;
  /** Sends the outbox's mail; a stand-in that answers 503 when the app was given none. */
  mailer: Mailer;
  /** Card payments (server/payments/); a stand-in that answers 503 when the app was given none. */
  payments: PaymentProvider;
}
