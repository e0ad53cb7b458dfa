/**
 * The browser tests drive Debian's Chromium (never a downloaded browser), and the PDF tests render a
 * page to PNG with poppler's `pdftoppm` for review. When either is missing, install it where we can
 * (root with apt-get); otherwise stop at once with the one line to run.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { pathToFileURL } from 'node:url';

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const PDFTOPPM_PATH = '/usr/bin/pdftoppm';

/** Debian package → the file that shows it is installed. */
const NEEDED = { chromium: CHROMIUM_PATH, 'poppler-utils': PDFTOPPM_PATH } as const;

export function ensureChromium(): void {
  const missing = Object.entries(NEEDED)
    .filter(([, file]) => !existsSync(file))
    .map(([pkg]) => pkg);
  if (missing.length === 0) return;
  const isRoot = process.getuid?.() === 0;
  if (isRoot && existsSync('/usr/bin/apt-get')) {
    console.error(`Installing Debian's ${missing.join(' and ')} for the browser and PDF tests (apt-get)…`);
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    execFileSync('apt-get', ['update', '-qq'], { stdio: ['ignore', 'ignore', 'inherit'], env });
    execFileSync('apt-get', ['install', '-y', '-qq', ...missing], {
      stdio: ['ignore', 'ignore', 'inherit'],
      env,
    });
    if (Object.values(NEEDED).every((file) => existsSync(file))) return;
  }
  console.error(
    `The tests need ${missing.join(' and ')}: run \`sudo apt-get install -y ${missing.join(' ')}\` and try again.`,
  );
  process.exit(1);
}

// Run as a script (`npm test` does, before vitest); importing it only gives the path.
if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) ensureChromium();
