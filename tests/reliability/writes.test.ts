/**
 * Writes under stress (issue "Proof"), on one seeded app listening on a loopback port:
 *
 * - Twenty writers at once over real HTTP: readings and timeline notes on one shared job and on a
 *   job each, every write carrying its client id, many sent twice at the same moment (an offline
 *   queue replaying while its first send is still in flight) and again later. Every acknowledged
 *   write must be stored exactly once, under the id its answer named.
 * - The CLI's offline queue against a flapping server: a TCP proxy in front of the app goes down,
 *   comes back and — worst of all — lets requests through but drops their answers, on a fixed
 *   pattern, request by request. Readings added and synced through it must each land exactly
 *   once: none lost, none doubled, nothing set aside as refused. (tests/cli/job-reading.test.ts
 *   proves the plain case: queued while down, synced once when up.)
 *
 * Invoice numbering under concurrent creation is proven in tests/server/invoices.test.ts (ten at
 * once, gapless; one job billed once when asked three times) and across a crash in
 * crash-restart.test.ts here.
 */
import { randomUUID } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listQueue } from '../../cli/lib/queue';
import { runCli } from '../../cli/program';
import { queryRows } from '../../server/db/client';
import { listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';

const WRITERS = 20;
const ROUNDS = 4;

type Mode = 'up' | 'down' | 'lose';
/** What the proxy does to each request in turn, cycled: a fixed pattern, so every run is the same. */
const PATTERN: Mode[] = [
  'up',
  'down',
  'lose',
  'up',
  'lose',
  'down',
  'down',
  'up',
  'lose',
  'lose',
  'up',
  'down',
];
const READINGS = 14;

let api: TestApi & { url: string };
let sharedJob: number;
let ownJobs: number[];
beforeAll(async () => {
  api = await listeningApi();
  const jobs = await queryRows<{ id: number }>(
    api.database.db,
    sql`select id from jobs order by id limit 12`,
  );
  sharedJob = jobs[0]!.id;
  ownJobs = jobs.slice(1, 11).map((job) => job.id);
  flapJob = jobs[11]!.id;
});
afterAll(async () => {
  await proxy?.close();
  await api?.close();
});

interface Ack {
  kind: 'reading' | 'note';
  clientId: string;
  jobId: number;
  status: number;
  id: number;
}

async function post(path: string, body: object): Promise<{ status: number; id: number; text: string }> {
  const response = await fetch(`${api.url}${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${api.tokens.helper}` },
    body: JSON.stringify(body),
  });
  const text = await response.text();
  return { status: response.status, id: (JSON.parse(text) as { id: number }).id, text };
}

const countOn = async (table: 'readings' | 'job_events', jobId: number) =>
  (
    await queryRows<{ n: number }>(
      api.database.db,
      sql`select count(*)::int as n from ${sql.identifier(table)} where job_id = ${jobId}`,
    )
  )[0]!.n;

