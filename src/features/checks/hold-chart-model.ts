/**
 * What the pressure-hold chart draws, worked out apart from the chart library so it can be tested
 * and read as text: the readings in the unit the mechanic typed, the settling window, the
 * reference reading after it, and the lowest pressure the allowed drop permits (CONTRACT.md,
 * `vanbay calc hold`: the first point at or after 30 s is the reference; the drop is from it to
 * the lowest reading up to the hold's end).
 */
import { SETTLE_SECONDS } from '../../../shared/evaluators/pressure-hold';
import { clean, type Figure } from '../../../shared/evaluators/types';
import type { SeriesValue } from '../../../shared/procedures/types';
import { convert, type UnitId } from '../../../shared/units';

export interface HoldPoint {
  sec: number;
  value: number;
}

export interface HoldChartModel {
  unit: UnitId;
  points: HoldPoint[];
  /** Readings before this are the normal settling drop and are not judged. */
  settleSec: number;
  /** The first reading at or after the settling window and not past the hold's end. */
  reference: HoldPoint | null;
  /** The lowest reading from the reference to the hold's end. */
  lowest: HoldPoint | null;
  /** The drop the limit allows, in the typed unit. */
  allowedDrop: number;
  /** The reference pressure less the allowed drop: a reading below it fails the hold. */
  limit: number | null;
  /** The end of the hold (its minutes), in seconds after the pump stopped. */
  endSec: number;
  specSource: 'manual' | 'generic';
}

const numberFigure = (figures: Record<string, Figure>, key: string): number | null => {
  const value = figures[key];
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
};

/**
 * The chart of one hold: `series` as answered, `figures` as the evaluator returned them (the limit
 * in kPa and the hold's minutes it judged by). Null when the figures carry no limit to draw.
 */
export function holdChartModel(series: SeriesValue, figures: Record<string, Figure>): HoldChartModel | null {
  const maxDropKpa = numberFigure(figures, 'maxDropKpa');
  const minutes = numberFigure(figures, 'minutes');
  if (maxDropKpa === null || minutes === null) return null;
  const points = [...series.points].sort((a, b) => a.sec - b.sec);
  const endSec = minutes * 60;
  const at = points.findIndex((p) => p.sec >= SETTLE_SECONDS);
  const reference = at !== -1 && points[at]!.sec <= endSec ? points[at]! : null;
  const window = reference ? points.slice(at).filter((p) => p.sec <= endSec) : [];
  const lowest = window.reduce<HoldPoint | null>((low, p) => (low && low.value <= p.value ? low : p), null);
  // clean(): the limit converted from kPa back to psi reads 3, not 2.9999999999999996.
  const allowedDrop = clean(convert(maxDropKpa, 'kPa', series.unit));
  return {
    unit: series.unit,
    points,
    settleSec: SETTLE_SECONDS,
    reference,
    lowest,
    allowedDrop,
    limit: reference ? clean(reference.value - allowedDrop) : null,
    endSec,
    specSource: figures.specSource === 'manual' ? 'manual' : 'generic',
  };
}

/**
 * The pressure axis: every reading and the limit line on it, padded, with ticks on round steps
 * (1, 2, 5 or 10 times a power of ten) so a glance reads the gauge's own numbers.
 */
export function holdAxis(model: HoldChartModel): { domain: [number, number]; ticks: number[] } {
  const values = model.points.map((p) => p.value);
  if (model.limit !== null) values.push(model.limit);
  const low = values.length > 0 ? Math.min(...values) : 0;
  const high = values.length > 0 ? Math.max(...values) : 1;
  const pad = Math.max((high - low) * 0.1, Math.abs(high) * 0.005, 0.1);
  const rough = (high - low + 2 * pad) / 5;
  const power = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= rough)!;
  const first = Math.max(0, Math.floor((low - pad) / step) * step);
  const last = Math.ceil((high + pad) / step) * step;
  const ticks: number[] = [];
  for (let t = first; t <= last + step / 2; t += step) ticks.push(clean(t));
  return { domain: [ticks[0]!, ticks.at(-1)!], ticks };
}

/** Time ticks on whole half-minutes, minutes or five minutes, from the pump stopping to `lastSec`. */
export function holdTimeTicks(lastSec: number): number[] {
  const step = lastSec <= 150 ? 30 : lastSec <= 600 ? 60 : lastSec <= 1800 ? 300 : 600;
  const ticks: number[] = [];
  for (let t = 0; t < lastSec + step; t += step) ticks.push(t);
  return ticks;
}
