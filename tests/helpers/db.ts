import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { inject } from 'vitest';
import { fromPglite, type Database } from '../../server/db/client';
import { createPostgresDatabase } from './postgres';
import './fixtures';

/** The PostgreSQL templates when this file runs in the `api-postgres` project, else null (PGlite). */
function postgres() {
  if (inject('databaseEngine') !== 'postgres') return null;
  const templates = inject('postgres');
  if (!templates)
    throw new Error('The api-postgres project ran without a PostgreSQL server (global-setup.ts)');
  return templates;
}

/**
 * A private copy of a template built by global-setup.ts: in memory on PGlite, or a database of its
 * own on the PostgreSQL server in the `api-postgres` project (dropped again by `close`).
 */
export async function cloneDatabase(template: 'empty' | 'seeded'): Promise<Database> {
  const templates = postgres();
  if (templates) return createPostgresDatabase(templates, template);
  const file = inject(template === 'empty' ? 'emptyTemplatePath' : 'seededTemplatePath');
  const client = await PGlite.create({ loadDataDir: new Blob([readFileSync(file)]) });
  return fromPglite(client);
}

/** A database with nothing in it, not even the migrations: for the tests of migrating itself. */
export async function blankDatabase(): Promise<Database> {
  const templates = postgres();
  if (templates) return createPostgresDatabase(templates, null);
  return fromPglite(await PGlite.create());
}

/** A private, empty directory for a test app's uploaded files. */
export function tempUploadsDir(): string {
  return mkdtempSync(path.join(tmpdir(), 'vanbay-uploads-'));
}
