import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { execa } from 'execa';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import type { Database } from '../../server/db/client';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';

const BIN = 'cli/dist/vanbay.js';

describe('the built vanbay binary', () => {
  let database: Database;
  let server: Server;
  let url: string;
  beforeAll(async () => {
    database = await cloneDatabase('empty');
    server = createApp({ db: database.db, uploadsDir: tempUploadsDir() }).listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  });
  afterAll(async () => {
    await new Promise((resolve) => server.close(resolve));
    await database.close();
  });

  it('is a single file that prints its version and help', async () => {
    const version = await execa('node', [BIN, '--version']);
    expect(version.stdout).toMatch(/^\d+\.\d+\.\d+$/);
    const help = await execa('node', [BIN, '--help']);
    expect(help.stdout).toMatch(/Usage: vanbay/);
    expect(help.stdout).toMatch(/health/);
  });

  it('asks a real server for its health with --json and nothing else on stdout', async () => {
    const result = await execa('node', [BIN, '--server', url, 'health', '--json']);
    expect(JSON.parse(result.stdout)).toEqual({ server: url, ok: true });
  });

  it('takes the server from VANBAY_URL, and exits 1 when nothing listens there', async () => {
    const ok = await execa('node', [BIN, 'health', '--json'], { env: { VANBAY_URL: url } });
    expect(JSON.parse(ok.stdout).ok).toBe(true);
    const down = await execa('node', [BIN, 'health', '--json'], {
      env: { VANBAY_URL: 'http://127.0.0.1:9' },
      reject: false,
    });
    expect(down.exitCode).toBe(1);
    expect(JSON.parse(down.stdout).ok).toBe(false);
  });

  it('exits 2 with one line on stderr and no stack for an unknown option, on any command', async () => {
    for (const argv of [['--no-such-flag'], ['health', '--no-such-flag'], ['no-such-command']]) {
      const result = await execa('node', [BIN, ...argv], { reject: false });
      expect(result.exitCode, argv.join(' ')).toBe(2);
      expect(result.stdout).toBe('');
      expect(result.stderr.trim().split('\n')).toHaveLength(1);
      expect(result.stderr).not.toMatch(/at .*\.js:\d+/);
    }
  });
});
