import { describe, expect, it } from 'vitest';
import { hashPassword, verifyPassword } from '../../server/auth/password';

describe('password hashing', () => {
  it('verifies the right password and refuses a wrong one', async () => {
    const stored = await hashPassword('vanbay-demo-2026');
    expect(await verifyPassword('vanbay-demo-2026', stored)).toBe(true);
    expect(await verifyPassword('vanbay-demo-2025', stored)).toBe(false);
  });

  it('salts each hash, so one password never gives the same hash twice', async () => {
    const [a, b] = await Promise.all([hashPassword('same'), hashPassword('same')]);
    expect(a).not.toBe(b);
    expect(a.split('$')[0]).toBe('scrypt');
  });

  it('refuses a tampered or unknown hash without throwing', async () => {
    const stored = await hashPassword('secret');
    const parts = stored.split('$');
    parts[5] = Buffer.alloc(32, 1).toString('base64');
    expect(await verifyPassword('secret', parts.join('$'))).toBe(false);
    expect(await verifyPassword('secret', 'md5$abc')).toBe(false);
    expect(await verifyPassword('secret', '')).toBe(false);
  });
});
