/**
 * Once per test run: build the migrated (and the seeded) PGlite templates, so each test file
 * clones one in about half a second instead of paying initdb (~4 s) again.
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

export default async function setup(project: TestProject) {
  const dir = mkdtempSync(path.join(tmpdir(), 'vanbay-templates-'));
  const build = ensureClientBuilt();
  // Built once here: two test files building it at once could run a half-written bundle.
  const cli = execa('node', ['node_modules/tsx/dist/cli.mjs', 'cli/build.ts']);

  const client = await PGlite.create();
  const database = fromPglite(client);
  await migrate(database);
  const emptyTemplatePath = path.join(dir, 'empty.tar');
  writeFileSync(emptyTemplatePath, Buffer.from(await (await client.dumpDataDir('none')).arrayBuffer()));
  await seedDemo(database.db, { today: SEED_TODAY });
  const seededTemplatePath = path.join(dir, 'seeded.tar');
  writeFileSync(seededTemplatePath, Buffer.from(await (await client.dumpDataDir('none')).arrayBuffer()));
  await database.close();
  await build;
  await cli;

  project.provide('emptyTemplatePath', emptyTemplatePath);
  project.provide('seededTemplatePath', seededTemplatePath);
  return () => rmSync(dir, { recursive: true, force: true });
}
