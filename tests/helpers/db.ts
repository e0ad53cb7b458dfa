import { readFileSync } from 'node:fs';
import { PGlite } from '@electric-sql/pglite';
import { inject } from 'vitest';
import { fromPglite, type Database } from '../../server/db/client';
import './fixtures';

/** A private in-memory copy of a template built by global-setup.ts. */
export async function cloneDatabase(template: 'empty' | 'seeded'): Promise<Database> {
  const file = inject(template === 'empty' ? 'emptyTemplatePath' : 'seededTemplatePath');
  const client = await PGlite.create({ loadDataDir: new Blob([readFileSync(file)]) });
  return fromPglite(client);
}
