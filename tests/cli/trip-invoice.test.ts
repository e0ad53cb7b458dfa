import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listQueue } from '../../cli/lib/queue';
import { runCli } from '../../cli/program';
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

const OFFLINE = 'http://127.0.0.1:9';

function owner() {
  const config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'));
  return async (target: string, ...argv: string[]) => {
    const io = fakeDeps(fetch, {
      VANBAY_URL: target,
      XDG_CONFIG_HOME: config,
      VANBAY_TOKEN: api.tokens.owner,
    });
    const code = await runCli(argv, io.deps);
    return { code, stdout: io.stdout(), stderr: io.stderr(), env: io.deps.env };
  };
}

describe('trips from the CLI', () => {
  it('starts and ends a trip online, and the server figures its miles', async () => {
    const run = owner();
    const started = await run(
      url,
      'trip',
      'start',
      '--odometer',
      '48210.5',
      '--to',
      'Cinder Valley trailhead',
      '--purpose',
      'Fuel pump job',
      '--json',
    );
    expect(started.code, started.stderr).toBe(0);
    expect(JSON.parse(started.stdout).id).toEqual(expect.any(Number));
    const twice = await run(url, 'trip', 'start', '--odometer', '48211', '--to', 'X', '--purpose', 'Y');
    expect(twice.code).toBe(2);
    const ended = await run(url, 'trip', 'end', '--odometer', '48234.7', '--json');
    expect(ended.code, ended.stderr).toBe(0);
    const trip = JSON.parse(ended.stdout);
    // 48 234.7 − 48 210.5 = 24.2 mi (hand arithmetic).
    expect(trip.miles).toBeCloseTo(24.2, 6);
    expect(trip.endOdometer).toBe(48234.7);
  });

  it('keeps a trip started offline and sends it whole, once, when it ends and syncs', async () => {
    const run = owner();
    const started = await run(
      OFFLINE,
      'trip',
      'start',
      '--odometer',
      '50000',
      '--to',
      'Roadside call',
      '--purpose',
      'No-start',
      '--json',
    );
    expect(started.code).toBe(0);
    expect(started.stderr).toMatch(/kept on this machine/);
    const ended = await run(OFFLINE, 'trip', 'end', '--odometer', '50012', '--json');
    expect(ended.code).toBe(0);
    expect(JSON.parse(ended.stdout).queued).toBe(true);
    const { entries } = listQueue(ended.env);
    expect(entries).toHaveLength(1);
    // Back in signal: the entry was queued for the same server the CLI now reaches.
    writeFileSync(entries[0]!.file, JSON.stringify({ ...entries[0]!.write, server: url }));
    const synced = await run(url, 'sync', '--json');
    expect(JSON.parse(synced.stdout)).toMatchObject({ sent: 1, remaining: 0 });
    const list = JSON.parse((await run(url, 'trip', 'list', '--json')).stdout) as {
      destination: string;
      miles: number;
    }[];
    expect(list.filter((t) => t.destination === 'Roadside call')).toEqual([
      expect.objectContaining({ miles: 12 }),
    ]);
  });

  it('refuses an end below the start, with exit 2', async () => {
    const run = owner();
    await run(url, 'trip', 'start', '--odometer', '100', '--to', 'A', '--purpose', 'B');
    const ended = await run(url, 'trip', 'end', '--odometer', '99');
    expect(ended.code).toBe(2);
    expect(ended.stderr.trim().split('\n')).toHaveLength(1);
  });
});

describe('invoices from the CLI', () => {
  it('lists the unpaid ones, each with a balance', async () => {
    const run = owner();
    const result = await run(url, 'invoice', 'list', '--unpaid', '--json');
    expect(result.code).toBe(0);
    const invoices = JSON.parse(result.stdout) as { balanceCents: number; number: number }[];
    expect(invoices.length).toBeGreaterThan(0);
    expect(invoices.every((i) => i.balanceCents > 0)).toBe(true);
  });

  it('says no (exit 1) to invoicing a job that is not complete', async () => {
    const run = owner();
    const [booked] = JSON.parse((await run(url, 'job', 'list', '--status', 'booked', '--json')).stdout) as {
      id: number;
    }[];
    const result = await run(url, 'invoice', 'create', String(booked!.id));
    expect(result.code).toBe(1);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
  });
});
