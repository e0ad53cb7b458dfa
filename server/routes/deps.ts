import type { Db } from '../db/client';

/** What every resource router is built from. */
export interface RouteDeps {
  db: Db;
  /** The clock: tests pass a fixed one. */
  now: () => Date;
  /** Where uploaded attachment files are kept (the data dir's `uploads/`). */
  uploadsDir: string;
}
