/**
 * Guided-check runs on a job. The stored answers are the run: every verdict, reason, finding and
 * the next step are what the shared engine derives from them on the server, never what a client
 * sent, and each write re-walks the whole run before anything is stored.
 */
import { and, desc, eq, lt } from 'drizzle-orm';
import {
  CheckRunSchema,
  type AnswerCheckStepInput,
  type CheckRun,
  type CheckRunListQuery,
  type CheckRunSummary,
  type CreateCheckRunInput,
} from '../../shared/api/checks';
import type { ListResponse } from '../../shared/api/common';
import { cautionText } from '../../shared/procedures/cautions';
import {
  answerStep,
  EngineError,
  startRun,
  walkRun,
  type RunState,
  type RunView,
} from '../../shared/procedures/engine';
import { findProcedure } from '../../shared/procedures/index';
import type { MachineSpec } from '../../shared/procedures/specs';
import { stepReadings as sharedStepReadings } from '../../shared/procedures/readings';
import type { ProcedureDefinition, StepAnswer, StepDefinition } from '../../shared/procedures/types';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { decodeCursor, toPage } from '../http/pagination';
import { found, iso } from './scope';
import { jobInScope, type JobInScope, type Reader } from './readings';

export type RunRow = typeof t.checkRuns.$inferSelect;
type StepRow = typeof t.checkSteps.$inferSelect;
type Writer = Pick<Db, 'select' | 'insert' | 'update' | 'delete'>;

/** The procedure a stored run was walked with; a run of an unknown key is a broken record. */
function procedureOf(run: Pick<RunRow, 'procedureKey'>): ProcedureDefinition {
  const procedure = findProcedure(run.procedureKey);
  if (!procedure) throw new Error(`check run uses unknown procedure ${run.procedureKey}`);
  return procedure;
}

/**
 * The engine's state from stored steps. An acknowledgement counts only on a step with a caution,
 * as `answerStep` records it, so the walk of a stored run and the walk that stored it agree.
 */
function stateOf(procedure: ProcedureDefinition, run: RunRow, steps: readonly StepRow[]): RunState {
  return {
    procedureKey: run.procedureKey,
    procedureVersion: run.procedureVersion,
    steps: steps.map((s) => ({
      stepKey: s.stepKey,
      answer: s.answer,
      cautionAcknowledged: procedure.steps[s.stepKey]?.caution ? s.cautionAcknowledgedAt !== null : undefined,
    })),
  };
}

export async function runSteps(db: Reader, run: RunRow): Promise<StepRow[]> {
  return db
    .select()
    .from(t.checkSteps)
    .where(and(eq(t.checkSteps.businessId, run.businessId), eq(t.checkSteps.checkRunId, run.id)))
    .orderBy(t.checkSteps.seq);
}

/** The limits a run is judged by: those it started with, or the machine's for a run from before. */
function specOf(run: RunRow, job: JobInScope): MachineSpec {
  return (run.spec as MachineSpec | null) ?? job.spec;
}

/** Walks a stored run again, as every read and write of it does. */
export async function walkStoredRun(db: Reader, job: JobInScope, run: RunRow) {
  const procedure = procedureOf(run);
  const steps = await runSteps(db, run);
  const view = walkRun(procedure, stateOf(procedure, run, steps), { spec: specOf(run, job) });
  return { procedure, steps, view };
}

/** The run of this job, locked for the rest of the transaction when `lock` is set. */
export async function runOfJob(db: Reader, job: JobInScope, runId: number, lock = false): Promise<RunRow> {
  const query = db
    .select()
    .from(t.checkRuns)
    .where(
      and(
        eq(t.checkRuns.businessId, job.businessId),
        eq(t.checkRuns.jobId, job.id),
        eq(t.checkRuns.id, runId),
      ),
    );
  const [row] = lock ? await query.for('update') : await query;
  return found(row, 'check run');
}