describe('twenty concurrent writers', () => {
  it('store every acknowledged write exactly once, on the same and on different jobs', async () => {
    const before = {
      shared: await countOn('readings', sharedJob),
      own: await Promise.all(ownJobs.map((job) => countOn('readings', job))),
      notes: await countOn('job_events', sharedJob),
    };
    const acks: Ack[] = [];
    const failures: string[] = [];

    const send = async (kind: Ack['kind'], jobId: number, clientId: string, body: object) => {
      const path = kind === 'reading' ? `/api/jobs/${jobId}/readings` : `/api/jobs/${jobId}/notes`;
      const answer = await post(path, { ...body, clientId });
      if (answer.status === 200 || answer.status === 201) {
        acks.push({ kind, clientId, jobId, status: answer.status, id: answer.id });
      } else {
        failures.push(`${kind} ${clientId}: ${answer.status} ${answer.text.slice(0, 200)}`);
      }
    };

    const writer = async (w: number) => {
      // The first half share one job; the others write to a job each.
      const jobId = w < WRITERS / 2 ? sharedJob : ownJobs[w - WRITERS / 2]!;
      for (let round = 0; round < ROUNDS; round += 1) {
        const clientId = randomUUID();
        const body = { quantity: 'pressure', value: `${40 + ((w + round) % 7)}psi` };
        // Every other round the same write goes out twice at once, as a replay racing its original.
        await Promise.all(
          round % 2 === 0
            ? [send('reading', jobId, clientId, body), send('reading', jobId, clientId, body)]
            : [send('reading', jobId, clientId, body)],
        );
        // And every third is sent again afterwards, as a queue does when the first answer was lost.
        if (round % 3 === 0) await send('reading', jobId, clientId, body);
      }
      // One note per writer on the shared job's timeline, raced against its own replay.
      const noteId = randomUUID();
      const note = { note: `Writer ${w} checked the fuel line clamps.` };
      await Promise.all([send('note', sharedJob, noteId, note), send('note', sharedJob, noteId, note)]);
    };

    await Promise.all(Array.from({ length: WRITERS }, (_, w) => writer(w)));
    expect(failures).toEqual([]);

    // Per client id: one 201 (stored), every other answer a 200 naming the same record.
    const byClient = new Map<string, Ack[]>();
    for (const ack of acks) byClient.set(ack.clientId, [...(byClient.get(ack.clientId) ?? []), ack]);
    expect(byClient.size).toBe(WRITERS * ROUNDS + WRITERS);
    for (const [clientId, answers] of byClient) {
      expect(
        answers.filter((a) => a.status === 201),
        clientId,
      ).toHaveLength(1);
      expect(new Set(answers.map((a) => a.id)).size, clientId).toBe(1);
    }

    // In the tables: each acknowledged client id exactly once, under the id it was answered with.
    const readings = await queryRows<{ client_id: string; id: number; n: number }>(
      api.database.db,
      sql`select client_id, min(id)::int as id, count(*)::int as n from readings
          where client_id is not null group by client_id`,
    );
    const notes = await queryRows<{ client_id: string; id: number; n: number }>(
      api.database.db,
      sql`select client_id, min(id)::int as id, count(*)::int as n from job_events
          where client_id is not null group by client_id`,
    );
    const stored = new Map([...readings, ...notes].map((row) => [row.client_id, row]));
    for (const [clientId, answers] of byClient) {
      expect(stored.get(clientId), clientId).toEqual({ client_id: clientId, id: answers[0]!.id, n: 1 });
    }
    // And nothing else landed: the counts moved by exactly the writes made.
    expect(await countOn('readings', sharedJob)).toBe(before.shared + (WRITERS / 2) * ROUNDS);
    for (const [i, job] of ownJobs.entries())
      expect(await countOn('readings', job)).toBe(before.own[i]! + ROUNDS);
    expect(await countOn('job_events', sharedJob)).toBe(before.notes + WRITERS);
  });
});

/**
 * A proxy that decides per request (each chunk opening with an HTTP method starts one): `down`
 * resets the connection at once; `lose` passes the request on and cuts the connection as the
 * answer comes back, so the server has done the work but the client never hears of it.
 */
