import { fileURLToPath } from 'node:url';
import { sql } from 'drizzle-orm';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import type { PgliteDatabase } from 'drizzle-orm/pglite';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import { queryRows, type Database, type Schema } from './client';

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../../drizzle', import.meta.url));

/** Applies every migration in drizzle/ that the database has not seen; safe to run at each start. */
export async function migrate(database: Database): Promise<void> {
  const config = { migrationsFolder: MIGRATIONS_FOLDER };
  if (database.engine === 'pglite') {
    await migratePglite(database.db as PgliteDatabase<Schema>, config);
    await analyzeGrownTables(database);
  } else {
    await migratePg(database.db as NodePgDatabase<Schema>, config);
  }
}

/**
 * PGlite runs no autovacuum, so without this nothing ever gathers the planner's statistics and it
 * plans ten years of rows as if they were a handful. A whole ANALYZE costs about 70 ms on the demo
 * seed but 2.5–3 s on the ten-year bench seed, too much for every start; so only the tables that
 * have more than doubled in size since their statistics were taken (pg_class.relpages is the size
 * ANALYZE last saw) are analyzed, and tables under 8 pages (64 KB), which plan well either way, never.
 * A grown data dir pays once, the next start nothing. PostgreSQL's own autovacuum does this there.
 */
async function analyzeGrownTables(database: Database): Promise<void> {
  const grown = await queryRows<{ name: string }>(
    database.db,
    sql`select c.relname as name from pg_class c
        where c.relnamespace = 'public'::regnamespace and c.relkind = 'r'
          and pg_relation_size(c.oid) / current_setting('block_size')::int > 2 * greatest(c.relpages, 0) + 8`,
  );
  for (const { name } of grown) await database.db.execute(sql`analyze ${sql.identifier(name)}`);
}
