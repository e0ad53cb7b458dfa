import { copyFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listQueue } from '../../cli/lib/queue';
import { runCli } from '../../cli/program';
import { queryRows } from '../../server/db/client';
import { listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';

let api: TestApi;
let url: string;
beforeAll(async () => {
  const listening = await listeningApi();
  api = listening;
  url = listening.url;
});
afterAll(() => api.close());

/** The CLI as the owner, on one config dir, pointed at `target` (the live server by default). */
function owner(config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'))) {
  return {
    config,
    run: async (target: string, ...argv: string[]) => {
      const io = fakeDeps(fetch, {
        VANBAY_URL: target,
        XDG_CONFIG_HOME: config,
        VANBAY_TOKEN: api.tokens.owner,
      });
      const code = await runCli(argv, io.deps);
      return { code, stdout: io.stdout(), stderr: io.stderr() };
    },
  };
}

const readingsOn = async (jobId: number) =>
  (
    await queryRows<{ n: number }>(
      api.database.db,
      sql`select count(*)::int as n from readings where job_id = ${jobId}`,
    )
  )[0]!.n;

describe('jobs and readings from the CLI', () => {
  it('lists jobs as a JSON array with the fields CONTRACT.md fixes', async () => {
    const { run } = owner();
    const result = await run(url, 'job', 'list', '--json', '--limit', '500');
    expect(result.code).toBe(0);
    const jobs = JSON.parse(result.stdout) as Record<string, unknown>[];
    expect(Array.isArray(jobs)).toBe(true);
    expect(jobs.length).toBeGreaterThan(20);
    for (const job of jobs)
      expect(job).toMatchObject({
        id: expect.any(Number),
        status: expect.any(String),
        customerId: expect.any(Number),
        machineId: expect.any(Number),
      });
    const booked = JSON.parse((await run(url, 'job', 'list', '--status', 'booked', '--json')).stdout) as {
      status: string;
    }[];
    expect(booked.every((j) => j.status === 'booked')).toBe(true);
  });

  it('books a job in one line and moves it on', async () => {
    const { run } = owner();
    const created = await run(
      url,
      'job',
      'new',
      '--customer',
      'Jules Marchetti',
      '--machine',
      'Quillback',
      '--complaint',
      'Cuts out under load',
      '--json',
    );
    expect(created.code).toBe(0);
    const job = JSON.parse(created.stdout) as { id: number; status: string };
    expect(job.status).toBe('booked');
    expect((await run(url, 'job', 'status', String(job.id), 'on_site', '--json')).code).toBe(0);
    const refused = await run(url, 'job', 'status', String(job.id), 'paid');
    expect(refused.code).toBe(1);
    expect(refused.stderr.trim().split('\n')).toHaveLength(1);
  });

  it('adds a reading as typed, stored in kPa (NIST SP 811: 1 psi = 6.894757293168 kPa)', async () => {
    const { run } = owner();
    const [job] = JSON.parse((await run(url, 'job', 'list', '--json', '--limit', '1')).stdout) as {
      id: number;
    }[];
    const result = await run(url, 'reading', 'add', String(job!.id), 'pressure', '43psi', '--json');
    expect(result.code).toBe(0);
    const reading = JSON.parse(result.stdout);
    expect(reading).toMatchObject({ queued: false, quantity: 'pressure', unit: 'kPa' });
    expect(reading.value).toBeCloseTo(43 * 6.894757293168, 6);
  });

  it('refuses a bad quantity or value with exit 2 and one line, and stores nothing', async () => {
    const { run } = owner();
    for (const argv of [
      ['reading', 'add', '1', 'pressure', '12V'],
      ['reading', 'add', '1', 'torque', '40'],
      ['reading', 'add', 'x', 'pressure', '43psi'],
    ]) {
      const result = await run(url, ...argv);
      expect(result.code, argv.join(' ')).toBe(2);
      expect(result.stdout).toBe('');
      expect(result.stderr.trim().split('\n')).toHaveLength(1);
    }
  });

  it('queues a reading while the server is unreachable and syncs it exactly once, even when sent twice', async () => {
    const cli = owner();
    const [job] = JSON.parse((await cli.run(url, 'job', 'list', '--json', '--limit', '1')).stdout) as {
      id: number;
    }[];
    const before = await readingsOn(job!.id);
    const offline = await cli.run(
      'http://127.0.0.1:9',
      'reading',
      'add',
      String(job!.id),
      'voltage',
      '12.4V',
      '--json',
    );
    expect(offline.code).toBe(0);
    expect(offline.stderr).toMatch(/queued/);
    expect(JSON.parse(offline.stdout)).toMatchObject({
      queued: true,
      quantity: 'voltage',
      value: 12.4,
      unit: 'V',
    });
    // The queue entry names the server it was meant for; point it at the live one, and duplicate it
    // as if the first send's answer had been lost and it were sent again.
    const { entries } = listQueue({ XDG_CONFIG_HOME: cli.config });
    expect(entries).toHaveLength(1);
    const status = await cli.run('http://127.0.0.1:9', 'status', '--json');
    expect(JSON.parse(status.stdout).queued).toHaveLength(1);
    const entry = entries[0]!;
    writeFileSync(entry.file, JSON.stringify({ ...entry.write, server: url }));
    copyFileSync(entry.file, entry.file.replace(/\.json$/, '-again.json'));
    const sync = await cli.run(url, 'sync', '--json');
    expect(sync.code).toBe(0);
    expect(JSON.parse(sync.stdout)).toMatchObject({ sent: 2, remaining: 0, rejected: [] });
    expect(await readingsOn(job!.id)).toBe(before + 1);
    expect(listQueue({ XDG_CONFIG_HOME: cli.config }).entries).toEqual([]);
  });
});
