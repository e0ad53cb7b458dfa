import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { walkInTerminal } from '../../cli/actions/check';
import type { Prompter } from '../../cli/lib/deps';
import { listQueue } from '../../cli/lib/queue';
import { runCli } from '../../cli/program';
import { fuelDelivery } from '../../shared/procedures/fuel-delivery';
import { fakeDeps } from '../helpers/cli';

/** A mechanic who types these answers, in order, at whatever is asked; the questions are kept. */
function scripted(answers: string[]): Prompter & { asked: string[] } {
  const queue = [...answers];
  const asked: string[] = [];
  const next = async ({ message }: { message: string }) => {
    asked.push(message);
    const answer = queue.shift();
    if (answer === undefined) throw new Error(`no scripted answer left for: ${message}`);
    return answer;
  };
  return { asked, input: next, password: next };
}

// Generic limits: 39–47 psi band, 3 psi over 5 min, 30 L/h (shared/procedures/specs.ts, common practice).
const CLOGGED_FILTER = [
  '1,2', // symptoms: cuts out under load, stumbles
  'ok', // battery caution
  '1', // flooded
  '12.6', // volts at rest: 12.6 V ≈ 94 % on the BCI table
  '1', // fuel fresh
  '1', // air filter clean
  '1', // no codes
  '1', // compression and spark confirmed
  '1', // prime ran and stopped
  '2.5', // seconds
  'ok', // fuel-pressure caution
  '0:43, 30:42, 120:42, 300:41.8', // hold, psi
  '1', // engine runs with the gauge
  'ok', // running-engine caution
  '42', // idle psi
  '33', // snap psi: under 39
  '36', // held psi
  'ok', // fuel-open caution
  '150mL', // collected
  '30', // seconds: 18 L/h, under 30
  '4', // filters found restricted
];

describe('vanbay check run, walked in the terminal', () => {
  it('walks the fuel check to the restricted-filter finding, cautions acknowledged before each hazardous step', async () => {
    const io = fakeDeps(vi.fn());
    const prompt = scripted(CLOGGED_FILTER);
    const walked = await walkInTerminal(io.deps, prompt, fuelDelivery, null);
    expect(walked.view.finished).toBe(true);
    expect(walked.view.outcome!.findings[0]!.key).toBe('restricted_filter');
    // The caution is acknowledged right before the step's first question, and defers to the manual.
    const holdQuestion = prompt.asked.findIndex((q) => q.startsWith('Pressure over time'));
    expect(prompt.asked[holdQuestion - 1]).toMatch(/safe to go on/);
    const shown = io.stderr();
    expect(shown.indexOf('Fuel under pressure')).toBeLessThan(shown.indexOf('Held:'));
    expect(shown).toMatch(/service manual, local codes and licensed practice/);
    expect(prompt.asked.filter((q) => /safe to go on/.test(q))).toHaveLength(4);
  });

  it('re-asks a value that does not read, and goes back a step on "back"', async () => {
    const io = fakeDeps(vi.fn());
    const answers = [...CLOGGED_FILTER];
    // At the volts question: a typo, then a pressure unit, then the right answer.
    answers.splice(3, 1, '12,6', '12psi', '12.6');
    // After the fuel question: go back and answer it again.
    answers.splice(7, 0, 'back', '1');
    const walked = await walkInTerminal(io.deps, scripted(answers), fuelDelivery, null);
    expect(io.stderr()).toMatch(/write decimals with a point/);
    expect(io.stderr()).toMatch(/expected voltage/);
    expect(walked.view.finished).toBe(true);
    expect(walked.state.steps.map((s) => s.stepKey)).toEqual(walked.view.steps.map((s) => s.stepKey));
  });

  it('pauses with what was answered so far', async () => {
    const io = fakeDeps(vi.fn());
    const walked = await walkInTerminal(
      io.deps,
      scripted(['', 'ok', '1', '12.6', 'pause']),
      fuelDelivery,
      null,
    );
    expect(walked.paused).toBe(true);
    expect(walked.state.steps.map((s) => s.stepKey)).toEqual(['symptoms', 'basics-battery']);
  });

  it('queues the whole run when the server cannot be reached, judged with generic limits', async () => {
    const config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'));
    const io = fakeDeps(
      vi.fn<typeof fetch>(async () => Promise.reject(new Error('connect ECONNREFUSED'))),
      { XDG_CONFIG_HOME: config, VANBAY_URL: 'http://127.0.0.1:9' },
    );
    io.deps.interactive = true;
    io.deps.prompt = scripted(CLOGGED_FILTER);
    const code = await runCli(['check', 'run', '7', 'fuel', '--json'], io.deps);
    expect(code).toBe(1); // the check said no: a restricted filter
    expect(JSON.parse(io.stdout())).toMatchObject({ saved: false, queued: true, verdict: 'fail' });
    const { entries } = listQueue(io.deps.env);
    expect(entries).toHaveLength(1);
    expect(entries[0]!.write).toMatchObject({
      method: 'POST',
      path: '/api/jobs/7/checks',
      body: { procedure: 'fuel-delivery', status: 'finished' },
    });
  });

  it('refuses without a terminal, and an unknown procedure, with exit 2', async () => {
    const io = fakeDeps(vi.fn());
    expect(await runCli(['check', 'run', '7', 'fuel'], io.deps)).toBe(2);
    io.deps.interactive = true;
    io.deps.prompt = scripted([]);
    expect(await runCli(['check', 'run', '7', 'spark'], io.deps)).toBe(2);
    expect(io.stderr()).toMatch(/unknown check "spark"/);
  });
});
