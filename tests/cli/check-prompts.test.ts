/**
 * The fuel check at the real prompts: the same @inquirer/prompts the terminal uses, driven through
 * @inquirer/testing's virtual screen (keys typed, the screen read back), saved to a live server.
 */
import { screen } from '@inquirer/testing/vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { terminalPrompter } from '../../cli/lib/terminal-prompter';
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

/** Types `answer` at the prompt on screen once it shows `expected`, and waits for what comes next. */
async function answer(expected: RegExp, text: string) {
  expect(screen.getScreen()).toMatch(expected);
  screen.type(text);
  screen.keypress('enter');
  await screen.next();
}

describe('vanbay check run at the real prompts', () => {
  it('walks the fuel check to its end, re-asking a mistyped value, and the server stores what the terminal showed', async () => {
    const io = fakeDeps(fetch, {
      VANBAY_URL: url,
      XDG_CONFIG_HOME: mkdtempSync(path.join(tmpdir(), 'vanbay-config-')),
      VANBAY_TOKEN: api.tokens.helper,
    });
    io.deps.interactive = true;
    io.deps.prompt = terminalPrompter;
    const done = runCli(['check', 'run', String(jobId), 'fuel', '--json'], io.deps);
    await screen.next();

    // Generic limits (shared/procedures/specs.ts, common practice): 39–47 psi, at most 3 psi lost
    // over 5 minutes, at least 30 L/h. 12.6 V at rest is about 94 % on the BCI open-circuit table.
    await answer(/Symptoms/, '1');
    await answer(/safe to go on/, 'ok');
    await answer(/Battery type/, '1');
    // A comma for the decimal point is refused on screen and asked again.
    await answer(/Resting voltage/, '12,6');
    expect(io.stderr()).toMatch(/write decimals with a point/);
    await answer(/Resting voltage/, '12.6');
    await answer(/Fuel {2}1\) Fresh/, '1');
    await answer(/Air filter/, '1');
    await answer(/Fault codes/, '1');
    await answer(/Compression and spark/, '1');
    await answer(/Pump at key-on/, '1');
    await answer(/how long it ran/i, '2.5');
    await answer(/safe to go on/, 'ok');
    await answer(/pressure over time/i, '0:43, 30:42.5, 120:42.4, 300:42.2');
    await answer(/Engine runs with gauge/, '1');
    await answer(/safe to go on/, 'ok');
    await answer(/At idle/, '42');
    await answer(/throttle snap/, '43');
    await answer(/held throttle/i, '42');
    // Steady running pressure sends the check straight to the filters: no flow test is needed.
    expect(screen.getScreen()).toMatch(/Filters/);
    await answer(/Filters/, '1');
    // The outcome's suggested lines (the diagnosis labour) are offered; declined here.
    expect(screen.getScreen()).toMatch(/Add the suggested lines to job \d+\? \(y\/n\)/);
    screen.type('n');
    screen.keypress('enter');

    expect(await done).toBe(0);
    const saved = JSON.parse(io.stdout());
    expect(saved).toMatchObject({ saved: true, queued: false, paused: false });
    const stored = await request(api.app)
      .get(`/api/jobs/${jobId}/checks/${saved.runId}`)
      .set(as(api, 'owner'))
      .expect(200);
    expect(stored.body.status).toBe('finished');
    // The server re-walks the answers itself: its verdict and findings are what the terminal judged.
    expect(stored.body.outcome.verdict).toBe(saved.verdict);
    expect(stored.body.outcome.findings.map((f: { key: string }) => f.key)).toEqual(saved.findings);
    // Cutting out under load with a pressure that holds and stays up: the pump is suspected of
    // falling short on volume (a warning, not a failure), so no line was added without asking.
    expect(saved.verdict).toBe('warn');
    // 42.5 psi at 30 s down to 42.2 psi by 300 s: 0.3 psi lost, inside the 3 psi allowed.
    const hold = stored.body.steps.find((s: { stepKey: string }) => s.stepKey === 'static-pressure-hold');
    expect(hold.evaluation.verdict).toBe('pass');
    expect(hold.cautionAcknowledged).toBe(true);
    expect(stored.body.steps.map((s: { stepKey: string }) => s.stepKey)).not.toContain('flow-volume');
  });
});
