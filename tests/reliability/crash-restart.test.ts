/**
 * The server process killed with SIGKILL in the middle of twenty writers (issue "Proof"), then
 * started again on the same data dir: the database opens, nothing that was acknowledged is lost,
 * the writes cut off in flight land exactly once when sent again with their client ids, and the
 * invoice numbers stay gapless — a numbering transaction cut off by the kill gives its number back.
 * The two processes' output is checked for secrets on the way (issue: "no secret … in any log line").
 */
import { randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { asc, eq, sql } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { fromPglite, queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { DEMO_PASSWORD } from '../../server/db/seed-data';
import { seededDataDir, startServerProcess, type ServerProcess } from './server-process';

const WRITERS = 20;
/** The kill comes once this many writes have been acknowledged, with the rest still in flight. */
const KILL_AFTER_ACKS = 40;
const BILLABLE_JOBS = 16;

const dataDir = mkdtempSync(path.join(tmpdir(), 'vanbay-crash-'));
const running: ServerProcess[] = [];
afterAll(async () => {
  for (const server of running) if (server.child.exitCode === null) server.child.kill('SIGKILL');
  await Promise.allSettled(running.map((server) => server.child));
  rmSync(dataDir, { recursive: true, force: true });
});

/** Complete jobs with a line each, ready to invoice, written before any server runs. */
async function prepare(): Promise<{ businessId: number; billable: number[]; readingJobs: number[] }> {
  const client = await seededDataDir(dataDir);
  const { db } = fromPglite(client);
  const [customer] = await db.select().from(t.customers).where(eq(t.customers.email, 'jules@example.test'));
  const [machine] = await db
    .select()
    .from(t.machines)
    .where(eq(t.machines.customerId, customer!.id))
    .orderBy(asc(t.machines.id))
    .limit(1);
  const jobs = await db
    .insert(t.jobs)
    .values(
      Array.from({ length: BILLABLE_JOBS }, (_, i) => ({
        businessId: customer!.businessId,
        customerId: customer!.id,
        machineId: machine!.id,
        status: 'complete' as const,
        complaint: `Crash drill ${i + 1}: stalls at idle.`,
        completedAt: new Date(),
      })),
    )
    .returning({ id: t.jobs.id });
  await db.insert(t.lineItems).values(
    jobs.map((job) => ({
      businessId: customer!.businessId,
      jobId: job.id,
      kind: 'labour' as const,
      description: 'Idle circuit cleaning',
      quantityMilli: 1000,
      unitPriceCents: 9500,
      taxable: false,
    })),
  );
  const readingJobs = (await db.select({ id: t.jobs.id }).from(t.jobs).orderBy(asc(t.jobs.id)).limit(4)).map(
    (job) => job.id,
  );
  await client.close();
  return { businessId: customer!.businessId, billable: jobs.map((job) => job.id), readingJobs };
}

interface Write {
  kind: 'reading' | 'invoice';
  jobId: number;
  clientId: string;
  body: object;
}

async function send(url: string, token: string, write: Write): Promise<Response> {
  const path = write.kind === 'reading' ? `/api/jobs/${write.jobId}/readings` : '/api/invoices';
  return fetch(`${url}${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify(write.kind === 'reading' ? { ...write.body, clientId: write.clientId } : write.body),
  });
}

async function signIn(url: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'owner@ridgeback.test', password: DEMO_PASSWORD }),
  });
  expect(response.status).toBe(200);
  return ((await response.json()) as { token: string }).token;
}

describe('SIGKILL in the middle of writes', () => {
  it('loses nothing acknowledged, reopens the database, and keeps invoice numbers gapless', async () => {
    const { businessId, billable, readingJobs } = await prepare();
    const first = await startServerProcess(dataDir);
    running.push(first);
    const token = await signIn(first.url);
    const pid = Number(readFileSync(path.join(dataDir, 'server.pid'), 'utf8').trim());
    expect(pid).toBe(first.child.pid);

    const acked: { write: Write; status: number; body: { id: number; number?: number } }[] = [];
    const cutOff: Write[] = [];
    const refused: string[] = [];
    let killed = false;
    let nextBillable = 0;
    const writer = async (w: number) => {
      for (let round = 0; !killed; round += 1) {
        // One writer in four issues invoices; the rest record readings, half of them on one job.
        const write: Write =
          w % 4 === 0 && nextBillable < billable.length
            ? { kind: 'invoice', jobId: billable[nextBillable++]!, clientId: randomUUID(), body: {} }
            : {
                kind: 'reading',
                jobId: readingJobs[w % 2 === 0 ? 0 : 1 + (w % 3)]!,
                clientId: randomUUID(),
                body: { quantity: 'voltage', value: `${12 + (round % 9) / 10}V` },
              };
        if (write.kind === 'invoice') write.body = { jobId: write.jobId };
        try {
          const response = await send(first.url, token, write);
          const body = (await response.json()) as { id: number; number?: number };
          if (response.status === 200 || response.status === 201)
            acked.push({ write, status: response.status, body });
          else refused.push(`${write.kind}: ${response.status} ${JSON.stringify(body)}`);
        } catch {
          // No answer: it may or may not have landed. A client sends it again later.
          cutOff.push(write);
          return;
        }
        if (acked.length >= KILL_AFTER_ACKS && !killed) {
          killed = true;
          process.kill(pid, 'SIGKILL');
        }
      }
    };
    await Promise.all(Array.from({ length: WRITERS }, (_, w) => writer(w)));
    const ended = await first.child;
    expect(ended.signal).toBe('SIGKILL');
    expect(refused).toEqual([]);
    expect(acked.length).toBeGreaterThanOrEqual(KILL_AFTER_ACKS);
    // The kill came with writes still in flight (or this would prove nothing about them).
    expect(cutOff.length).toBeGreaterThan(0);

    // Started again on the same directory: the dead process's lock is taken over, the database
    // recovers and migrates, and the same session key keeps the token valid.
    const second = await startServerProcess(dataDir);
    running.push(second);
    expect((await fetch(`${second.url}/api/health`)).status).toBe(200);

    // What was cut off is sent again, as the CLI's queue would: each lands once.
    for (const write of cutOff) {
      const response = await send(second.url, token, write);
      const body = (await response.json()) as { id: number; number?: number; error?: { code: string } };
      if (write.kind === 'reading') {
        expect([200, 201], JSON.stringify(body)).toContain(response.status);
        acked.push({ write, status: response.status, body });
      } else {
        // Issued before the kill (409: already billed) or rolled back with it (201 now).
        expect([201, 409], JSON.stringify(body)).toContain(response.status);
        if (response.status === 201) acked.push({ write, status: response.status, body });
      }
    }
    // Numbering carries on from where the committed invoices left it.
    const after = await Promise.all(
      billable
        .slice(nextBillable, nextBillable + 3)
        .map((jobId) =>
          send(second.url, token, { kind: 'invoice', jobId, clientId: randomUUID(), body: { jobId } }),
        ),
    );
    for (const response of after) {
      expect(response.status).toBe(201);
      const body = (await response.json()) as { id: number; number: number };
      acked.push({ write: { kind: 'invoice', jobId: 0, clientId: '', body: {} }, status: 201, body });
    }

    second.child.kill('SIGTERM');
    expect((await second.child).exitCode).toBe(0);

    // Straight from the files: every acknowledged write is there exactly once, under its id.
    const client = await PGlite.create({ dataDir: path.join(dataDir, 'pg') });
    const db = fromPglite(client).db;
    const readingRows = await queryRows<{ client_id: string; id: number; n: number }>(
      db,
      sql`select client_id, min(id)::int as id, count(*)::int as n from readings
          where client_id is not null group by client_id`,
    );
    const byClient = new Map(readingRows.map((row) => [row.client_id, row]));
    for (const { write, body } of acked.filter((a) => a.write.kind === 'reading')) {
      expect(byClient.get(write.clientId), write.clientId).toEqual({
        client_id: write.clientId,
        id: body.id,
        n: 1,
      });
    }
    for (const write of cutOff.filter((w) => w.kind === 'reading'))
      expect(byClient.get(write.clientId)?.n, write.clientId).toBe(1);

    const invoices = await queryRows<{ id: number; number: number; job_id: number }>(
      db,
      sql`select id, number, job_id from invoices where business_id = ${businessId} order by number`,
    );
    const numbers = invoices.map((invoice) => invoice.number);
    // Gapless: 1, 2, 3 … with nothing skipped or used twice, and the counter at the last one.
    expect(numbers).toEqual(Array.from({ length: numbers.length }, (_, i) => i + 1));
    const [counter] = await queryRows<{ last_number: number }>(
      db,
      sql`select last_number from invoice_counters where business_id = ${businessId}`,
    );
    expect(counter!.last_number).toBe(numbers.length);
    for (const { body } of acked.filter((a) => a.write.kind === 'invoice')) {
      expect(invoices.find((invoice) => invoice.id === body.id)?.number).toBe(body.number);
    }
    // One invoice per billed job, the kill notwithstanding.
    expect(new Set(invoices.map((invoice) => invoice.job_id)).size).toBe(invoices.length);

    // Neither process printed the session key, a password hash or the token.
    const key = readFileSync(path.join(dataDir, 'session-secret'), 'utf8').trim();
    const hashes = await queryRows<{ hash: string }>(db, sql`select password_hash as hash from users`);
    await client.close();
    const printed = running.map((server) => server.output()).join('\n');
    expect(printed).toMatch(/POST \/api\/jobs\/\d+\/readings 201/);
    expect(printed.includes(key), 'session key').toBe(false);
    expect(printed.includes(token.split('.')[2]!), 'token').toBe(false);
    for (const { hash } of hashes) expect(printed.includes(hash), 'password hash').toBe(false);
  }, 60_000);
});
