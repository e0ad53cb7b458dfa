import { fileURLToPath } from 'node:url';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import type { PgliteDatabase } from 'drizzle-orm/pglite';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import type { Database, Schema } from './client';

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../../drizzle', import.meta.url));

/** Applies every migration in drizzle/ that the database has not seen; safe to run at each start. */
export async function migrate(database: Database): Promise<void> {
  const config = { migrationsFolder: MIGRATIONS_FOLDER };
  if (database.engine === 'pglite') {
    await migratePglite(database.db as PgliteDatabase<Schema>, config);
  } else {
    await migratePg(database.db as NodePgDatabase<Schema>, config);
  }
}
