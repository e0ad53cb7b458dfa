/**
 * The adapters a procedure step names by key: each reads the step's answer (in the units the
 * mechanic typed), converts to canonical units, and calls the shared evaluator with the machine's
 * limits. Kept apart from the procedures so the procedures stay plain data.
 */
import { evaluateBatteryRest, evaluateChargingVoltage, evaluateCrankingVoltage } from '../evaluators/battery';
import type { BatteryType } from '../evaluators/battery';
import { evaluateCompression } from '../evaluators/compression';
import { evaluateFlowVolume } from '../evaluators/flow-volume';
import { evaluatePressureHold } from '../evaluators/pressure-hold';
import { evaluatePrimeRun } from '../evaluators/prime-run';
import { evaluatePumpConnectorVoltage } from '../evaluators/pump-voltage';
import { evaluateRunningPressure } from '../evaluators/running-pressure';
import { evaluateVoltageDrop } from '../evaluators/voltage-drop';
import { evaluateWetTest } from '../evaluators/wet-test';
import type { Evaluation } from '../evaluators/types';
import { convert, type UnitId } from '../units';
import type { ResolvedSpec } from './specs';
import type { ListValue, MeasurementValue, SeriesValue, StepAnswer, StepDefinition } from './types';

export interface EvaluatedAnswer {
  answer: StepAnswer;
  evaluation: Evaluation | null;
}

export interface StepEvaluatorContext {
  spec: ResolvedSpec;
  /** Steps answered before this one in the run, by key. */
  earlier: ReadonlyMap<string, EvaluatedAnswer>;
}

type StepEvaluator = (answer: StepAnswer, context: StepEvaluatorContext, step: StepDefinition) => Evaluation;

const measurement = (answer: StepAnswer, key: string, to: UnitId): number | undefined => {
  const value = answer[key] as MeasurementValue | undefined;
  return value === undefined ? undefined : convert(value.value, value.unit, to);
};
const required = (answer: StepAnswer, key: string, to: UnitId): number => {
  const value = measurement(answer, key, to);
  if (value === undefined) throw new RangeError(`missing ${key}`);
  return value;
};
const choice = (answer: StepAnswer, key: string) => answer[key] as string | undefined;

/** Nominal resting voltage of a charged 12 V battery, used only when no battery step was answered. */
const NOMINAL_BATTERY_VOLTS = 12.6;

function batteryVoltsBefore(context: StepEvaluatorContext): number {
  const battery = context.earlier.get('basics-battery') ?? context.earlier.get('battery-rest');
  return battery ? required(battery.answer, 'volts', 'V') : NOMINAL_BATTERY_VOLTS;
}

/** A step whose chosen option carries the verdict (fresh fuel: pass; stale: fail). */
const choiceVerdict: StepEvaluator = (answer, _context, step) => {
  for (const field of step.fields) {
    if (field.type !== 'choice') continue;
    const option = field.options.find((o) => o.value === answer[field.key]);
    if (option?.verdict) {
      return {
        verdict: option.verdict,
        reason: option.reason ?? option.label,
        figures: { [field.key]: option.value },
      };
    }
  }
  return { verdict: 'pass', reason: 'Noted.', figures: {} };
};

export const STEP_EVALUATORS: Record<string, StepEvaluator> = {
  'choice-verdict': choiceVerdict,

  'battery-rest': (answer) =>
    evaluateBatteryRest({
      volts: required(answer, 'volts', 'V'),
      type: (choice(answer, 'batteryType') ?? 'flooded') as BatteryType,
    }),

  'cranking-voltage': (answer) => evaluateCrankingVoltage({ volts: required(answer, 'volts', 'V') }),

  'charging-voltage': (answer) => evaluateChargingVoltage({ volts: required(answer, 'volts', 'V') }),

  'prime-run': (answer) => {
    const ran = choice(answer, 'primeRun');
    return evaluatePrimeRun({
      ran: ran !== 'none',
      seconds: measurement(answer, 'seconds', 's'),
      stoppedByItself: ran === 'none' ? undefined : ran === 'ran_stopped',
    });
  },

  'pump-voltage': (answer, context) =>
    evaluatePumpConnectorVoltage({
      volts: required(answer, 'volts', 'V'),
      batteryVolts: batteryVoltsBefore(context),
    }),

  'voltage-drop': (answer) =>
    evaluateVoltageDrop({
      supplyVolts: required(answer, 'supplyVolts', 'V'),
      loadVolts: required(answer, 'loadVolts', 'V'),
    }),

  'pressure-hold': (answer, { spec }) => {
    const series = answer.points as SeriesValue;
    const evaluation = evaluatePressureHold({
      points: series.points.map((p) => ({ sec: p.sec, kpa: convert(p.value, series.unit, 'kPa') })),
      maxDropKpa: spec.holdMaxDropKpa,
      minutes: spec.holdMinutes,
      minPressureKpa: spec.fuelPressureMinKpa,
      specSource: spec.sources.holdMaxDropKpa,
    });
    // Whether the pump built pressure at all tells a weak supply from a leak-down.
    const reachedSpec = evaluation.figures.peakKpa >= spec.fuelPressureMinKpa;
    return { ...evaluation, figures: { ...evaluation.figures, reachedSpec } };
  },

  'running-pressure': (answer, { spec }) =>
    evaluateRunningPressure({
      points: (['idle', 'snap', 'held'] as const)
        .filter((phase) => answer[phase] !== undefined)
        .map((phase) => ({ phase, kpa: required(answer, phase, 'kPa') })),
      minKpa: spec.fuelPressureMinKpa,
      maxKpa: spec.fuelPressureMaxKpa,
      specSource: spec.sources.fuelPressureMinKpa,
    }),

  'flow-volume': (answer, { spec }) =>
    evaluateFlowVolume({
      ml: required(answer, 'volume', 'mL'),
      seconds: required(answer, 'seconds', 's'),
      minLph: spec.flowMinLph,
      specSource: spec.sources.flowMinLph,
    }),

  compression: (answer) => {
    const list = answer.cylinders as ListValue;
    return evaluateCompression({ kpa: list.values.map((v) => convert(v, list.unit, 'kPa')) });
  },

  'wet-test': (answer, context) => {
    const dry = context.earlier.get('compression-dry')?.answer.cylinders as ListValue | undefined;
    const wet = answer.cylinders as ListValue;
    return evaluateWetTest({
      dryKpa: dry ? dry.values.map((v) => convert(v, dry.unit, 'kPa')) : [],
      wetKpa: wet.values.map((v) => convert(v, wet.unit, 'kPa')),
    });
  },
};
