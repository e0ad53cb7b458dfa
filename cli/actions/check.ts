/**
 * `vanbay check run JOB fuel`: the guided check at the roadside. The shared engine runs right here,
 * so every answer is judged the moment it is typed, with or without signal; the finished (or paused)
 * run is then saved to the server, which walks the same answers again and keeps its own verdicts.
 */
import type { Command } from 'commander';
import { z } from 'zod';
import { cautionText } from '../../shared/procedures/cautions';
import {
  answerStep,
  backStep,
  isFieldShown,
  startRun,
  walkRun,
  type RunState,
  type RunView,
} from '../../shared/procedures/engine';
import { findProcedure, PROCEDURE_KEYS } from '../../shared/procedures/index';
import { parseFieldInput } from '../../shared/procedures/input';
import type { MachineSpec } from '../../shared/procedures/specs';
import type { Field, FieldValue, ProcedureDefinition, StepDefinition } from '../../shared/procedures/types';
import { UNITS } from '../../shared/units';
import { CheckRunSchema } from '../../shared/api/checks';
import { ApiError, createApi, UnreachableError, type Api } from '../lib/api';
import { UsageError, type CliDeps, type Prompter } from '../lib/deps';
import { enqueue, newClientId } from '../lib/queue';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

/** Typed at any prompt: go back one step, or stop and keep the run to finish later. */
const BACK = new Set(['back', '<']);
const PAUSE = new Set(['pause', 'p!']);

class GoBack extends Error {}
class Pause extends Error {}

const JobSchema = z.object({ id: z.number(), machineId: z.number() }).loose();
const MachineSpecSchema = z
  .object({
    fuelPressureMinKpa: z.number().nullish(),
    fuelPressureMaxKpa: z.number().nullish(),
    holdMaxDropKpa: z.number().nullish(),
    holdMinutes: z.number().nullish(),
    flowMinLph: z.number().nullish(),
  })
  .loose();
const SavedRunSchema = z.object({ id: z.number() }).loose();

/** The machine's manual limits when the server can be asked; generic ones (labelled) when not. */
async function machineSpec(api: Api, jobId: number): Promise<{ spec: MachineSpec | null; offline: boolean }> {
  try {
    const job = await api.request('GET', `/api/jobs/${jobId}`, JobSchema);
    const machine = await api.request('GET', `/api/machines/${job.machineId}`, MachineSpecSchema);
    return { spec: machine, offline: false };
  } catch (error) {
    if (error instanceof UnreachableError) return { spec: null, offline: true };
    throw error;
  }
}

function fieldQuestion(field: Field): string {
  if (field.type === 'choice' || field.type === 'choices') {
    const list = field.options.map((o, i) => `${i + 1}) ${o.label}`).join('  ');
    return `${field.label}${field.type === 'choices' ? ' (several: 1,3)' : ''}  ${list}`;
  }
  const unit = UNITS[field.defaultUnit].label;
  if (field.type === 'series') return `${field.label} (seconds:value, in ${unit} unless typed)`;
  if (field.type === 'list') return `${field.label} (one per ${field.itemLabel}, in ${unit} unless typed)`;
  return `${field.label} (${unit} unless typed)`;
}

async function askField(deps: CliDeps, prompt: Prompter, field: Field): Promise<FieldValue | undefined> {
  for (;;) {
    const text = (await prompt.input({ message: fieldQuestion(field) })).trim();
    if (BACK.has(text.toLowerCase())) throw new GoBack();
    if (PAUSE.has(text.toLowerCase())) throw new Pause();
    if (text === '' && (field.optional || field.type === 'choices'))
      return field.type === 'choices' ? [] : undefined;
    const parsed = parseFieldInput(field, text);
    if (parsed.ok) return parsed.value;
    deps.stderr.write(`${theme.fail('✗')} ${parsed.error}\n`);
  }
}

function showStep(deps: CliDeps, step: StepDefinition, number: number) {
  deps.stderr.write(`\n${theme.strong(`${number}. ${step.title}`)}\n${step.prompt}\n`);
}

async function acknowledgeCaution(deps: CliDeps, prompt: Prompter, step: StepDefinition): Promise<void> {
  if (!step.caution) return;
  const caution = cautionText(step.caution);
  deps.stderr.write(
    `${theme.warn(`⚠ ${caution.title}`)}\n${caution.lines.map((l) => `  • ${l}`).join('\n')}\n`,
  );
  for (;;) {
    const text = (await prompt.input({ message: 'Type "ok" once it is safe to go on' })).trim().toLowerCase();
    if (text === 'ok' || text === 'yes' || text === 'y') return;
    if (BACK.has(text)) throw new GoBack();
    if (PAUSE.has(text)) throw new Pause();
  }
}