async function flappingProxy(target: URL) {
  let turn = 0;
  let always: Mode | null = null;
  const counts: Record<Mode, number> = { up: 0, down: 0, lose: 0 };
  const server = net.createServer((client) => {
    let upstream: net.Socket | null = null;
    let mode: Mode = 'up';
    const cut = () => {
      client.destroy();
      upstream?.destroy();
    };
    client.on('error', () => {});
    client.on('data', (chunk) => {
      if (/^(GET|POST|PATCH|PUT|DELETE|HEAD|OPTIONS) /.test(chunk.toString('latin1', 0, 8))) {
        mode = always ?? PATTERN[turn++ % PATTERN.length]!;
        counts[mode] += 1;
      }
      if (mode === 'down') return cut();
      if (!upstream) {
        upstream = net.connect(Number(target.port), target.hostname);
        upstream.on('error', cut);
        upstream.on('close', () => client.destroy());
        upstream.on('data', (answer) => (mode === 'lose' ? cut() : client.write(answer)));
      }
      upstream.write(chunk);
    });
    client.on('close', () => upstream?.destroy());
  });
  server.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as net.AddressInfo).port}`,
    counts,
    /** Stop flapping: every request from now on gets `mode`. */
    settle(mode: Mode) {
      always = mode;
    },
    close: () => new Promise((resolve) => server.close(resolve)),
  };
}

let proxy: Awaited<ReturnType<typeof flappingProxy>> | undefined;
let flapJob: number;

describe('the offline queue under a flapping server', () => {
  it('lands every reading exactly once, whatever the connection did to each request', async () => {
    const flap = await flappingProxy(new URL(api.url));
    proxy = flap;
    const jobId = flapJob;
    const config = mkdtempSync(path.join(tmpdir(), 'vanbay-flap-'));
    const env = { VANBAY_URL: flap.url, XDG_CONFIG_HOME: config, VANBAY_TOKEN: api.tokens.helper };
    const cli = async (...argv: string[]) => {
      const io = fakeDeps(fetch, env);
      const code = await runCli(argv, io.deps);
      process.exitCode = undefined;
      return { code, stdout: io.stdout(), stderr: io.stderr() };
    };
    const count = async () =>
      (
        await queryRows<{ n: number }>(
          api.database.db,
          sql`select count(*)::int as n from readings where job_id = ${jobId}`,
        )
      )[0]!.n;
    const before = await count();

    // Each `reading add` first sends what is queued, then its own reading; either may be hit.
    const clientIds: string[] = [];
    for (let i = 0; i < READINGS; i += 1) {
      const added = await cli('reading', 'add', String(jobId), 'pressure', `${38 + (i % 8)}psi`, '--json');
      expect(added.code, added.stderr).toBe(0);
      const out = JSON.parse(added.stdout) as { queued: boolean; clientId: string };
      clientIds.push(out.clientId);
    }
    // Then syncs, still through the flapping connection, until nothing is left.
    let remaining = listQueue(env).entries.length;
    for (let attempt = 0; remaining > 0 && attempt < 20; attempt += 1) {
      const synced = await cli('sync', '--json');
      expect([0, 1], synced.stderr).toContain(synced.code);
      const result = JSON.parse(synced.stdout) as { remaining: number; rejected: unknown[] };
      expect(result.rejected).toEqual([]);
      remaining = result.remaining;
    }
    expect(remaining).toBe(0);
    // The pattern did all three things to these requests, more than once each.
    expect(flap.counts.down).toBeGreaterThan(2);
    expect(flap.counts.lose).toBeGreaterThan(2);

    flap.settle('up');
    const last = await cli('sync', '--json');
    expect(JSON.parse(last.stdout)).toMatchObject({ sent: 0, remaining: 0, rejected: [] });
    expect(listQueue(env).entries).toEqual([]);
    const rejectedDir = path.join(config, 'vanbay', 'queue', 'rejected');
    expect(existsSync(rejectedDir) ? readdirSync(rejectedDir) : []).toEqual([]);

    // Every reading once, under the client id the CLI gave it; nothing more on the job.
    expect(new Set(clientIds).size).toBe(READINGS);
    const rows = await queryRows<{ client_id: string; n: number }>(
      api.database.db,
      sql`select client_id, count(*)::int as n from readings where job_id = ${jobId} and client_id is not null
          group by client_id`,
    );
    const stored = new Map(rows.map((row) => [row.client_id, row.n]));
    for (const clientId of clientIds) expect(stored.get(clientId), clientId).toBe(1);
    expect(await count()).toBe(before + READINGS);
  });
});
