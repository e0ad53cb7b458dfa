/**
 * Compression across cylinders: how even they are matters more than the absolute figure, which
 * varies with gauge, cranking speed and altitude (REFERENCES.md, "Compression and leak-down").
 */
import { formatPsiKpa } from './pressure-hold';
import { clean, round, type Evaluation, type SpecSource, type Verdict } from './types';

export interface CompressionInput {
  /** One reading per cylinder, cylinder 1 first. */
  kpa: readonly number[];
  minKpa?: number;
  specSource?: SpecSource;
}

export type CompressionFigures = {
  cylinders: number;
  highestKpa: number;
  lowestKpa: number;
  spreadPct: number;
  lowestPctOfHighest: number;
  lowCylinders: readonly number[];
  minKpa: number | null;
  specSource: SpecSource | null;
  /** Cylinders (1-based) below `minKpa`; empty without one. */
  belowMinCylinders: readonly number[];
};

/**
 * Spread bands, (max − min) / max: within 10 % is healthy; above 25 % (the lowest under 75 % of the
 * highest) is a fault — common practice, no published source (REFERENCES.md quotes 10–15 % and
 * 70–75 %).
 */
const HEALTHY_SPREAD_PCT = 10;
const FAULT_SPREAD_PCT = 25;
/** A cylinder under 90 % of the best one is the one to wet-test (the healthy band, per cylinder). */
const LOW_CYLINDER_PCT = 90;

const GENERIC_NOTE = ' (generic limit: confirm in the service manual)';
const WET_TEST =
  'do a wet test on the low cylinder: a rise points to rings, no rise to valves or head gasket';

function validate(input: CompressionInput): void {
  if (input.kpa.length === 0) throw new RangeError('no compression readings to judge');
  for (const value of input.kpa) {
    if (!Number.isFinite(value)) throw new RangeError(`compression must be a finite number, got ${value}`);
    if (value <= 0) throw new RangeError(`compression must be positive, got ${value}`);
  }
  if (input.minKpa !== undefined && !(Number.isFinite(input.minKpa) && input.minKpa > 0)) {
    throw new RangeError(`minKpa must be a positive number, got ${input.minKpa}`);
  }
}

function spreadVerdict(spreadPct: number): Verdict {
  if (spreadPct <= HEALTHY_SPREAD_PCT) return 'pass';
  return spreadPct <= FAULT_SPREAD_PCT ? 'warn' : 'fail';
}

/** 1-based cylinder numbers whose reading satisfies `test`. */
function cylindersWhere(kpa: readonly number[], test: (value: number) => boolean): number[] {
  return kpa.flatMap((value, index) => (test(value) ? [index + 1] : []));
}

function listCylinders(numbers: readonly number[]): string {
  return `${numbers.length === 1 ? 'cylinder' : 'cylinders'} ${numbers.join(', ')}`;
}

/**
 * Judges a set of compression readings. Throws RangeError for no readings, NaN/Infinity, or a
 * reading or minimum that is not positive.
 */
export function evaluateCompression(input: CompressionInput): Evaluation<CompressionFigures> {
  validate(input);
  const { kpa, minKpa } = input;
  const highestKpa = Math.max(...kpa);
  const lowestKpa = Math.min(...kpa);
  const spread = clean(((highestKpa - lowestKpa) / highestKpa) * 100);
  const lowestPct = clean((lowestKpa / highestKpa) * 100);
  const belowMin = minKpa === undefined ? [] : cylindersWhere(kpa, (v) => clean(v) < clean(minKpa));
  const fromSpread = kpa.length === 1 ? 'pass' : spreadVerdict(spread);
  const verdict: Verdict = belowMin.length > 0 ? 'fail' : fromSpread;
  const lowCylinders =
    verdict === 'pass' ? [] : cylindersWhere(kpa, (v) => clean((v / highestKpa) * 100) < LOW_CYLINDER_PCT);
  const specSource = minKpa === undefined ? null : (input.specSource ?? 'generic');

  const figures: CompressionFigures = {
    cylinders: kpa.length,
    highestKpa: clean(highestKpa),
    lowestKpa: clean(lowestKpa),
    spreadPct: round(spread, 1),
    lowestPctOfHighest: round(lowestPct, 1),
    lowCylinders,
    minKpa: minKpa === undefined ? null : clean(minKpa),
    specSource,
    belowMinCylinders: belowMin,
  };
  return { verdict, reason: describe(figures, verdict), figures };
}

function describe(figures: CompressionFigures, verdict: Verdict): string {
  const { cylinders, highestKpa, lowestKpa, spreadPct, lowestPctOfHighest, minKpa } = figures;
  const minNote = figures.specSource === 'generic' ? GENERIC_NOTE : '';
  const aboveMin = minKpa === null ? '' : `, at or above the ${formatPsiKpa(minKpa)} minimum`;

  if (figures.belowMinCylinders.length > 0 && minKpa !== null) {
    const spreadPart = cylinders > 1 ? `; spread ${spreadPct} %` : '';
    return (
      `${capitalise(listCylinders(figures.belowMinCylinders))} below the ${formatPsiKpa(minKpa)} minimum` +
      `, lowest ${formatPsiKpa(lowestKpa)}${spreadPart}: ${WET_TEST}${minNote}`
    );
  }
  if (cylinders === 1) {
    return `One cylinder at ${formatPsiKpa(highestKpa)}${aboveMin}: compare with the service manual's figure${minNote}`;
  }
  const range = `${formatPsiKpa(lowestKpa)} to ${formatPsiKpa(highestKpa)}`;
  if (verdict === 'pass') {
    return `${cylinders} cylinders within ${spreadPct} % of each other, ${range}${aboveMin}: even compression${GENERIC_NOTE}`;
  }
  const low = capitalise(listCylinders(figures.lowCylinders));
  const severity = verdict === 'fail' ? 'a fault' : 'uneven';
  return (
    `${low} low: spread ${spreadPct} %, ${range}, lowest ${lowestPctOfHighest} % of the highest, ` +
    `${severity}; ${WET_TEST}${GENERIC_NOTE}`
  );
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