function showOutcome(deps: CliDeps, view: RunView) {
  const outcome = view.outcome!;
  deps.stderr.write(
    `\n${theme.strong('Findings')}  ${theme[outcome.verdict](outcome.verdict.toUpperCase())}\n`,
  );
  if (outcome.findings.length === 0) deps.stderr.write('  none\n');
  for (const finding of outcome.findings) deps.stderr.write(`  • ${finding.title}: ${finding.detail}\n`);
  if (outcome.diagnosis && outcome.diagnosis.causes.length > 0) {
    deps.stderr.write(`${theme.strong('Probable causes')}\n`);
    // The three most likely are what the mechanic acts on; the rest are in the saved run.
    for (const cause of outcome.diagnosis.causes.slice(0, 3)) {
      deps.stderr.write(
        `  ${cause.likelihood.padEnd(6)} ${cause.title} — ${cause.evidence.filter((e) => !e.startsWith('Against')).join('; ')}\n`,
      );
    }
  }
  deps.stderr.write(`${theme.strong('Next')}: ${outcome.nextAction}\n`);
  if (outcome.lines.length > 0) {
    deps.stderr.write(`${theme.strong('Suggested lines')}\n`);
    for (const line of outcome.lines)
      deps.stderr.write(`  ${line.kind.padEnd(8)} ${line.quantity} × ${line.description}\n`);
  }
  for (const advice of outcome.advice) deps.stderr.write(`${theme.muted(`· ${advice}`)}\n`);
}

/**
 * Offers the outcome's suggested lines for the job: labour at the business's rate, parts to be
 * priced. Only the owner may add lines (prices are theirs); anyone else is told so, not refused.
 */
async function offerSuggestedLines(deps: CliDeps, api: Api, jobId: number, runId: number, view: RunView) {
  if (!view.outcome || view.outcome.lines.length === 0 || !deps.prompt) return;
  const answer = (
    await deps.prompt.input({ message: `Add the suggested lines to job ${jobId}? (y/n)`, default: 'y' })
  )
    .trim()
    .toLowerCase();
  if (answer !== 'y' && answer !== 'yes') return;
  try {
    await api.request('POST', `/api/jobs/${jobId}/checks/${runId}/apply-lines`, z.unknown());
    deps.stderr.write(
      `${theme.pass('added')}: labour at your rate; enter the parts' prices before invoicing\n`,
    );
  } catch (error) {
    if (error instanceof ApiError) deps.stderr.write(`${theme.warn('not added')}: ${error.message}\n`);
    else throw error;
  }
}

/** Walks the procedure with the mechanic; returns the answers and how it ended. */
export async function walkInTerminal(
  deps: CliDeps,
  prompt: Prompter,
  procedure: ProcedureDefinition,
  spec: MachineSpec | null,
  state: RunState = startRun(procedure),
): Promise<{ state: RunState; view: RunView; paused: boolean }> {
  for (;;) {
    const view = walkRun(procedure, state, { spec });
    if (!view.current) return { state, view, paused: false };
    const step = view.current;
    showStep(deps, step, view.steps.length + 1);
    try {
      await acknowledgeCaution(deps, prompt, step);
      const answer: Record<string, FieldValue> = {};
      for (const field of step.fields) {
        if (!isFieldShown(field, answer)) continue;
        const value = await askField(deps, prompt, field);
        if (value !== undefined) answer[field.key] = value;
      }
      const result = answerStep(
        procedure,
        state,
        { stepKey: step.key, answer, cautionAcknowledged: true },
        { spec },
      );
      if (!result.ok) {
        deps.stderr.write(`${theme.fail('✗')} ${result.error}\n`);
        continue;
      }
      state = result.state;
      const judged = result.step.evaluation;
      if (judged)
        deps.stderr.write(`${theme[judged.verdict](judged.verdict.toUpperCase())}  ${judged.reason}\n`);
    } catch (error) {
      if (error instanceof GoBack) {
        state = backStep(state);
        continue;
      }
      if (error instanceof Pause) return { state, view: walkRun(procedure, state, { spec }), paused: true };
      throw error;
    }
  }
}