function toSummary(run: RunRow): CheckRunSummary {
  return {
    id: run.id,
    jobId: run.jobId,
    procedureKey: run.procedureKey,
    procedureVersion: run.procedureVersion,
    title: findProcedure(run.procedureKey)?.title ?? run.procedureKey,
    status: run.status,
    verdict: run.verdict,
    startedAt: run.startedAt.toISOString(),
    finishedAt: iso(run.finishedAt),
    clientId: run.clientId,
  };
}

function currentStep(step: StepDefinition | null) {
  if (!step) return null;
  return {
    key: step.key,
    title: step.title,
    prompt: step.prompt,
    caution: step.caution ? { key: step.caution, ...cautionText(step.caution) } : null,
    fields: step.fields,
  };
}

async function linesApplied(db: Reader, run: RunRow): Promise<boolean> {
  const [line] = await db
    .select({ id: t.lineItems.id })
    .from(t.lineItems)
    .where(and(eq(t.lineItems.businessId, run.businessId), eq(t.lineItems.checkRunId, run.id)))
    .limit(1);
  return line !== undefined;
}

/** A run as the API shows it: the stored record and everything the walk derives from it. */
async function presentRun(db: Reader, job: JobInScope, run: RunRow): Promise<CheckRun> {
  const { steps, view } = await walkStoredRun(db, job, run);
  // Parsed with the wire schema: the engine's readonly data becomes the plain JSON it promises.
  const spec = specOf(run, job);
  return CheckRunSchema.parse({
    ...toSummary(run),
    spec: {
      fuelPressureMinKpa: spec.fuelPressureMinKpa ?? null,
      fuelPressureMaxKpa: spec.fuelPressureMaxKpa ?? null,
      holdMaxDropKpa: spec.holdMaxDropKpa ?? null,
      holdMinutes: spec.holdMinutes ?? null,
      flowMinLph: spec.flowMinLph ?? null,
    },
    steps: view.steps.map((step, i) => ({
      ...step,
      cautionAcknowledgedAt: iso(steps[i]!.cautionAcknowledgedAt),
      answeredAt: steps[i]!.answeredAt.toISOString(),
    })),
    current: currentStep(view.current),
    finished: view.finished,
    verdictSoFar: view.verdict,
    outcome: view.outcome,
    linesApplied: await linesApplied(db, run),
  });
}

/**
 * The readings a step's answer holds, one per measurement, series point and list value, in the
 * canonical unit. A series is read at the end of its window, so each point is dated back from
 * `now` by its distance from the last point.
 */
function readingsAt(step: StepDefinition, answer: StepAnswer, now: Date) {
  return sharedStepReadings(step, answer).map(({ offsetSec, ...reading }) => ({
    ...reading,
    takenAt: new Date(now.getTime() - offsetSec * 1000),
  }));
}

/** Stores one walked step and its readings. */
async function storeStep(
  tx: Writer,
  context: { job: JobInScope; run: RunRow; procedure: ProcedureDefinition; actor: Actor; now: Date },
  step: RunView['steps'][number],
) {
  const { job, run, procedure, actor, now } = context;
  const definition = procedure.steps[step.stepKey]!;
  await tx.insert(t.checkSteps).values({
    businessId: job.businessId,
    checkRunId: run.id,
    seq: step.seq,
    stepKey: step.stepKey,
    answer: step.answer,
    verdict: step.evaluation?.verdict ?? null,
    reason: step.evaluation?.reason ?? null,
    figures: step.evaluation?.figures ?? null,
    cautionAcknowledgedAt: definition.caution ? now : null,
    answeredAt: now,
  });
  const readings = readingsAt(definition, step.answer, now);
  if (readings.length === 0) return;
  await tx.insert(t.readings).values(
    readings.map((reading) => ({
      ...reading,
      businessId: job.businessId,
      jobId: job.id,
      checkRunId: run.id,
      stepKey: step.stepKey,
      createdBy: actor.userId,
      createdAt: now,
    })),
  );
}

