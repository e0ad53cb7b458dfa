import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { execa, type ResultPromise } from 'execa';
import { afterAll, describe, expect, it } from 'vitest';

const dataDir = mkdtempSync(path.join(tmpdir(), 'vanbay-start-'));

/**
 * Starts what `npm start` runs (`node --import tsx server/index.ts`: one process, so a signal
 * reaches the server itself) and waits for the URL it prints.
 */
async function start(): Promise<{ child: ResultPromise; url: string }> {
  const child = execa('node', ['--import', 'tsx', 'server/index.ts'], {
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

  it('keeps the data across a restart, seeds nothing twice, and stops on Ctrl-C with its output pipe gone', async () => {
    const before = await counts();
    expect(before.businesses).toBe(1);
    expect(before.jobs).toBeGreaterThan(30);
    const { child, url } = await start();
    expect((await fetch(`${url}/api/health`)).status).toBe(200);
    // `npm start | tee server.log`, then Ctrl-C: tee stops too, so the pipe's reader is gone before
    // the server says it is stopping. It must still close the database and let go of the data dir.
    child.stdout!.destroy();
    child.kill('SIGINT');
    const stopped = await child;
    expect(stopped.signal).toBeUndefined();
    expect(stopped.stderr).not.toMatch(/EPIPE/);
    expect(stopped.exitCode).toBe(0);
    expect(existsSync(path.join(dataDir, 'server.pid'))).toBe(false);
    expect(await counts()).toEqual(before);
  }, 60_000);
});

describe('one server per data dir', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'vanbay-lock-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const env = {
    VANBAY_DATA_DIR: dir,
    PORT: '0',
    HOST: '127.0.0.1',
    VANBAY_SEED: 'none',
    VANBAY_REQUEST_LOG: 'off',
  };
  const run = () => execa('node', ['--import', 'tsx', 'server/index.ts'], { env, reject: false });

  // A fresh data dir with VANBAY_SEED=none: one first start (initdb is the slow part) serves both.
  it('starts empty with VANBAY_SEED=none, takes over a lock left by a dead process, refuses a second live server', async () => {
    // A pid far above Linux's default pid_max (4 194 304) cannot belong to a live process.
    writeFileSync(path.join(dir, 'server.pid'), '99999999\n');
    const first = run();
    await new Promise<void>((resolve) =>
      first.stdout!.on('data', (c: Buffer) => /running at/.test(String(c)) && resolve()),
    );
    // The lock names the live server: the process started, as `npm start` runs it.
    const holder = Number(readFileSync(path.join(dir, 'server.pid'), 'utf8').trim());
    expect(holder).toBe(first.pid);
    expect(() => process.kill(holder, 0)).not.toThrow();

    const second = await run();
    expect(second.exitCode).toBe(1);
    expect(second.stderr.trim()).toMatch(/^Another Vanbay server \(pid \d+\) is using/);

    first.kill('SIGTERM');
    const stopped = await first;
    expect(stopped.exitCode).toBe(0);
    expect(existsSync(path.join(dir, 'server.pid'))).toBe(false);
    expect(stopped.stdout).not.toMatch(/Demo sign-ins/);
    const db = await PGlite.create({ dataDir: path.join(dir, 'pg') });
    expect((await db.query<{ n: number }>('select count(*)::int n from businesses')).rows[0]!.n).toBe(0);
    await db.close();
  }, 60_000);
});
