/**
 * The shared engine as the browser walks it: the same `answerStep` the CLI and the server run,
 * fed from what is typed into the form, so an answer is judged the moment it is complete, with
 * or without signal. Only the server's verdict, from its own walk, is ever kept.
 */
import type { CheckRun } from '../../../shared/api/checks';
import type { Evaluation } from '../../../shared/evaluators/types';
import { answerStep, isFieldShown, startRun, type RunState } from '../../../shared/procedures/engine';
import { findProcedure } from '../../../shared/procedures/index';
import { parseFieldInput } from '../../../shared/procedures/input';
import type { MachineSpec } from '../../../shared/procedures/specs';
import type {
  Field,
  FieldValue,
  ListValue,
  MeasurementValue,
  ProcedureDefinition,
  SeriesValue,
  StepAnswer,
  StepDefinition,
} from '../../../shared/procedures/types';
import { UNITS, type UnitId } from '../../../shared/units';
import { formatDecimal } from '../../lib/format';

/** What the form holds per field: typed text, a chosen option, or the options ticked. */
export type Draft = Record<string, string | string[]>;

/** The procedure a stored run was walked with, when this dashboard knows the same version. */
export function procedureOfRun(run: Pick<CheckRun, 'procedureKey' | 'procedureVersion'>) {
  const procedure = findProcedure(run.procedureKey);
  return procedure && procedure.version === run.procedureVersion ? procedure : null;
}

/** The engine's state from a run as the server sent it: its answers, in order. */
export function stateOfRun(procedure: ProcedureDefinition, run: Pick<CheckRun, 'steps'>): RunState {
  return {
    ...startRun(procedure),
    steps: run.steps.map((s) => ({
      stepKey: s.stepKey,
      answer: s.answer,
      cautionAcknowledged: s.cautionAcknowledged,
    })),
  };
}

/** `43 psi`, `12.62 V`: the number as typed (up to three decimals) and its unit's label. */
export function valueWithUnit(value: number, unit: UnitId): string {
  const label = UNITS[unit].label;
  const number = formatDecimal(value, 3);
  return label.startsWith(':') ? `${number}${label}` : `${number} ${label}`;
}

export type FieldRead =
  | { state: 'empty' }
  | { state: 'read'; value: FieldValue; shown: string }
  | { state: 'error'; error: string };

/** One field's draft read as the engine will read it, with what it was read as, in plain words. */
export function readField(field: Field, draft: Draft): FieldRead {
  const raw = draft[field.key];
  if (field.type === 'choices') {
    const picked = Array.isArray(raw) ? raw : [];
    return { state: 'read', value: picked, shown: describeValue(field, picked) };
  }
  if (field.type === 'choice') {
    return typeof raw === 'string' && raw !== ''
      ? { state: 'read', value: raw, shown: describeValue(field, raw) }
      : { state: 'empty' };
  }
  const text = typeof raw === 'string' ? raw.trim() : '';
  if (text === '') return { state: 'empty' };
  const parsed = parseFieldInput(field, text);
  return parsed.ok
    ? { state: 'read', value: parsed.value, shown: describeValue(field, parsed.value) }
    : { state: 'error', error: parsed.error };
}

/** The fields of a step as shown for this draft (a field may depend on another's choice). */
export function shownFields(step: StepDefinition, draft: Draft): Field[] {
  return step.fields.filter((field) => isFieldShown(field, draft));
}

export type Judgement =
  /** Something required is still empty, or a value cannot be read yet. */
  | { state: 'incomplete'; waitingFor: string[]; errors: string[] }
  /** Complete, but the engine refuses it (a wrong count, a negative value): its one line. */
  | { state: 'refused'; error: string }
  | { state: 'judged'; answer: StepAnswer; evaluation: Evaluation | null; nextTitle: string | null };

/**
 * Judges the draft as the answer to the run's current step, exactly as saving it would: the
 * same engine, the same limits. Nothing is recorded; the state is left as it was.
 */