export async function runCheck(
  deps: CliDeps,
  jobText: string,
  procedureName: string,
  options: z.infer<typeof OptionsSchema>,
) {
  if (!/^\d+$/.test(jobText)) throw new UsageError(`JOB must be a job number, got "${jobText}"`);
  const procedure = findProcedure(procedureName);
  if (!procedure)
    throw new UsageError(
      `unknown check "${procedureName}" (one of fuel, battery, ${PROCEDURE_KEYS.join(', ')})`,
    );
  if (!deps.interactive || !deps.prompt)
    throw new UsageError('a guided check needs a terminal to ask its questions in');
  const jobId = Number(jobText);
  const api = createApi(deps, options.server);
  const { spec, offline } = await machineSpec(api, jobId);
  deps.stderr.write(
    `${theme.strong(procedure.title)} on job ${jobId}${offline ? theme.warn('  (offline: generic limits)') : ''}\n`,
  );
  deps.stderr.write(theme.muted('Type "back" to go back a step, "pause" to stop and finish later.\n'));
  const walked = await walkInTerminal(deps, deps.prompt, procedure, spec);
  if (walked.view.finished) showOutcome(deps, walked.view);
  const clientId = newClientId();
  const body = {
    procedure: procedure.key,
    steps: walked.state.steps,
    status: walked.paused ? 'paused' : 'finished',
  };
  const path = `/api/jobs/${jobId}/checks`;
  try {
    const saved = await api.request('POST', path, SavedRunSchema, { body: { ...body, clientId } });
    await offerSuggestedLines(deps, api, jobId, saved.id, walked.view);
    return { saved: true, queued: false, runId: saved.id, view: walked.view, paused: walked.paused };
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    enqueue(deps.env, {
      clientId,
      server: api.server,
      method: 'POST',
      path,
      body,
      summary: `${procedure.title} on job ${jobId}`,
    });
    deps.stderr.write(`${theme.warn('server unreachable')}: the check is queued; \`vanbay sync\` saves it\n`);
    return { saved: false, queued: true, runId: null, view: walked.view, paused: walked.paused };
  }
}

/**
 * Resumes a run paused in the terminal or the dashboard: its stored answers are walked again here,
 * the mechanic carries on, and only the difference goes back to the server (steps taken back
 * with `back`, new ones answered one by one), each re-judged there.
 */
export async function runResume(
  deps: CliDeps,
  jobText: string,
  runText: string,
  options: z.infer<typeof OptionsSchema>,
) {
  if (!/^\d+$/.test(jobText) || !/^\d+$/.test(runText))
    throw new UsageError('give the job number and the check number');
  if (!deps.interactive || !deps.prompt)
    throw new UsageError('a guided check needs a terminal to ask its questions in');
  const jobId = Number(jobText);
  const api = createApi(deps, options.server);
  const where = `/api/jobs/${jobId}/checks/${runText}`;
  const stored = await api.request('GET', where, CheckRunSchema);
  if (stored.finished) throw new UsageError(`check ${stored.id} is already finished`);
  const procedure = findProcedure(stored.procedureKey);
  if (!procedure)
    throw new UsageError(`check ${stored.id} is a ${stored.procedureKey}, which this CLI does not know`);
  // Judged by the limits the run started with, as the server judges it, not the machine's today.
  const spec = stored.spec;
  const before: RunState = {
    ...startRun(procedure),
    steps: stored.steps.map((s) => ({
      stepKey: s.stepKey,
      answer: s.answer,
      cautionAcknowledged: s.cautionAcknowledged,
    })),
  };
  deps.stderr.write(
    `${theme.strong(procedure.title)} on job ${jobId}: resuming at step ${before.steps.length + 1}\n`,
  );
  const walked = await walkInTerminal(deps, deps.prompt, procedure, spec, before);
  let kept = 0;
  while (
    kept < before.steps.length &&
    kept < walked.state.steps.length &&
    JSON.stringify(before.steps[kept]) === JSON.stringify(walked.state.steps[kept])
  ) {
    kept += 1;
  }
  for (let i = before.steps.length; i > kept; i -= 1) await api.request('POST', `${where}/back`, z.unknown());
  for (const step of walked.state.steps.slice(kept))
    await api.request('POST', `${where}/steps`, z.unknown(), { body: step });
  if (walked.paused) await api.request('POST', `${where}/pause`, z.unknown());
  if (walked.view.finished) showOutcome(deps, walked.view);
  return { runId: stored.id, view: walked.view, paused: walked.paused };
}

export async function checkRunAction(
  deps: CliDeps,
  job: string,
  procedure: string,
  raw: unknown,
  command: Command,
) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runCheck(deps, job, procedure, options);
  const summary = {
    saved: result.saved,
    queued: result.queued,
    runId: result.runId,
    paused: result.paused,
    verdict: result.view.outcome?.verdict ?? result.view.verdict,
    findings: result.view.outcome?.findings.map((f) => f.key) ?? [],
  };
  if (options.json) deps.stdout.write(`${JSON.stringify(summary)}\n`);
  else if (result.saved)
    deps.stdout.write(`${result.paused ? 'paused' : 'saved'} as check ${result.runId}\n`);
  if (result.view.outcome && result.view.outcome.verdict === 'fail') process.exitCode = 1;
}

export async function checkResumeAction(
  deps: CliDeps,
  job: string,
  run: string,
  raw: unknown,
  command: Command,
) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runResume(deps, job, run, options);
  const verdict = result.view.outcome?.verdict ?? result.view.verdict;
  if (options.json)
    deps.stdout.write(`${JSON.stringify({ runId: result.runId, paused: result.paused, verdict })}\n`);
  else deps.stdout.write(`${result.paused ? 'paused' : 'saved'}: check ${result.runId}\n`);
  if (result.view.outcome && result.view.outcome.verdict === 'fail') process.exitCode = 1;
}
