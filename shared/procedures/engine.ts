/**
 * The guided-check engine: a pure state machine over a procedure's data. A run's state is only
 * the answers given, in order; everything else (the current step, each verdict, the findings) is
 * derived by walking them again. So a terminal, a web form and the server's re-check all drive
 * the same function, "back" is dropping the last answer, a paused run resumes from its answers,
 * and a finished run re-evaluates to the same result.
 */
import type { Verdict } from '../api/readings';
import { diagnoseLeanRunning, LEAN_SYMPTOMS } from '../evaluators/lean-running';
import type { FilterState, LeanRunningDiagnosis, LeanSymptom } from '../evaluators/lean-running';
import { worstVerdict, type Evaluation } from '../evaluators/types';
import { UNITS, type UnitId } from '../units';
import { DIMENSION_OF } from '../units';
import { resolveSpec, type ResolvedSpec, type RunContext } from './specs';
import { STEP_EVALUATORS, type EvaluatedAnswer } from './step-evaluators';
import {
  FINISH,
  type Condition,
  type Field,
  type FieldValue,
  type FindingDefinition,
  type ProcedureDefinition,
  type StepAnswer,
  type StepDefinition,
  type SuggestedLine,
} from './types';

export interface RecordedStep {
  stepKey: string;
  /** As stored or sent: checked against the step's fields on every walk, never trusted. */
  answer: unknown;
  cautionAcknowledged?: boolean;
}

export interface RunState {
  procedureKey: string;
  procedureVersion: number;
  steps: RecordedStep[];
}

export interface EvaluatedStep {
  seq: number;
  stepKey: string;
  title: string;
  answer: StepAnswer;
  cautionAcknowledged: boolean;
  evaluation: Evaluation | null;
  findings: string[];
}

export interface FindingView extends FindingDefinition {
  stepKey: string | null;
  verdict: Verdict;
}

export interface RunOutcome {
  verdict: Verdict;
  findings: FindingView[];
  diagnosis: LeanRunningDiagnosis | null;
  nextAction: string;
  lines: SuggestedLine[];
  advice: readonly string[];
}

export interface RunView {
  procedureKey: string;
  procedureVersion: number;
  steps: EvaluatedStep[];
  /** The step to answer next; null once finished. */
  current: StepDefinition | null;
  finished: boolean;
  /** The worst verdict so far (null before any judged step). */
  verdict: Verdict | null;
  outcome: RunOutcome | null;
}

/** A recorded run that does not fit its procedure: tampered, or from another version. */
export class EngineError extends Error {
  override name = 'EngineError';
}

/** Bounds what any single answer may hold, so a run stays small enough to store and re-walk. */
const MAX_SERIES_POINTS = 240;
const MAX_MAGNITUDE = 1_000_000;

export function startRun(procedure: ProcedureDefinition): RunState {
  return { procedureKey: procedure.key, procedureVersion: procedure.version, steps: [] };
}

/** Drops the last answer: the mechanic goes back one step. */
export function backStep(state: RunState): RunState {
  return { ...state, steps: state.steps.slice(0, -1) };
}

export function isFieldShown(field: Field, answer: Record<string, unknown>): boolean {
  if (!field.showWhen) return true;
  const other = answer[field.showWhen.field];
  return typeof other === 'string' && field.showWhen.in.includes(other);
}

type Check<T> = { ok: true; value: T } | { ok: false; error: string };
const fail = (error: string): { ok: false; error: string } => ({ ok: false, error });

const isRecord = (value: unknown): value is Record<string, unknown> =>
  typeof value === 'object' && value !== null && !Array.isArray(value);
const isNumber = (value: unknown): value is number =>
  typeof value === 'number' && Number.isFinite(value) && Math.abs(value) <= MAX_MAGNITUDE;

function checkUnit(field: Field & { quantity: keyof typeof DIMENSION_OF }, unit: unknown): Check<UnitId> {
  if (typeof unit !== 'string' || !(unit in UNITS))
    return fail(`${field.label}: unknown unit ${String(unit)}`);
  const id = unit as UnitId;
  if (UNITS[id].dimension !== DIMENSION_OF[field.quantity]) {
    return fail(`${field.label}: ${unit} is not a unit of ${DIMENSION_OF[field.quantity]}`);
  }
  return { ok: true, value: id };
}

/** Temperatures may be below zero; every other reading a check asks for is a magnitude. */
const mayBeNegative = (field: { quantity: string }) => field.quantity === 'temperature';

