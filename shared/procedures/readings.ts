/**
 * The job readings a step's answer holds: one per measurement, per point of a series and per
 * item of a list, in canonical units with what was typed kept beside. `offsetSec` places a series
 * point in time relative to the last one (the moment the step was answered).
 */
import { CANONICAL_UNITS, type Quantity } from '../api/readings';
import { convert, type UnitId } from '../units';
import type { ListValue, MeasurementValue, SeriesValue, StepAnswer, StepDefinition } from './types';

export interface StepReading {
  quantity: Quantity;
  value: number;
  unit: UnitId;
  enteredValue: number;
  enteredUnit: UnitId;
  /** Seconds before the step's answer that this value was read (0 for all but series points). */
  offsetSec: number;
  note: string | null;
}

export function stepReadings(step: StepDefinition, answer: StepAnswer): StepReading[] {
  return step.fields.flatMap((field): StepReading[] => {
    const value = answer[field.key];
    if (value === undefined || field.type === 'choice' || field.type === 'choices') return [];
    const unit = CANONICAL_UNITS[field.quantity];
    const reading = (entered: number, enteredUnit: UnitId, offsetSec: number, note: string | null) => ({
      quantity: field.quantity,
      value: convert(entered, enteredUnit, unit),
      unit,
      enteredValue: entered,
      enteredUnit,
      offsetSec,
      note,
    });
    if (field.type === 'measurement') {
      const m = value as MeasurementValue;
      return [reading(m.value, m.unit, 0, field.label)];
    }
    if (field.type === 'series') {
      const series = value as SeriesValue;
      const lastSec = Math.max(...series.points.map((p) => p.sec));
      return series.points.map((p) => reading(p.value, series.unit, lastSec - p.sec, `${p.sec} s`));
    }
    const list = value as ListValue;
    return list.values.map((v, i) => reading(v, list.unit, 0, `${field.itemLabel} ${i + 1}`));
  });
}