/** What the run row records of a walk: finished with its verdict and outcome, or not yet. */
function runColumns(view: RunView, now: Date, status: 'in_progress' | 'paused' = 'in_progress') {
  return view.finished
    ? { status: 'finished' as const, verdict: view.outcome!.verdict, findings: view.outcome, finishedAt: now }
    : { status, verdict: null, findings: null, finishedAt: null };
}

export async function listCheckRuns(
  db: Db,
  actor: Actor,
  jobId: number,
  query: CheckRunListQuery,
): Promise<ListResponse<CheckRunSummary>> {
  const job = await jobInScope(db, actor, jobId);
  const after = decodeCursor(query.cursor);
  const rows = await db
    .select()
    .from(t.checkRuns)
    .where(
      and(
        eq(t.checkRuns.businessId, job.businessId),
        eq(t.checkRuns.jobId, job.id),
        query.status ? eq(t.checkRuns.status, query.status) : undefined,
        after ? lt(t.checkRuns.id, after) : undefined,
      ),
    )
    .orderBy(desc(t.checkRuns.id))
    .limit(query.limit + 1);
  return toPage(rows, query.limit, toSummary);
}

export async function getCheckRun(db: Db, actor: Actor, jobId: number, runId: number): Promise<CheckRun> {
  const job = await jobInScope(db, actor, jobId);
  return presentRun(db, job, await runOfJob(db, job, runId));
}

/** The engine's refusal of a whole run, as the 400 the client must see. */
function walkOrRefuse(procedure: ProcedureDefinition, state: RunState, job: JobInScope): RunView {
  try {
    return walkRun(procedure, state, { spec: job.spec });
  } catch (error) {
    // An evaluator refusing impossible numbers (a flow timed over 0 s) is bad input too.
    if (error instanceof EngineError || error instanceof RangeError) throw new BadRequestError(error.message);
    throw error;
  }
}

async function runByClientId(db: Reader, businessId: number, clientId: string) {
  const [row] = await db
    .select()
    .from(t.checkRuns)
    .where(and(eq(t.checkRuns.businessId, businessId), eq(t.checkRuns.clientId, clientId)));
  return row;
}

async function replayedRun(db: Reader, job: JobInScope, run: RunRow) {
  if (run.jobId !== job.id)
    throw new ConflictError(`clientId ${run.clientId} was already used for a check run on job ${run.jobId}`);
  return { run: await presentRun(db, job, run), created: false };
}

/**
 * Starts a run, or saves a whole run walked offline: the steps are walked here and refused with
 * the engine's message when they do not fit. A repeat of a `clientId` returns the stored run.
 */
export async function createCheckRun(
  db: Db,
  actor: Actor,
  jobId: number,
  input: CreateCheckRunInput,
  now: Date,
): Promise<{ run: CheckRun; created: boolean }> {
  const job = await jobInScope(db, actor, jobId);
  if (input.clientId) {
    const existing = await runByClientId(db, job.businessId, input.clientId);
    if (existing) return replayedRun(db, job, existing);
  }
  const procedure = findProcedure(input.procedure)!;
  const view = walkOrRefuse(procedure, { ...startRun(procedure), steps: input.steps ?? [] }, job);
  if (view.finished && input.status === 'paused')
    throw new BadRequestError('These steps finish the check: it cannot be saved paused.');
  if (!view.finished && input.status === 'finished')
    throw new BadRequestError(`The check is not finished: the next step is ${view.current!.key}.`);

  const stored = await db.transaction(async (tx) => {
    const [run] = await tx
      .insert(t.checkRuns)
      .values({
        businessId: job.businessId,
        jobId: job.id,
        procedureKey: procedure.key,
        procedureVersion: procedure.version,
        ...runColumns(view, now, input.status === 'paused' ? 'paused' : 'in_progress'),
        startedAt: now,
        spec: job.spec,
        clientId: input.clientId ?? null,
        createdBy: actor.userId,
        createdAt: now,
      })
      .onConflictDoNothing({ target: [t.checkRuns.businessId, t.checkRuns.clientId] })
      .returning();
    if (!run) return null;
    for (const step of view.steps) await storeStep(tx, { job, run, procedure, actor, now }, step);
    return run;
  });
  if (!stored) {
    // The same clientId landed from a concurrent replay between the look-up and the insert.
    return replayedRun(db, job, (await runByClientId(db, job.businessId, input.clientId!))!);
  }
  return { run: await presentRun(db, job, stored), created: true };
}