function checkField(
  field: Field,
  raw: unknown,
  earlier: ReadonlyMap<string, EvaluatedAnswer>,
): Check<FieldValue> {
  switch (field.type) {
    case 'measurement': {
      if (!isRecord(raw) || !isNumber(raw.value)) return fail(`${field.label}: give a number with its unit`);
      const unit = checkUnit(field, raw.unit);
      if (!unit.ok) return unit;
      if (raw.value < 0 && !mayBeNegative(field)) return fail(`${field.label}: cannot be negative`);
      return { ok: true, value: { value: raw.value, unit: unit.value } };
    }
    case 'choice': {
      if (typeof raw !== 'string' || !field.options.some((o) => o.value === raw)) {
        return fail(`${field.label}: choose one of ${field.options.map((o) => o.value).join(', ')}`);
      }
      return { ok: true, value: raw };
    }
    case 'choices': {
      if (
        !Array.isArray(raw) ||
        raw.some((v) => typeof v !== 'string' || !field.options.some((o) => o.value === v))
      ) {
        return fail(`${field.label}: choose from ${field.options.map((o) => o.value).join(', ')}`);
      }
      return { ok: true, value: [...new Set(raw as string[])] };
    }
    case 'series': {
      if (!isRecord(raw) || !Array.isArray(raw.points))
        return fail(`${field.label}: give points of seconds and value`);
      const unit = checkUnit(field, raw.unit);
      if (!unit.ok) return unit;
      const points = raw.points as unknown[];
      if (points.length < field.minPoints) return fail(`${field.label}: at least ${field.minPoints} points`);
      if (points.length > MAX_SERIES_POINTS)
        return fail(`${field.label}: at most ${MAX_SERIES_POINTS} points`);
      const parsed: { sec: number; value: number }[] = [];
      for (const point of points) {
        if (
          !isRecord(point) ||
          !isNumber(point.sec) ||
          !isNumber(point.value) ||
          point.sec < 0 ||
          point.value < 0
        ) {
          return fail(`${field.label}: each point needs seconds ≥ 0 and a value ≥ 0`);
        }
        parsed.push({ sec: point.sec, value: point.value });
      }
      if (new Set(parsed.map((p) => p.sec)).size !== parsed.length)
        return fail(`${field.label}: a time appears twice`);
      return { ok: true, value: { unit: unit.value, points: parsed.sort((a, b) => a.sec - b.sec) } };
    }
    case 'list': {
      if (!isRecord(raw) || !Array.isArray(raw.values))
        return fail(`${field.label}: give one value per ${field.itemLabel}`);
      const unit = checkUnit(field, raw.unit);
      if (!unit.ok) return unit;
      const values = raw.values as unknown[];
      if (values.some((v) => !isNumber(v) || v <= 0))
        return fail(`${field.label}: each value must be above zero`);
      const previous = field.sameCountAs ? earlier.get(field.sameCountAs)?.answer[field.key] : undefined;
      const count = isRecord(previous) && Array.isArray(previous.values) ? previous.values.length : null;
      if (count !== null && values.length !== count)
        return fail(`${field.label}: give ${count} values, as before`);
      if (values.length < field.minItems || values.length > field.maxItems) {
        return fail(`${field.label}: between ${field.minItems} and ${field.maxItems} values`);
      }
      return { ok: true, value: { unit: unit.value, values: values as number[] } };
    }
  }
}

/**
 * Checks an answer against the step's fields: unknown keys are refused, hidden fields dropped,
 * required ones demanded, and every value of the right kind and unit.
 */
export function validateAnswer(
  step: StepDefinition,
  raw: unknown,
  earlier: ReadonlyMap<string, EvaluatedAnswer> = new Map(),
): Check<StepAnswer> {
  if (!isRecord(raw)) return fail('the answer must be an object of field values');
  const known = new Set(step.fields.map((f) => f.key));
  const unknown = Object.keys(raw).filter((key) => !known.has(key));
  if (unknown.length > 0) return fail(`${step.title}: unknown field ${unknown.join(', ')}`);
  const answer: StepAnswer = {};
  for (const field of step.fields) {
    if (!isFieldShown(field, raw)) continue;
    const value = raw[field.key];
    if (value === undefined || value === null) {
      if (field.optional) continue;
      return fail(`${field.label} is required`);
    }
    const checked = checkField(field, value, earlier);
    if (!checked.ok) return checked;
    answer[field.key] = checked.value;
  }
  return { ok: true, value: answer };
}

