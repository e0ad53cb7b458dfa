/**
 * A stand-in for the checks API in component tests: it keeps a run's answers and walks them with
 * the shared engine, as the server does, and answers in the wire shape (parsed by the shared
 * schema, so a drift between this fake and the contract fails here first).
 */
import { CheckRunSchema, StepAnswerInputSchema, type CheckRun } from '../../shared/api/checks';
import type { MachineSpec } from '../../shared/procedures/specs';
import { cautionText } from '../../shared/procedures/cautions';
import { answerStep, backStep, startRun, walkRun, type RunState } from '../../shared/procedures/engine';
import type { ProcedureDefinition } from '../../shared/procedures/types';
import type { FakeRoute } from './fake-api';
import { jsonResponse } from './render-app';

const AT = '2026-11-18T15:00:00.000Z';

export interface FakeRun {
  jobId: number;
  runId: number;
  procedure: ProcedureDefinition;
  state: RunState;
  status: CheckRun['status'];
  /** The limits the "server" judges by: the ones the run started with. */
  spec: MachineSpec | null;
}

export function fakeRun(
  procedure: ProcedureDefinition,
  options: {
    jobId?: number;
    runId?: number;
    answers?: { stepKey: string; answer: unknown }[];
    spec?: MachineSpec | null;
  } = {},
): FakeRun {
  let state = startRun(procedure);
  for (const step of options.answers ?? []) {
    const result = answerStep(
      procedure,
      state,
      { ...step, cautionAcknowledged: true },
      { spec: options.spec },
    );
    if (!result.ok) throw new Error(`fake run: ${step.stepKey}: ${result.error}`);
    state = result.state;
  }
  const run: FakeRun = {
    jobId: options.jobId ?? 7,
    runId: options.runId ?? 5,
    procedure,
    state,
    status: 'in_progress',
    spec: options.spec ?? null,
  };
  if (walkRun(procedure, state, { spec: run.spec }).finished) run.status = 'finished';
  return run;
}

/** The run as `GET /api/jobs/:id/checks/:runId` shows it. */
export function presentRun(run: FakeRun): CheckRun {
  const view = walkRun(run.procedure, run.state, { spec: run.spec });
  const current = view.current;
  return CheckRunSchema.parse({
    id: run.runId,
    jobId: run.jobId,
    procedureKey: run.procedure.key,
    procedureVersion: run.procedure.version,
    title: run.procedure.title,
    status: run.status,
    verdict: view.outcome?.verdict ?? null,
    startedAt: AT,
    finishedAt: view.finished ? AT : null,
    clientId: null,
    spec: {
      fuelPressureMinKpa: run.spec?.fuelPressureMinKpa ?? null,
      fuelPressureMaxKpa: run.spec?.fuelPressureMaxKpa ?? null,
      holdMaxDropKpa: run.spec?.holdMaxDropKpa ?? null,
      holdMinutes: run.spec?.holdMinutes ?? null,
      flowMinLph: run.spec?.flowMinLph ?? null,
    },
    steps: view.steps.map((step) => ({
      ...step,
      cautionAcknowledgedAt: step.cautionAcknowledged ? AT : null,
      answeredAt: AT,
    })),
    current: current
      ? {
          key: current.key,
          title: current.title,
          prompt: current.prompt,
          caution: current.caution ? { key: current.caution, ...cautionText(current.caution) } : null,
          fields: current.fields,
        }
      : null,
    finished: view.finished,
    verdictSoFar: view.verdict,
    outcome: view.outcome,
    linesApplied: false,
  });
}

const refuse = (message: string) => jsonResponse(400, { error: { code: 'bad_request', message } });

/** The routes of one run: read it, answer its step, go back, pause. */
export function checkRunRoutes(run: FakeRun): Record<string, FakeRoute> {
  const base = `/api/jobs/${run.jobId}/checks/${run.runId}`;
  return {
    [`GET ${base}`]: () => jsonResponse(200, presentRun(run)),
    [`POST ${base}/steps`]: ({ init }) => {
      const input = StepAnswerInputSchema.parse(JSON.parse(String(init?.body)));
      const result = answerStep(run.procedure, run.state, input, { spec: run.spec });
      if (!result.ok) return refuse(result.error);
      run.state = result.state;
      run.status = result.view.finished ? 'finished' : 'in_progress';
      return jsonResponse(201, presentRun(run));
    },
    [`POST ${base}/back`]: () => {
      run.state = backStep(run.state);
      run.status = 'in_progress';
      return jsonResponse(200, presentRun(run));
    },
    [`POST ${base}/pause`]: () => {
      run.status = 'paused';
      return jsonResponse(200, presentRun(run));
    },
  };
}

/** The job and its machine, as the check page reads them for the limits to judge by while typing. */
export function jobWithMachine(
  jobId: number,
  spec: MachineSpec = {},
  status = 'diagnosing',
): Record<string, FakeRoute> {
  return {
    [`GET /api/jobs/${jobId}`]: () =>
      jsonResponse(200, {
        id: jobId,
        status,
        machineId: 3,
        customerName: 'Imani Castellanos',
        machineName: '2020 Kestrel Skimmer 1500',
      }),
    'GET /api/machines/3': () =>
      jsonResponse(200, {
        fuelPressureMinKpa: spec.fuelPressureMinKpa ?? null,
        fuelPressureMaxKpa: spec.fuelPressureMaxKpa ?? null,
        holdMaxDropKpa: spec.holdMaxDropKpa ?? null,
        holdMinutes: spec.holdMinutes ?? null,
        flowMinLph: spec.flowMinLph ?? null,
      }),
  };
}
