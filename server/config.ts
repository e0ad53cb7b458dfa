import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = fileURLToPath(new URL('..', import.meta.url));

/** Where `vite build` puts the dashboard and where the server serves it from. */
export const CLIENT_OUT_DIR = 'server/dist/public';

export interface ServerConfig {
  port: number;
  host: string;
  /** Everything the server keeps on disk: the PGlite database, uploads, its secret. */
  dataDir: string;
  seed: 'demo' | 'none';
  databaseUrl: string | null;
}

/** Reads CONTRACT.md's environment: PORT, VANBAY_DATA_DIR, VANBAY_SEED, DATABASE_URL. */
export function readConfig(env: NodeJS.ProcessEnv = process.env): ServerConfig {
  const port = Number(env.PORT ?? 5180);
  if (!Number.isInteger(port) || port < 0 || port > 65_535) {
    throw new Error(`PORT must be a whole number from 0 to 65535, not "${env.PORT}"`);
  }
  const seed = env.VANBAY_SEED ?? 'demo';
  if (seed !== 'demo' && seed !== 'none') {
    throw new Error(`VANBAY_SEED must be "demo" or "none", not "${seed}"`);
  }
  return {
    port,
    host: env.HOST ?? '0.0.0.0',
    dataDir: path.resolve(PROJECT_ROOT, env.VANBAY_DATA_DIR ?? '.vanbay'),
    seed,
    databaseUrl: env.DATABASE_URL?.trim() || null,
  };
}
