/**
 * Password hashing with scrypt (RFC 7914), Node's built-in memory-hard KDF, one salt per user.
 * Stored as `scrypt$N$r$p$saltB64$hashB64` so the cost can rise later without breaking old hashes.
 */
import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from 'node:crypto';

const KEY_LENGTH = 32;
/** N = 2^15, r = 8, p = 1: the cost OWASP's password storage guidance lists for scrypt (from memory). */
const DEFAULT_COST = { N: 2 ** 15, r: 8, p: 1 } as const;

function derive(password: string, salt: Buffer, cost: { N: number; r: number; p: number }) {
  const options: ScryptOptions = { ...cost, maxmem: 128 * cost.N * cost.r * 2 };
  return new Promise<Buffer>((resolve, reject) => {
    scrypt(password.normalize('NFKC'), salt, KEY_LENGTH, options, (error, key) =>
      error ? reject(error) : resolve(key),
    );
  });
}

export async function hashPassword(password: string, salt: Buffer = randomBytes(16)): Promise<string> {
  const key = await derive(password, salt, DEFAULT_COST);
  const { N, r, p } = DEFAULT_COST;
  return ['scrypt', N, r, p, salt.toString('base64'), key.toString('base64')].join('$');
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [scheme, n, r, p, saltB64, hashB64] = stored.split('$');
  if (scheme !== 'scrypt' || !saltB64 || !hashB64) return false;
  const expected = Buffer.from(hashB64, 'base64');
  const cost = { N: Number(n), r: Number(r), p: Number(p) };
  if (![cost.N, cost.r, cost.p].every(Number.isSafeInteger)) return false;
  const actual = await derive(password, Buffer.from(saltB64, 'base64'), cost);
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}
