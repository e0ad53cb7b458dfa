import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { execa, type ResultPromise } from 'execa';
import { afterAll, describe, expect, it } from 'vitest';

const dataDir = mkdtempSync(path.join(tmpdir(), 'vanbay-start-'));

/** Starts `npm start`'s entry point as its own process and waits for the URL it prints. */
async function start(): Promise<{ child: ResultPromise; url: string }> {
  const child = execa('node', ['node_modules/tsx/dist/cli.mjs', 'server/index.ts'], {
    env: { VANBAY_DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', VANBAY_REQUEST_LOG: 'off' },
    reject: false,
  });
  const url = await new Promise<string>((resolve, reject) => {
    let seen = '';
    child.stdout!.on('data', (chunk: Buffer) => {
      seen += chunk.toString();
      const match = /running at (http:\/\/\S+)/.exec(seen);
      if (match) resolve(match[1]!);
    });
    void child.then((result) => reject(new Error(`server exited early: ${result.stderr || seen}`)));
  });
  return { child, url };
}

async function counts() {
  const db = await PGlite.create({ dataDir: path.join(dataDir, 'pg') });
  const result = await db.query<{ t: string; n: number }>(
    `select 'businesses' t, count(*)::int n from businesses union all select 'users', count(*)::int from users
     union all select 'jobs', count(*)::int from jobs union all select 'invoices', count(*)::int from invoices`,
  );
  await db.close();
  return Object.fromEntries(result.rows.map((row) => [row.t, row.n]));
}

describe('the server process', () => {
  afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

  it('creates, migrates and seeds a new data dir, answers health, and stops cleanly on SIGTERM', async () => {
    const { child, url } = await start();
    const response = await fetch(`${url}/api/health`);
    expect(await response.json()).toEqual({ ok: true });
    child.kill('SIGTERM');
    const result = await child;
    expect(result.exitCode).toBe(0);
    expect(result.stdout).toMatch(/owner@ridgeback\.test/);
    expect(result.stdout).toMatch(/closing the database/);
  }, 60_000);

  it('keeps the data across a restart and seeds nothing twice', async () => {
    const before = await counts();
    expect(before.businesses).toBe(1);
    expect(before.jobs).toBeGreaterThan(30);
    const { child, url } = await start();
    expect((await fetch(`${url}/api/health`)).status).toBe(200);
    child.kill('SIGINT');
    expect((await child).exitCode).toBe(0);
    expect(await counts()).toEqual(before);
  }, 60_000);

  it('starts empty with VANBAY_SEED=none', async () => {
    const emptyDir = mkdtempSync(path.join(tmpdir(), 'vanbay-empty-'));
    try {
      const child = execa('node', ['node_modules/tsx/dist/cli.mjs', 'server/index.ts'], {
        env: { VANBAY_DATA_DIR: emptyDir, PORT: '0', HOST: '127.0.0.1', VANBAY_SEED: 'none' },
        reject: false,
      });
      await new Promise<void>((resolve) => child.stdout!.on('data', (c: Buffer) => /running at/.test(String(c)) && resolve()));
      child.kill('SIGTERM');
      const result = await child;
      expect(result.stdout).not.toMatch(/Demo sign-ins/);
      const db = await PGlite.create({ dataDir: path.join(emptyDir, 'pg') });
      expect((await db.query<{ n: number }>('select count(*)::int n from businesses')).rows[0]!.n).toBe(0);
      await db.close();
    } finally {
      rmSync(emptyDir, { recursive: true, force: true });
    }
  }, 60_000);
});
