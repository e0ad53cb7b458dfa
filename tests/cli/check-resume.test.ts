import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Prompter } from '../../cli/lib/deps';
import { runCli } from '../../cli/program';
import { queryRows } from '../../server/db/client';
import { as, listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';

let api: TestApi;
let url: string;
let jobId: number;
beforeAll(async () => {
  const listening = await listeningApi();
  api = listening;
  url = listening.url;
  const rows = await queryRows<{ id: number }>(
    api.database.db,
    sql`select id from jobs where status in ('on_site', 'diagnosing') order by id limit 1`,
  );
  jobId = rows[0]!.id;
});
afterAll(() => api.close());

function scripted(answers: string[]): Prompter {
  const queue = [...answers];
  const next = async ({ message }: { message: string }) => {
    const answer = queue.shift();
    if (answer === undefined) throw new Error(`no scripted answer left for: ${message}`);
    return answer;
  };
  return { input: next, password: next };
}

/** A battery check paused after its first step, saved the way the dashboard or the CLI would. */
async function pausedBatteryRun(): Promise<number> {
  const response = await request(api.app)
    .post(`/api/jobs/${jobId}/checks`)
    .set(as(api, 'helper'))
    .send({
      procedure: 'battery',
      status: 'paused',
      steps: [
        {
          stepKey: 'battery-rest',
          // 12.65 V: a full flooded battery at rest (BCI open-circuit table, REFERENCES.md).
          answer: { batteryType: 'flooded', volts: { value: 12.65, unit: 'V' } },
          cautionAcknowledged: true,
        },
      ],
    })
    .expect(201);
  return response.body.id as number;
}

async function resume(runId: number, answers: string[]) {
  const io = fakeDeps(fetch, {
    VANBAY_URL: url,
    XDG_CONFIG_HOME: mkdtempSync(path.join(tmpdir(), 'vanbay-config-')),
    VANBAY_TOKEN: api.tokens.helper,
  });
  io.deps.interactive = true;
  io.deps.prompt = scripted(answers);
  const code = await runCli(['check', 'resume', String(jobId), String(runId), '--json'], io.deps);
  const stored = await request(api.app)
    .get(`/api/jobs/${jobId}/checks/${runId}`)
    .set(as(api, 'owner'))
    .expect(200);
  return { code, stdout: io.stdout(), stderr: io.stderr(), run: stored.body };
}

describe('vanbay check resume', () => {
  it('carries on from the paused step and the server finishes the run with its own verdicts', async () => {
    const runId = await pausedBatteryRun();
    // Cranking 10.4 V (≥ 10 V; 9.6 V load-test floor, common practice) and charging 14.2 V
    // (inside 13.5–14.5 V, REFERENCES.md "Battery": common practice).
    const result = await resume(runId, ['ok', '10.4', 'ok', '14.2']);
    expect(result.code).toBe(0);
    expect(result.run.status).toBe('finished');
    expect(result.run.steps.map((s: { stepKey: string }) => s.stepKey)).toEqual([
      'battery-rest',
      'cranking-voltage',
      'charging-voltage',
    ]);
    expect(result.run.outcome.verdict).toBe('pass');
  });

  it('takes a stored step back on the server when the mechanic goes back past it', async () => {
    const runId = await pausedBatteryRun();
    // Back to the battery step, answer it again as a low AGM reading, which ends the check there.
    const result = await resume(runId, ['back', 'ok', '2', '11.9']);
    expect(result.run.status).toBe('finished');
    expect(result.run.steps).toHaveLength(1);
    expect(result.run.steps[0].answer).toMatchObject({ batteryType: 'agm', volts: { value: 11.9 } });
    expect(result.code).toBe(1); // a check that says no
  });

  it('pauses again with only the new answers sent', async () => {
    const runId = await pausedBatteryRun();
    const result = await resume(runId, ['ok', '10.4', 'pause']);
    expect(result.run.status).toBe('paused');
    expect(result.run.steps).toHaveLength(2);
  });
});

describe('vanbay check run, saved to a live server', () => {
  it("offers the outcome's suggested lines and adds them for the owner", async () => {
    const io = fakeDeps(fetch, {
      VANBAY_URL: url,
      XDG_CONFIG_HOME: mkdtempSync(path.join(tmpdir(), 'vanbay-config-')),
      VANBAY_TOKEN: api.tokens.owner,
    });
    io.deps.interactive = true;
    // 11.9 V on a flooded battery is about 0–25 % (BCI open-circuit table): the check ends there
    // with the battery finding and its suggested lines.
    io.deps.prompt = scripted(['ok', '1', '11.9', 'y']);
    const code = await runCli(['check', 'run', String(jobId), 'battery', '--json'], io.deps);
    expect(code).toBe(1);
    const { runId } = JSON.parse(io.stdout()) as { runId: number };
    const lines = await request(api.app)
      .get(`/api/jobs/${jobId}/line-items`)
      .set(as(api, 'owner'))
      .expect(200);
    const fromRun = lines.body.items.filter((l: { checkRunId: number | null }) => l.checkRunId === runId);
    expect(fromRun.map((l: { description: string }) => l.description)).toContain('Battery charge and test');
    expect(io.stderr()).toMatch(/enter the parts' prices/);
  });
});
