/**
 * Static hold, key on engine off: after the pump stops the pressure should stay up. The first
 * few seconds are skipped (a small settling drop there is normal) and the fall from then to the
 * end of the hold is judged against the limit (CONTRACT.md, `vanbay calc hold`).
 */
import { kpaToPsi } from '../units';
import { clean, round, type Evaluation, type SpecSource } from './types';

/** The settling window after the pump stops (CONTRACT.md: the first point at or after 30 s). */
export const SETTLE_SECONDS = 30;

export interface PressurePoint {
  sec: number;
  kpa: number;
}

export interface PressureHoldInput {
  points: readonly PressurePoint[];
  maxDropKpa: number;
  minutes: number;
  /** The pressure the pump must reach first (the low end of the spec band), when known. */
  minPressureKpa?: number;
  specSource?: SpecSource;
}

export type PressureHoldFigures = {
  startKpa: number;
  lowestKpa: number;
  dropKpa: number;
  maxDropKpa: number;
  minutes: number;
  coveredMinutes: number;
  peakKpa: number;
  specSource: SpecSource;
};

const GENERIC_NOTE = ' (generic limit: confirm in the service manual)';

/** `4 psi (27.6 kPa)`: psi first because that is what the gauge in the van reads. */
export function formatPsiKpa(kpa: number): string {
  return `${round(kpaToPsi(kpa), 1)} psi (${round(kpa, 1)} kPa)`;
}

function requireFinite(value: number, name: string): void {
  if (!Number.isFinite(value)) throw new RangeError(`${name} must be a finite number, got ${value}`);
}

/** Points in time order; a negative time or two readings at one second cannot be judged. */
function sortPoints(points: readonly PressurePoint[]): PressurePoint[] {
  for (const point of points) {
    requireFinite(point.sec, 'sec');
    requireFinite(point.kpa, 'kpa');
    if (point.sec < 0) throw new RangeError(`sec must not be negative, got ${point.sec}`);
  }
  const sorted = [...points].sort((a, b) => a.sec - b.sec);
  for (let i = 1; i < sorted.length; i += 1) {
    if (sorted[i]!.sec === sorted[i - 1]!.sec) {
      throw new RangeError(`two readings at ${sorted[i]!.sec} s`);
    }
  }
  return sorted;
}

function lowest(points: readonly PressurePoint[]): number {
  return points.length === 0 ? 0 : Math.min(...points.map((p) => p.kpa));
}

function highest(points: readonly PressurePoint[]): number {
  return points.length === 0 ? 0 : Math.max(...points.map((p) => p.kpa));
}

function minutesText(minutes: number): string {
  return `${round(minutes, 1)} min`;
}

/**
 * Judges a hold series. Throws RangeError for NaN/Infinity, a negative time, two readings at the
 * same second, a negative limit, or a hold that is not longer than the settling window.
 */
export function evaluatePressureHold(input: PressureHoldInput): Evaluation<PressureHoldFigures> {
  const { maxDropKpa, minutes, minPressureKpa } = input;
  const specSource = input.specSource ?? 'generic';
  requireFinite(maxDropKpa, 'maxDropKpa');
  requireFinite(minutes, 'minutes');
  if (maxDropKpa < 0) throw new RangeError(`maxDropKpa must not be negative, got ${maxDropKpa}`);
  if (minutes * 60 <= SETTLE_SECONDS) {
    throw new RangeError(`the hold must last longer than the ${SETTLE_SECONDS} s settling window`);
  }
  if (minPressureKpa !== undefined) requireFinite(minPressureKpa, 'minPressureKpa');

  const points = sortPoints(input.points);
  const endSec = minutes * 60;
  const startIndex = points.findIndex((p) => p.sec >= SETTLE_SECONDS);
  // A first settled reading after the hold's end leaves nothing to measure a drop over.
  const start = startIndex === -1 || points[startIndex]!.sec > endSec ? undefined : points[startIndex];
  // Without a settled point, show what was measured so the chart and figures are not blank.
  const window = start ? points.slice(startIndex).filter((p) => p.sec <= endSec) : points;
  const startKpa = start?.kpa ?? points[0]?.kpa ?? 0;
  const lowestKpa = start ? Math.min(start.kpa, lowest(window)) : lowest(window);
  const dropKpa = clean(startKpa - lowestKpa);
  const peakKpa = highest(points);
  const lastSec = points.at(-1)?.sec ?? 0;
  const coveredMinutes = start ? Math.min(clean((lastSec - start.sec) / 60), minutes) : 0;
  const reachedEnd = lastSec >= endSec;

  const figures: PressureHoldFigures = {
    startKpa: clean(startKpa),
    lowestKpa: clean(lowestKpa),
    dropKpa,
    maxDropKpa: clean(maxDropKpa),
    minutes,
    coveredMinutes: round(coveredMinutes, 2),
    peakKpa: clean(peakKpa),
    specSource,
  };
  const note = specSource === 'generic' ? GENERIC_NOTE : '';
  const limit = `limit ${formatPsiKpa(maxDropKpa)}`;
  const ran = minutesText(reachedEnd ? minutes : lastSec / 60);

  if (minPressureKpa !== undefined && points.length > 0 && clean(peakKpa) < clean(minPressureKpa)) {
    return {
      verdict: 'fail',
      reason:
        `Pressure never reached spec: peak ${formatPsiKpa(peakKpa)}, minimum ${formatPsiKpa(minPressureKpa)}: ` +
        `look for a restriction (filter or strainer first), a worn pump or low supply voltage${note}`,
      figures,
    };
  }
  if (!start) {
    return {
      verdict: 'warn',
      reason: `Not enough of the test to judge: no reading between ${SETTLE_SECONDS} s, when settling ends, and ${minutesText(minutes)}`,
      figures,
    };
  }
  if (dropKpa > clean(maxDropKpa)) {
    return {
      verdict: 'fail',
      reason:
        `Fell ${formatPsiKpa(dropKpa)} in ${ran} after settling; ${limit}: the pump's check valve ` +
        `(or a leaking injector or regulator) is bleeding pressure off, which shows as long cranking ` +
        `before it starts${note}`,
      figures,
    };
  }
  if (!reachedEnd) {
    return {
      verdict: 'warn',
      reason:
        `Provisional: the test ran ${ran} of ${minutesText(minutes)}; fell ${formatPsiKpa(dropKpa)} ` +
        `after settling so far, ${limit}${note}`,
      figures,
    };
  }
  return {
    verdict: 'pass',
    reason: `Held: fell ${formatPsiKpa(dropKpa)} in ${ran} after settling, within the ${formatPsiKpa(maxDropKpa)} limit${note}`,
    figures,
  };
}
