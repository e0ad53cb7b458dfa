/**
 * Once per test run: build the migrated (and the seeded) PGlite templates, so each test file
 * clones one in about half a second instead of paying initdb (~4 s) again. When a PostgreSQL server
 * is given (VANBAY_TEST_DATABASE_URL; .ci/run starts one with ensure-postgres.ts), the same two
 * templates are built there too for the `api-postgres` project, and dropped at the end.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { execa } from 'execa';
import type { TestProject } from 'vitest/node';
import { fromPglite } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import { seedDemo } from '../../server/db/seed';
import { ensureClientBuilt } from '../../server/build-client';
import { SEED_TODAY } from './fixtures';
import {
  buildPostgresTemplates,
  dropPostgresDatabases,
  redacted,
  serverVersion,
  TEST_DATABASE_URL_ENV,
  type PostgresTemplates,
} from './postgres';

async function buildPgliteTemplates(dir: string) {
  const client = await PGlite.create();
  const database = fromPglite(client);
  await migrate(database);
  const emptyTemplatePath = path.join(dir, 'empty.tar');
  writeFileSync(emptyTemplatePath, Buffer.from(await (await client.dumpDataDir('none')).arrayBuffer()));
  await seedDemo(database.db, { today: SEED_TODAY });
  const seededTemplatePath = path.join(dir, 'seeded.tar');
  writeFileSync(seededTemplatePath, Buffer.from(await (await client.dumpDataDir('none')).arrayBuffer()));
  await database.close();
  return { emptyTemplatePath, seededTemplatePath };
}

/** The PostgreSQL templates when a server is given and its project is part of this run. */
async function postgresTemplates(project: TestProject): Promise<PostgresTemplates | null> {
  const url = process.env[TEST_DATABASE_URL_ENV]?.trim();
  if (!url) {
    console.log(
      `PostgreSQL pass: skipped (${TEST_DATABASE_URL_ENV} is not set; .ci/run sets it with tests/helpers/ensure-postgres.ts)`,
    );
    return null;
  }
  // The project vite.config.ts adds when the URL is set; `--project` may have left it out.
  const onPostgres = project.vitest.projects.find((p) => p.config.provide?.databaseEngine === 'postgres');
  if (!onPostgres) {
    console.log('PostgreSQL pass: skipped (its project is filtered out of this run)');
    return null;
  }
  const version = await serverVersion(url);
  console.log(
    `PostgreSQL pass: runs (project ${onPostgres.name}) on PostgreSQL ${version} at ${redacted(url)}`,
  );
  return buildPostgresTemplates(url);
}

export default async function setup(project: TestProject) {
  const dir = mkdtempSync(path.join(tmpdir(), 'vanbay-templates-'));
  const build = ensureClientBuilt();
  // Built once here: two test files building it at once could run a half-written bundle.
  const cli = execa('node', ['node_modules/tsx/dist/cli.mjs', 'cli/build.ts']);
  // Both engines' templates at once: PostgreSQL's work happens in the server's own processes.
  const [pglite, postgres] = await Promise.all([buildPgliteTemplates(dir), postgresTemplates(project)]);
  await build;
  await cli;

  project.provide('emptyTemplatePath', pglite.emptyTemplatePath);
  project.provide('seededTemplatePath', pglite.seededTemplatePath);
  project.provide('postgres', postgres);
  return async () => {
    rmSync(dir, { recursive: true, force: true });
    if (postgres) await dropPostgresDatabases(postgres);
  };
}