export function judgeDraft(
  procedure: ProcedureDefinition,
  state: RunState,
  step: StepDefinition,
  draft: Draft,
  spec: MachineSpec | null,
): Judgement {
  const answer: StepAnswer = {};
  const waitingFor: string[] = [];
  const errors: string[] = [];
  for (const field of shownFields(step, draft)) {
    const read = readField(field, draft);
    if (read.state === 'read') answer[field.key] = read.value;
    else if (read.state === 'error') errors.push(`${field.label}: ${read.error}`);
    else if (!field.optional) waitingFor.push(field.label);
  }
  if (waitingFor.length > 0 || errors.length > 0) return { state: 'incomplete', waitingFor, errors };
  // Judged as if acknowledged: the inputs only unlock once the caution is, and saving sends it.
  let result: ReturnType<typeof answerStep>;
  try {
    result = answerStep(procedure, state, { stepKey: step.key, answer, cautionAcknowledged: true }, { spec });
  } catch (error) {
    // A stored run this engine cannot walk: the server still judges the answer when it is saved.
    return { state: 'refused', error: error instanceof Error ? error.message : String(error) };
  }
  if (!result.ok) return { state: 'refused', error: result.error };
  const next = result.view.current;
  return { state: 'judged', answer, evaluation: result.step.evaluation, nextTitle: next ? next.title : null };
}

/** A stored answer as the form's draft again, in the units it was typed in (for "back"). */
export function draftOfAnswer(step: StepDefinition, answer: Record<string, unknown>): Draft {
  const draft: Draft = {};
  for (const field of step.fields) {
    const value = answer[field.key];
    if (value === undefined || value === null) continue;
    switch (field.type) {
      case 'choice':
        if (typeof value === 'string') draft[field.key] = value;
        break;
      case 'choices':
        if (Array.isArray(value)) draft[field.key] = value.filter((v): v is string => typeof v === 'string');
        break;
      case 'measurement': {
        const m = value as MeasurementValue;
        draft[field.key] = `${m.value} ${m.unit}`;
        break;
      }
      case 'series': {
        const s = value as SeriesValue;
        draft[field.key] = s.points.map((p) => `${p.sec}:${p.value}${s.unit}`).join(', ');
        break;
      }
      case 'list': {
        const l = value as ListValue;
        draft[field.key] = `${l.values.join(', ')} ${l.unit}`;
        break;
      }
    }
  }
  return draft;
}

const optionLabel = (
  field: Field & { options: readonly { value: string; label: string }[] },
  value: string,
) => field.options.find((o) => o.value === value)?.label ?? value;

/** A field's value in plain words, in the unit the mechanic typed. */
export function describeValue(field: Field, value: unknown): string {
  switch (field.type) {
    case 'choice':
      return typeof value === 'string' ? optionLabel(field, value) : '—';
    case 'choices': {
      const values = Array.isArray(value) ? (value as string[]) : [];
      return values.length === 0 ? 'None' : values.map((v) => optionLabel(field, v)).join('; ');
    }
    case 'measurement': {
      const m = value as MeasurementValue;
      return valueWithUnit(m.value, m.unit);
    }
    case 'series': {
      const s = value as SeriesValue;
      return s.points
        .map((p) => `${formatDecimal(p.sec, 1)} s: ${valueWithUnit(p.value, s.unit)}`)
        .join(', ');
    }
    case 'list': {
      const l = value as ListValue;
      return `${l.values.map((v) => formatDecimal(v, 3)).join(', ')} ${UNITS[l.unit].label}`;
    }
  }
}

/** Each answered field of a step, labelled, for the record of the run. */
export function describeAnswer(
  step: StepDefinition | undefined,
  answer: Record<string, unknown>,
): { label: string; text: string }[] {
  if (!step) return [];
  return step.fields
    .filter((field) => answer[field.key] !== undefined)
    .map((field) => ({ label: field.label, text: describeValue(field, answer[field.key]) }));
}
