/**
 * The suite's PostgreSQL side: the URL it was given, the two template databases global-setup.ts
 * builds on that server, and per-file clones made with `CREATE DATABASE … TEMPLATE` (a file copy on
 * the server, about a tenth of a second) and dropped again at close. No `vitest` import here: the
 * global setup runs outside the test workers.
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { openDatabase, type Database } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import { seedDemo } from '../../server/db/seed';
import { SEED_TODAY } from './fixtures';

/** Where the PostgreSQL pass connects: a role that may create databases (CREATEDB). */
export const TEST_DATABASE_URL_ENV = 'VANBAY_TEST_DATABASE_URL';

export interface PostgresTemplates {
  url: string;
  /** Every database this run makes starts with it, so teardown finds leftovers of crashed files. */
  prefix: string;
  empty: string;
  seeded: string;
}

declare module 'vitest' {
  export interface ProvidedContext {
    /** Which engine `cloneDatabase` gives: set per project in vite.config.ts (default PGlite). */
    databaseEngine: 'pglite' | 'postgres';
    /** The PostgreSQL templates of this run, or null when no server was given. */
    postgres: PostgresTemplates | null;
  }
}

/** The same server and credentials, another database. */
export function urlFor(url: string, database: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${database}`;
  return parsed.toString();
}

/** The URL with its password masked, for the log. */
export function redacted(url: string): string {
  const parsed = new URL(url);
  if (parsed.password) parsed.password = '***';
  return parsed.toString();
}

const ident = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** One statement on the server's maintenance connection (the database the URL names). */
async function admin<T extends pg.QueryResultRow>(url: string, text: string): Promise<T[]> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return (await client.query<T>(text)).rows;
  } finally {
    await client.end();
  }
}

export async function serverVersion(url: string): Promise<string> {
  const [row] = await admin<{ server_version: string }>(url, 'show server_version');
  return row!.server_version;
}

/**
 * The two templates, as the PGlite ones: migrated with server/db/migrate.ts, then a copy seeded with
 * server/db/seed.ts for SEED_TODAY. Both are closed before anyone clones them (a template must
 * have no other connections).
 */
export async function buildPostgresTemplates(url: string): Promise<PostgresTemplates> {
  const prefix = `vanbay_test_${process.pid}_${Date.now().toString(36)}`;
  const templates = { url, prefix, empty: `${prefix}_empty`, seeded: `${prefix}_seeded` };
  await admin(url, `create database ${ident(templates.empty)}`);
  const empty = await openDatabase({ engine: 'postgres', url: urlFor(url, templates.empty) });
  try {
    await migrate(empty);
  } finally {
    await empty.close();
  }
  await admin(url, `create database ${ident(templates.seeded)} template ${ident(templates.empty)}`);
  const seeded = await openDatabase({ engine: 'postgres', url: urlFor(url, templates.seeded) });
  try {
    await seedDemo(seeded.db, { today: SEED_TODAY });
  } finally {
    await seeded.close();
  }
  return templates;
}

/** Drops every database of this run: the templates and any clone a test file left behind. */
export async function dropPostgresDatabases(templates: PostgresTemplates): Promise<void> {
  const rows = await admin<{ datname: string }>(
    templates.url,
    `select datname from pg_database where starts_with(datname, '${templates.prefix}')`,
  );
  for (const { datname } of rows) await admin(templates.url, `drop database ${ident(datname)} with (force)`);
}

/** A database of this run's own: a copy of a template, or (`null`) one with nothing in it at all. */
export async function createPostgresDatabase(
  templates: PostgresTemplates,
  template: 'empty' | 'seeded' | null,
): Promise<Database> {
  const name = `${templates.prefix}_${randomBytes(5).toString('hex')}`;
  const from = template === null ? 'template0' : templates[template];
  await admin(templates.url, `create database ${ident(name)} template ${ident(from)}`);
  const database = await openDatabase({ engine: 'postgres', url: urlFor(templates.url, name) });
  return {
    ...database,
    close: async () => {
      await database.close();
      await admin(templates.url, `drop database if exists ${ident(name)} with (force)`);
    },
  };
}
