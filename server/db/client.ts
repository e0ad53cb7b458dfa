/**
 * The one way the server reaches its data: PGlite in a data directory by default (one laptop in
 * the van), or a real PostgreSQL server when DATABASE_URL is set (a hosted Vanbay). Both speak the
 * same schema and the same migrations; services see only `Db`.
 */
import { mkdirSync } from 'node:fs';
import { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import pg from 'pg';
import type { SQL } from 'drizzle-orm';
import * as schema from './schema';

export type Schema = typeof schema;
export type Db = PgDatabase<PgQueryResultHKT, Schema>;

export interface Database {
  db: Db;
  /** What backs `db`, for start-up messages and tests. */
  engine: 'pglite' | 'postgres';
  close(): Promise<void>;
}

export type DatabaseOptions =
  { engine: 'pglite'; dataDir?: string; loadDataDir?: Blob } | { engine: 'postgres'; url: string };

/** Wraps an open PGlite instance (a data dir, an in-memory clone in tests). */
export function fromPglite(client: PGlite): Database {
  const db = drizzlePglite({ client, schema, casing: 'snake_case' });
  return { db, engine: 'pglite', close: () => client.close() };
}

export async function openDatabase(options: DatabaseOptions): Promise<Database> {
  if (options.engine === 'postgres') {
    const pool = new pg.Pool({ connectionString: options.url, max: 10 });
    // A connection that dies while idle (the server restarted, an admin ended it) is dropped from
    // the pool and the next query opens a new one; without a listener its 'error' would be thrown
    // as an uncaught exception and stop the whole server.
    pool.on('error', (error) => console.error(`database connection lost while idle: ${error.message}`));
    const db = drizzlePg({ client: pool, schema, casing: 'snake_case' });
    return { db, engine: 'postgres', close: () => endPool(pool) };
  }
  if (options.dataDir) mkdirSync(options.dataDir, { recursive: true });
  const client = await PGlite.create({
    ...(options.dataDir ? { dataDir: options.dataDir } : {}),
    ...(options.loadDataDir ? { loadDataDir: options.loadDataDir } : {}),
  });
  return fromPglite(client);
}

/**
 * Ends the pool once every connection has closed at the server. `pool.end()` alone resolves as soon
 * as it has asked each connection to end, while the server may still hold them: whatever comes
 * next (dropping the database, a new server on the same one) would find them open, and a connection
 * ended from that side then reports an error on its way out. A connection that never says it has
 * gone does not hold a shutdown for more than a few seconds.
 */
async function endPool(pool: pg.Pool): Promise<void> {
  let open = pool.totalCount;
  const allClosed = new Promise<void>((resolve) => {
    const timer = setTimeout(resolve, 5_000);
    timer.unref();
    const done = () => {
      clearTimeout(timer);
      resolve();
    };
    if (open === 0) return done();
    pool.on('remove', () => {
      open -= 1;
      if (open === 0) done();
    });
  });
  await pool.end();
  await allClosed;
}

/** DATABASE_URL wins; otherwise PGlite in the data dir. */
export function databaseOptions(config: { databaseUrl: string | null; dataDir: string }): DatabaseOptions {
  if (config.databaseUrl) return { engine: 'postgres', url: config.databaseUrl };
  return { engine: 'pglite', dataDir: `${config.dataDir}/pg` };
}

/** Rows of a raw SQL query; PGlite and node-postgres both answer with `{ rows }`. */
export async function queryRows<T>(db: Db, query: SQL): Promise<T[]> {
  const result = (await db.execute(query)) as unknown as { rows: T[] };
  return result.rows;
}
