import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
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

/** A private, empty directory for a test app's uploaded files. */
export function tempUploadsDir(): string {
  return mkdtempSync(path.join(tmpdir(), 'vanbay-uploads-'));
}