function holds(condition: Condition | undefined, answer: StepAnswer, evaluation: Evaluation | null): boolean {
  if (!condition) return true;
  if (condition.verdict && (!evaluation || !condition.verdict.includes(evaluation.verdict))) return false;
  if (condition.field) {
    const value = answer[condition.field.key];
    const values = Array.isArray(value) ? value : [value];
    if (!values.some((v) => typeof v === 'string' && condition.field!.in.includes(v))) return false;
  }
  if (condition.figure) {
    const value = evaluation?.figures[condition.figure.key];
    if (value === undefined || Array.isArray(value) || !condition.figure.in.includes(value as string))
      return false;
  }
  if (condition.nonEmpty) {
    const value = evaluation?.figures[condition.nonEmpty];
    if (!Array.isArray(value) || value.length === 0) return false;
  }
  return true;
}

function evaluateStep(
  step: StepDefinition,
  answer: StepAnswer,
  spec: ResolvedSpec,
  earlier: ReadonlyMap<string, EvaluatedAnswer>,
): Evaluation | null {
  if (!step.evaluator) return null;
  const evaluator = STEP_EVALUATORS[step.evaluator];
  if (!evaluator) throw new EngineError(`step ${step.key} names an unknown evaluator ${step.evaluator}`);
  return evaluator(answer, { spec, earlier }, step);
}

function nextStepKey(step: StepDefinition, answer: StepAnswer, evaluation: Evaluation | null): string {
  const branch = step.next.find((b) => holds(b.when, answer, evaluation));
  if (!branch) throw new EngineError(`step ${step.key} has no branch for this answer`);
  return branch.goto;
}

function stepOf(procedure: ProcedureDefinition, key: string): StepDefinition {
  const step = procedure.steps[key];
  if (!step) throw new EngineError(`${procedure.key} has no step ${key}`);
  return step;
}

/** Walks the recorded answers through the procedure and derives everything from them. */
export function walkRun(procedure: ProcedureDefinition, state: RunState, context: RunContext = {}): RunView {
  if (state.procedureKey !== procedure.key || state.procedureVersion !== procedure.version) {
    throw new EngineError(
      `run is for ${state.procedureKey} v${state.procedureVersion}, not ${procedure.key} v${procedure.version}`,
    );
  }
  const spec = resolveSpec(context.spec);
  const earlier = new Map<string, EvaluatedAnswer>();
  const steps: EvaluatedStep[] = [];
  let nextKey = procedure.start;
  for (const [seq, recorded] of state.steps.entries()) {
    if (nextKey === FINISH)
      throw new EngineError(`the run finished before step ${seq + 1} (${recorded.stepKey})`);
    if (recorded.stepKey !== nextKey) {
      throw new EngineError(`step ${seq + 1} is ${recorded.stepKey} where ${nextKey} was expected`);
    }
    const step = stepOf(procedure, nextKey);
    const checked = validateAnswer(step, recorded.answer, earlier);
    if (!checked.ok) throw new EngineError(`step ${seq + 1}: ${checked.error}`);
    if (step.caution && !recorded.cautionAcknowledged) {
      throw new EngineError(`step ${seq + 1} (${step.key}) was answered without acknowledging its caution`);
    }
    const evaluation = evaluateStep(step, checked.value, spec, earlier);
    const findings = (step.findings ?? [])
      .filter((f) => holds(f.when, checked.value, evaluation))
      .map((f) => f.finding);
    steps.push({
      seq,
      stepKey: step.key,
      title: step.title,
      answer: checked.value,
      cautionAcknowledged: Boolean(recorded.cautionAcknowledged),
      evaluation,
      findings,
    });
    earlier.set(step.key, { answer: checked.value, evaluation });
    nextKey = nextStepKey(step, checked.value, evaluation);
  }
  const finished = nextKey === FINISH;
  const judged = steps.flatMap((s) => (s.evaluation ? [s.evaluation.verdict] : []));
  return {
    procedureKey: procedure.key,
    procedureVersion: procedure.version,
    steps,
    current: finished ? null : stepOf(procedure, nextKey),
    finished,
    verdict: judged.length > 0 ? worstVerdict(judged) : null,
    outcome: finished ? summarise(procedure, steps) : null,
  };
}

