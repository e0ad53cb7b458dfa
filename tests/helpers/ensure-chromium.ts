/**
 * The browser tests drive Debian's Chromium (never a downloaded browser). When it is missing,
 * install it where we can (root with apt-get); otherwise stop at once with the one line to run.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { pathToFileURL } from 'node:url';

export const CHROMIUM_PATH = '/usr/bin/chromium';

export function ensureChromium(): void {
  if (existsSync(CHROMIUM_PATH)) return;
  const isRoot = process.getuid?.() === 0;
  if (isRoot && existsSync('/usr/bin/apt-get')) {
    console.error("Installing Debian's chromium for the browser tests (apt-get)…");
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    execFileSync('apt-get', ['update', '-qq'], { stdio: ['ignore', 'ignore', 'inherit'], env });
    execFileSync('apt-get', ['install', '-y', '-qq', 'chromium'], {
      stdio: ['ignore', 'ignore', 'inherit'],
      env,
    });
    if (existsSync(CHROMIUM_PATH)) return;
  }
  console.error('The browser tests need Chromium: run `sudo apt-get install -y chromium` and try again.');
  process.exit(1);
}

// Run as a script (`npm test` does, before vitest); importing it only gives the path.
if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) ensureChromium();
