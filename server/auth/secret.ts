/**
 * The key that signs session tokens: `VANBAY_SECRET` when set, else one generated on first start
 * and kept in the data dir with mode 0600, so restarts keep everyone signed in and the key never
 * sits in the repository.
 */
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export const SECRET_FILE = 'session-secret';
/** HS256 wants at least 256 bits of key. */
const MIN_SECRET_BYTES = 32;

export function loadSessionSecret(dataDir: string, env: NodeJS.ProcessEnv = process.env): Uint8Array {
  const fromEnv = env.VANBAY_SECRET;
  if (fromEnv !== undefined && fromEnv !== '') {
    if (Buffer.byteLength(fromEnv) < MIN_SECRET_BYTES) {
      throw new Error(`VANBAY_SECRET must be at least ${MIN_SECRET_BYTES} bytes long`);
    }
    return new TextEncoder().encode(fromEnv);
  }
  const file = path.join(dataDir, SECRET_FILE);
  if (existsSync(file)) return new Uint8Array(Buffer.from(readFileSync(file, 'utf8').trim(), 'base64url'));
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(MIN_SECRET_BYTES);
  writeFileSync(file, `${secret.toString('base64url')}\n`, { mode: 0o600, flag: 'wx' });
  chmodSync(file, 0o600);
  return new Uint8Array(secret);
}
