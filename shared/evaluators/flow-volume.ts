/**
 * Flow volume: fuel collected from the pump outlet for a set time, where the engine cannot run
 * with the gauge fitted. A strong steady stream passes; a weak one means restriction (PRODUCT.md,
 * "Fuel delivery check").
 */
import { clean, round, type Evaluation, type SpecSource } from './types';

/**
 * Generic minimum flow, used only when the service manual gives none — common practice, no
 * published source (REFERENCES.md, "Fuel delivery"); always labelled generic.
 */
export const GENERIC_MIN_FLOW_LPH = 30;

export interface FlowVolumeInput {
  ml: number;
  seconds: number;
  minLph?: number;
  specSource?: SpecSource;
}

export type FlowVolumeFigures = {
  ml: number;
  seconds: number;
  litersPerHour: number;
  minLph: number;
  specSource: SpecSource;
};

const GENERIC_NOTE = ' (generic limit: confirm in the service manual)';

function requireFinite(value: number, name: string): void {
  if (!Number.isFinite(value)) throw new RangeError(`${name} must be a finite number, got ${value}`);
}

/**
 * The collected volume as a rate. Throws RangeError for NaN/Infinity, a negative volume or a
 * time that is not positive.
 */
export function litersPerHour(ml: number, seconds: number): number {
  requireFinite(ml, 'ml');
  requireFinite(seconds, 'seconds');
  if (ml < 0) throw new RangeError(`ml must not be negative, got ${ml}`);
  if (seconds <= 0) throw new RangeError(`seconds must be positive, got ${seconds}`);
  return ml / 1000 / (seconds / 3600);
}

/** Judges a flow-volume test; throws RangeError as `litersPerHour` does, or for a minimum ≤ 0. */
export function evaluateFlowVolume(input: FlowVolumeInput): Evaluation<FlowVolumeFigures> {
  const { ml, seconds } = input;
  const rate = clean(litersPerHour(ml, seconds));
  // A manual figure without its source is still treated as generic: the label errs towards "confirm".
  const minLph = input.minLph ?? GENERIC_MIN_FLOW_LPH;
  const specSource = input.minLph === undefined ? 'generic' : (input.specSource ?? 'generic');
  requireFinite(minLph, 'minLph');
  if (minLph <= 0) throw new RangeError(`minLph must be positive, got ${minLph}`);

  const figures: FlowVolumeFigures = {
    ml: round(ml, 2),
    seconds: round(seconds, 2),
    litersPerHour: round(rate, 2),
    minLph: round(minLph, 2),
    specSource,
  };
  const note = specSource === 'generic' ? GENERIC_NOTE : '';
  const measured = `${figures.litersPerHour} L/h (${figures.ml} mL in ${figures.seconds} s)`;
  const minimum = `${figures.minLph} L/h minimum`;

  if (ml === 0) {
    return {
      verdict: 'fail',
      reason:
        `No flow: nothing collected in ${figures.seconds} s: check voltage at the pump, then the pump, ` +
        `then a blocked filter, strainer or line${note}`,
      figures,
    };
  }
  if (rate < clean(minLph)) {
    return {
      verdict: 'fail',
      reason:
        `Flowed ${measured}, below the ${minimum}: a weak stream means a restriction — filter or strainer ` +
        `first, then pick-up or line, a worn pump or low supply voltage${note}`,
      figures,
    };
  }
  return {
    verdict: 'pass',
    reason: `Flowed ${measured}, at or above the ${minimum}${note}`,
    figures,
  };
}
