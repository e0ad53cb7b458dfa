import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listQueue } from '../../cli/lib/queue';
import { runCli } from '../../cli/program';
import * as t from '../../server/db/schema';
import { listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';

let api: TestApi & { url: string };
/** Jules's motorcycle (Quillback 650, odometer in miles) and its fuel filter interval, from the seed. */
let bikeId: number;
let filterId: number;
beforeAll(async () => {
  api = await listeningApi();
  const [bike] = await api.database.db
    .select({ id: t.machines.id })
    .from(t.machines)
    .where(eq(t.machines.model, 'Quillback 650'));
  bikeId = bike!.id;
  const [filter] = await api.database.db
    .select({ id: t.serviceIntervals.id })
    .from(t.serviceIntervals)
    .where(and(eq(t.serviceIntervals.machineId, bikeId), eq(t.serviceIntervals.item, 'fuel_filter')));
  filterId = filter!.id;
});
afterAll(() => api.close());

/** The helper at the roadside, with a config dir of their own. */
function helper() {
  const config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'));
  return async (reach: 'online' | 'offline', ...argv: string[]) => {
    // Offline: the network gives no answer at all, as in a canyon with no signal.
    const network: typeof fetch =
      reach === 'online' ? fetch : () => Promise.reject(new TypeError('fetch failed: no route to host'));
    const io = fakeDeps(network, {
      VANBAY_URL: api.url,
      XDG_CONFIG_HOME: config,
      VANBAY_TOKEN: api.tokens.helper,
    });
    const code = await runCli(argv, io.deps);
    return { code, stdout: io.stdout(), stderr: io.stderr(), env: io.deps.env };
  };
}

async function stored() {
  const [row] = await api.database.db
    .select()
    .from(t.serviceIntervals)
    .where(eq(t.serviceIntervals.id, filterId));
  return row!;
}

describe('vanbay service', () => {
  it('lists a machine’s intervals with where each stands, as the server judged them', async () => {
    const run = helper();
    const listed = await run('online', 'service', 'list', String(bikeId), '--json');
    expect(listed.code, listed.stderr).toBe(0);
    const items = JSON.parse(listed.stdout) as { id: number; state: { status: string } }[];
    expect(items.map((i) => i.id)).toContain(filterId);
    const text = await run('online', 'service', 'list', String(bikeId));
    expect(text.code).toBe(0);
    const filterLine = text.stdout.split('\n').find((l) => l.trimStart().startsWith(`${filterId} `));
    const filter = items.find((i) => i.id === filterId)!;
    expect(filterLine).toContain(
      { overdue: 'overdue', due: 'due', due_soon: 'due soon', ok: 'not due' }[filter.state.status],
    );
  });

  it('records one done with the day and the meter; the server judges it not due', async () => {
    const run = helper();
    const done = await run(
      'online',
      'service',
      'done',
      String(bikeId),
      String(filterId),
      '--on',
      '2026-11-17',
      '--meter',
      '18,420',
      '--json',
    );
    expect(done.code, done.stderr).toBe(0);
    expect(JSON.parse(done.stdout)).toMatchObject({
      queued: false,
      id: filterId,
      lastDoneOn: '2026-11-17',
      lastDoneMeter: 18_420,
    });
    expect(JSON.parse(done.stdout).state.status).toBe('ok');
    expect(await stored()).toMatchObject({ lastDoneOn: '2026-11-17', lastDoneMeter: 18_420 });
  });

  it('queues it when the server is out of reach, and `vanbay sync` sends it once', async () => {
    const run = helper();
    const queued = await run(
      'offline',
      'service',
      'done',
      String(bikeId),
      String(filterId),
      '--on',
      '2026-11-18',
      '--json',
    );
    expect(queued.code, queued.stderr).toBe(0);
    expect(queued.stderr).toMatch(/server unreachable.*queued; `vanbay sync` sends it/);
    expect(JSON.parse(queued.stdout)).toEqual({
      queued: true,
      machineId: bikeId,
      intervalId: filterId,
      lastDoneOn: '2026-11-18',
    });
    expect(listQueue(queued.env).entries).toHaveLength(1);
    expect((await stored()).lastDoneOn).toBe('2026-11-17');

    const synced = await run('online', 'sync');
    expect(synced.code, synced.stderr).toBe(0);
    expect(listQueue(queued.env).entries).toHaveLength(0);
    // The meter was not given: it stays as last recorded.
    expect(await stored()).toMatchObject({ lastDoneOn: '2026-11-18', lastDoneMeter: 18_420 });
  });

  it('refuses bad input with exit 2 and one line, and sends nothing', async () => {
    const run = helper();
    const before = await stored();
    for (const argv of [
      ['service', 'done', 'bike', String(filterId)],
      ['service', 'done', String(bikeId), '0'],
      ['service', 'done', String(bikeId), String(filterId), '--on', '18/11/2026'],
      ['service', 'done', String(bikeId), String(filterId), '--on', '2026-13-45'],
      ['service', 'done', String(bikeId), String(filterId), '--meter', 'lots'],
      // Above what the API takes (shared/api/service-intervals.ts): refused here, not queued.
      ['service', 'done', String(bikeId), String(filterId), '--meter', '99999999'],
    ]) {
      const result = await run('online', ...argv);
      expect(result.code, argv.join(' ')).toBe(2);
      expect(result.stderr.trim().split('\n')).toHaveLength(1);
    }
    expect(await stored()).toEqual(before);
    // A day after the business's today is the server's to refuse: exit 1, nothing changed.
    const future = await run(
      'online',
      'service',
      'done',
      String(bikeId),
      String(filterId),
      '--on',
      '2030-01-01',
    );
    expect(future.code).toBe(1);
    expect(await stored()).toEqual(before);
  });
});
