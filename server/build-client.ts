/**
 * `npm start` on a fresh clone (or after a pull) must serve a dashboard that matches the source:
 * build it when the output is missing or older than anything it is built from.
 */
import { execFile } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { CLIENT_OUT_DIR, PROJECT_ROOT } from './config';

export const CLIENT_DIR = path.join(PROJECT_ROOT, CLIENT_OUT_DIR);

const CLIENT_INPUTS = [
  'src',
  'shared',
  'index.html',
  'tailwind.config.ts',
  'vite.config.ts',
  'package-lock.json',
];

function newestMtime(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stat = statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return readdirSync(entry).reduce(
    (newest, name) => Math.max(newest, newestMtime(path.join(entry, name))),
    stat.mtimeMs,
  );
}

export function clientBuildIsCurrent(): boolean {
  const built = path.join(CLIENT_DIR, 'index.html');
  if (!existsSync(built)) return false;
  const inputs = Math.max(...CLIENT_INPUTS.map((input) => newestMtime(path.join(PROJECT_ROOT, input))));
  return statSync(built).mtimeMs >= inputs;
}

/** Runs `vite build` unless the build is current; returns whether it built. */
export async function ensureClientBuilt(log: (line: string) => void = () => {}): Promise<boolean> {
  if (clientBuildIsCurrent()) return false;
  log('Building the dashboard…');
  const vite = path.join(PROJECT_ROOT, 'node_modules', 'vite', 'bin', 'vite.js');
  await promisify(execFile)(process.execPath, [vite, 'build', '--logLevel', 'warn'], {
    cwd: PROJECT_ROOT,
    // The test runner sets NODE_ENV=test, which would make Vite bundle React's development build
    // (bigger and slower); the dashboard served is always the production one.
    env: { ...process.env, NODE_ENV: 'production' },
    maxBuffer: 16 * 1024 * 1024,
  });
  return true;
}
