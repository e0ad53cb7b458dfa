/**
 * Where the large seed lives (`.vanbay-large/`, or VANBAY_LARGE_DIR) and the note it leaves
 * there once complete. The layout is a server data dir's (`pg/` for PGlite), so
 * `VANBAY_DATA_DIR=.vanbay-large npm start` serves the ten years too.
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { PROJECT_ROOT } from '../../server/config';

export const META_FILE = 'large-seed.json';

export interface LargeSeedMeta {
  /** The generator's LARGE_SEED_VERSION when it wrote the seed. */
  version: number;
  /** The seed's fixed "today", ISO. */
  today: string;
  scale: number;
  seconds: number;
  counts: Record<string, number>;
}

export function largeDataDir(env: NodeJS.ProcessEnv = process.env): string {
  return path.resolve(PROJECT_ROOT, env.VANBAY_LARGE_DIR || '.vanbay-large');
}

export const pgDirOf = (dataDir: string) => path.join(dataDir, 'pg');

/** The note of a finished seed, or null when there is none (never seeded, or cut short). */
export function readMeta(dataDir: string): LargeSeedMeta | null {
  const file = path.join(dataDir, META_FILE);
  if (!existsSync(file)) return null;
  return JSON.parse(readFileSync(file, 'utf8')) as LargeSeedMeta;
}

/** The floors for "ten busy years". */
export const FLOORS: Record<string, number> = {
  jobs: 25_000,
  readings: 250_000,
  trips: 20_000,
  invoices: 20_000,
};
