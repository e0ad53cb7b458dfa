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
  try {
    await applyMigrations(database);
  } catch (error) {
    throw readable(error);
  }
}

/**
 * What the database said, instead of drizzle's "Failed query: " and the whole migration's SQL: a
 * migration that refuses a database on purpose (RAISE EXCEPTION, SQLSTATE P0001) says what to do in
 * its own words; any other failure says it was the upgrade. The migrations are one transaction,
 * so either way nothing was applied.
 */
function readable(error: unknown): unknown {
  const cause = error instanceof Error ? error.cause : undefined;
  if (!(cause instanceof Error)) return error;
  if ((cause as { code?: unknown }).code === 'P0001') return new Error(cause.message, { cause: error });
  return new Error(`The database upgrade failed, and changed nothing: ${cause.message}`, { cause: error });
}

async function applyMigrations(database: Database): Promise<void> {
  const config = { migrationsFolder: MIGRATIONS_FOLDER };
  if (database.engine === 'pglite') {
    const before = await appliedMigrations(database);
    await migratePglite(database.db as PgliteDatabase<Schema>, config);
    // A migration may write every row of a table again (0006 does), which leaves it all dead rows
    // and pages no index can answer from until a vacuum: after an upgrade of a database in use,
    // the whole of it is vacuumed and analyzed once (about 4 s at ten years).
    if (before > 0 && (await appliedMigrations(database)) > before) {
      await database.db.execute(sql`vacuum (analyze)`);
    } else {
      await vacuumGrownTables(database);
    }
  } else {
    await migratePg(database.db as NodePgDatabase<Schema>, config);
  }
}

/** How many migrations the database has had; 0 before the first. */
async function appliedMigrations(database: Database): Promise<number> {
  const [table] = await queryRows<{ exists: boolean }>(
    database.db,
    sql`select to_regclass('drizzle.__drizzle_migrations') is not null as exists`,
  );
  if (!table!.exists) return 0;
  const [row] = await queryRows<{ n: number }>(
    database.db,
    sql`select count(*)::int as n from drizzle.__drizzle_migrations`,
  );
  return row!.n;
}

/**
 * PGlite runs no autovacuum, so without this nothing ever gathers the planner's statistics and it
 * plans ten years of rows as if they were a handful; nor is a page ever marked all-visible, so an
 * index can never answer a count by itself (an index-only scan still visits every row's page), and
 * the dead rows updates leave behind are never cleared for reuse. A whole VACUUM (ANALYZE) costs
 * about 4 s on the ten-year bench seed, too much for every start; so only the tables that have
 * grown by more than a fifth since they were last vacuumed or analyzed (pg_class.relpages is the
 * size either last saw; a fifth is PostgreSQL's own autovacuum_vacuum_scale_factor default, 0.2)
 * are, and tables under 8 pages (64 KB), which plan well either way, never. A grown data dir pays
 * once, the next start nothing. PostgreSQL's own autovacuum does this there.
 */
async function vacuumGrownTables(database: Database): Promise<void> {
  const grown = await queryRows<{ name: string }>(
    database.db,
    sql`select c.relname as name from pg_class c
        where c.relnamespace = 'public'::regnamespace and c.relkind = 'r'
          and pg_relation_size(c.oid) / current_setting('block_size')::int > 1.2 * greatest(c.relpages, 0) + 8`,
  );
  // VACUUM cannot run inside a transaction: each is a statement of its own, outside any.
  for (const { name } of grown) await database.db.execute(sql`vacuum (analyze) ${sql.identifier(name)}`);
}
