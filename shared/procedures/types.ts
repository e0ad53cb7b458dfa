/**
 * A guided check as data: steps with the fields they ask for, the caution to acknowledge first,
 * the evaluator that judges the answer, branches on what it decided, and the findings it can
 * raise. The engine (`engine.ts`) walks it; nothing here runs code of its own except the
 * evaluator adapters named by key.
 */
import type { LineItemKind } from '../api/jobs';
import type { Quantity, Verdict } from '../api/readings';
import type { UnitId } from '../units';
import type { CautionKey } from './cautions';

export interface ChoiceOption {
  value: string;
  label: string;
  /** For a choice that is itself the judgement (fresh fuel: pass; stale: fail). */
  verdict?: Verdict;
  reason?: string;
}

interface FieldBase {
  key: string;
  label: string;
  /** Plain-words help shown under the prompt. */
  hint?: string;
  optional?: boolean;
  /** Ask this field only when another field of the same step has one of these values. */
  showWhen?: { field: string; in: readonly string[] };
}

export interface MeasurementField extends FieldBase {
  type: 'measurement';
  quantity: Quantity;
  /** The unit a bare number is taken in, and the one the prompt suggests. */
  defaultUnit: UnitId;
}
export interface ChoiceField extends FieldBase {
  type: 'choice';
  options: readonly ChoiceOption[];
}
export interface ChoicesField extends FieldBase {
  type: 'choices';
  options: readonly ChoiceOption[];
}
/** Readings over time: seconds since the pump stopped, and the pressure then. */
export interface SeriesField extends FieldBase {
  type: 'series';
  quantity: Quantity;
  defaultUnit: UnitId;
  minPoints: number;
}
/** One reading per cylinder (or per anything numbered). */
export interface ListField extends FieldBase {
  type: 'list';
  quantity: Quantity;
  defaultUnit: UnitId;
  itemLabel: string;
  minItems: number;
  maxItems: number;
  /** As many items as this earlier step's list field of the same key (wet test after dry). */
  sameCountAs?: string;
}
export type Field = MeasurementField | ChoiceField | ChoicesField | SeriesField | ListField;

export interface MeasurementValue {
  value: number;
  unit: UnitId;
}
export interface SeriesValue {
  unit: UnitId;
  points: { sec: number; value: number }[];
}
export interface ListValue {
  unit: UnitId;
  values: number[];
}
export type FieldValue = MeasurementValue | SeriesValue | ListValue | string | string[];
/** A step's answer: one value per field key (optional and hidden fields may be absent). */
export type StepAnswer = Record<string, FieldValue>;

/** What a branch or a finding is conditioned on; all given parts must hold. */
export interface Condition {
  verdict?: readonly Verdict[];
  field?: { key: string; in: readonly string[] };
  figure?: { key: string; in: readonly (string | number | boolean)[] };
  /** A list figure (such as the phases that dipped) that has at least one entry. */
  nonEmpty?: string;
}

export const FINISH = 'finish';

export interface Branch {
  when?: Condition;
  goto: string;
}

export interface StepDefinition {
  key: string;
  title: string;
  /** What to do, in the order the mechanic does it. */
  prompt: string;
  caution?: CautionKey;
  fields: readonly Field[];
  /** Key of the adapter in `step-evaluators.ts`; none for a plain observation. */
  evaluator?: string;
  /** Tried in order; the first whose condition holds (or has none) decides the next step. */
  next: readonly Branch[];
  findings?: readonly { when: Condition; finding: string }[];
}

export interface SuggestedLine {
  kind: LineItemKind;
  description: string;
  /** Labour in hours, parts and supplies in units; prices come from the business and the parts. */
  quantity: number;
}

export interface FindingDefinition {
  key: string;
  title: string;
  /** What it means, in plain words. */
  detail: string;
  nextAction: string;
  lines: readonly SuggestedLine[];
}

export interface ProcedureDefinition {
  key: string;
  version: number;
  title: string;
  summary: string;
  start: string;
  steps: Readonly<Record<string, StepDefinition>>;
  findings: Readonly<Record<string, FindingDefinition>>;
  /** Standing advice printed with the findings of every finished run. */
  advice: readonly string[];
  /** A procedure-wide diagnosis that combines the steps' verdicts (fuel delivery: lean running). */
  diagnosis?: 'lean-running';
}