export type AnswerResult =
  { ok: true; state: RunState; view: RunView; step: EvaluatedStep } | { ok: false; error: string };

/**
 * Gives the answer to the current step. Refused, with a one-line reason and the state unchanged,
 * when it is not the current step, its caution was not acknowledged, or the answer does not fit.
 */
export function answerStep(
  procedure: ProcedureDefinition,
  state: RunState,
  input: { stepKey: string; answer: unknown; cautionAcknowledged?: boolean },
  context: RunContext = {},
): AnswerResult {
  const view = walkRun(procedure, state, context);
  if (!view.current) return fail('the check is already finished');
  const step = view.current;
  if (input.stepKey !== step.key) return fail(`the current step is ${step.key}, not ${input.stepKey}`);
  if (step.caution && !input.cautionAcknowledged) return fail(`acknowledge the caution before ${step.title}`);
  const earlier = new Map(view.steps.map((s) => [s.stepKey, { answer: s.answer, evaluation: s.evaluation }]));
  const checked = validateAnswer(step, input.answer, earlier);
  if (!checked.ok) return checked;
  const recorded: RecordedStep = { stepKey: step.key, answer: checked.value };
  if (step.caution) recorded.cautionAcknowledged = true;
  const next: RunState = { ...state, steps: [...state.steps, recorded] };
  let nextView: RunView;
  try {
    nextView = walkRun(procedure, next, context);
  } catch (error) {
    // An evaluator refusing impossible numbers (a prime run of 0 s that "ran") is bad input.
    if (error instanceof RangeError) return fail(`${step.title}: ${error.message}`);
    throw error;
  }
  return { ok: true, state: next, view: nextView, step: nextView.steps[nextView.steps.length - 1]! };
}

function leanInput(steps: readonly EvaluatedStep[]) {
  const byKey = new Map(steps.map((s) => [s.stepKey, s]));
  const judged = (key: string) => byKey.get(key)?.evaluation ?? undefined;
  const symptoms = (byKey.get('symptoms')?.answer.symptoms ?? []) as string[];
  const filters = byKey.get('filters')?.answer.filters as FilterState | undefined;
  return {
    symptoms: symptoms.filter((s): s is LeanSymptom => (LEAN_SYMPTOMS as readonly string[]).includes(s)),
    runningPressure: judged('running-pressure'),
    hold: judged('static-pressure-hold'),
    flow: judged('flow-volume'),
    pumpVoltage: judged('pump-connector-voltage'),
    supplyDrop: judged('supply-voltage-drop'),
    filters,
  };
}

function summarise(procedure: ProcedureDefinition, steps: readonly EvaluatedStep[]): RunOutcome {
  const findings: FindingView[] = [];
  const seen = new Set<string>();
  const add = (key: string, stepKey: string | null, verdict: Verdict) => {
    const definition = procedure.findings[key];
    if (!definition) throw new EngineError(`${procedure.key} has no finding ${key}`);
    if (seen.has(key)) return;
    seen.add(key);
    findings.push({ ...definition, stepKey, verdict });
  };
  for (const step of steps) {
    for (const key of step.findings) add(key, step.stepKey, step.evaluation?.verdict ?? 'warn');
  }
  let diagnosis: LeanRunningDiagnosis | null = null;
  if (procedure.diagnosis === 'lean-running') {
    const input = leanInput(steps);
    if (input.runningPressure || input.flow || input.hold) {
      diagnosis = diagnoseLeanRunning(input);
      const top = diagnosis.causes[0];
      if (top && diagnosis.verdict !== 'pass' && procedure.findings[top.cause])
        add(top.cause, null, diagnosis.verdict);
    }
  }
  const verdicts = [...steps.map((s) => s.evaluation?.verdict), diagnosis?.verdict];
  const verdict = worstVerdict(verdicts);
  const rank = { fail: 0, warn: 1, pass: 2 } as const;
  const ordered = [...findings].sort((a, b) => rank[a.verdict] - rank[b.verdict]);
  const lines: SuggestedLine[] = [];
  for (const finding of ordered) {
    for (const line of finding.lines) {
      if (!lines.some((l) => l.kind === line.kind && l.description === line.description)) lines.push(line);
    }
  }
  const nextAction =
    ordered[0]?.nextAction ??
    diagnosis?.causes[0]?.nextAction ??
    'No fault found by this check: record the readings and move on.';
  return { verdict, findings: ordered, diagnosis, nextAction, lines, advice: procedure.advice };
}