function refuseClosed(run: RunRow, what: string) {
  if (run.status === 'finished')
    throw new ConflictError(`Check run ${run.id} is finished: start a new run to ${what}.`);
  if (run.status === 'abandoned') throw new ConflictError(`Check run ${run.id} was abandoned.`);
}

/**
 * Answers the run's current step. A refused answer is a 400 with the engine's one line and
 * nothing stored; answering a paused run resumes it.
 */
export async function answerCheckStep(
  db: Db,
  actor: Actor,
  jobId: number,
  runId: number,
  input: AnswerCheckStepInput,
  now: Date,
): Promise<CheckRun> {
  const job = await jobInScope(db, actor, jobId);
  const run = await db.transaction(async (tx) => {
    const run = await runOfJob(tx, job, runId, true);
    refuseClosed(run, 'test again');
    const procedure = procedureOf(run);
    const steps = await runSteps(tx, run);
    const result = answerStep(procedure, stateOf(procedure, run, steps), input, { spec: specOf(run, job) });
    if (!result.ok) throw new BadRequestError(result.error);
    await storeStep(tx, { job, run, procedure, actor, now }, result.step);
    const [updated] = await tx
      .update(t.checkRuns)
      .set(runColumns(result.view, now))
      .where(eq(t.checkRuns.id, run.id))
      .returning();
    return updated!;
  });
  return presentRun(db, job, run);
}

/** Drops the last answer and the readings it recorded; a finished run keeps its record. */
export async function backCheckStep(db: Db, actor: Actor, jobId: number, runId: number): Promise<CheckRun> {
  const job = await jobInScope(db, actor, jobId);
  const run = await db.transaction(async (tx) => {
    const run = await runOfJob(tx, job, runId, true);
    refuseClosed(run, 'change an answer');
    const steps = await runSteps(tx, run);
    const last = steps.at(-1);
    if (!last) throw new ConflictError(`Check run ${run.id} has no answered step to go back from.`);
    // Procedures never revisit a step, so a run's readings of this step key are this step's.
    await tx
      .delete(t.readings)
      .where(and(eq(t.readings.checkRunId, run.id), eq(t.readings.stepKey, last.stepKey)));
    await tx.delete(t.checkSteps).where(eq(t.checkSteps.id, last.id));
    const [updated] = await tx
      .update(t.checkRuns)
      .set({ status: 'in_progress', verdict: null, findings: null, finishedAt: null })
      .where(eq(t.checkRuns.id, run.id))
      .returning();
    return updated!;
  });
  return presentRun(db, job, run);
}

/** Puts a run aside to resume later; pausing a paused run changes nothing. */
export async function pauseCheckRun(db: Db, actor: Actor, jobId: number, runId: number): Promise<CheckRun> {
  const job = await jobInScope(db, actor, jobId);
  const run = await db.transaction(async (tx) => {
    const run = await runOfJob(tx, job, runId, true);
    refuseClosed(run, 'test again');
    const [updated] = await tx
      .update(t.checkRuns)
      .set({ status: 'paused' })
      .where(eq(t.checkRuns.id, run.id))
      .returning();
    return updated!;
  });
  return presentRun(db, job, run);
}
