/**
 * Running pressure: at idle, on a snap of the throttle and at a held opening the pressure must
 * stay inside the spec band; a dip below it means the engine runs lean (PRODUCT.md, "Fuel
 * delivery check").
 */
import { formatPsiKpa } from './pressure-hold';
import { clean, type Evaluation, type SpecSource } from './types';

export const THROTTLE_PHASES = ['idle', 'snap', 'held'] as const;
export type ThrottlePhase = (typeof THROTTLE_PHASES)[number];

export interface RunningPressurePoint {
  phase: ThrottlePhase;
  kpa: number;
}

export interface RunningPressureInput {
  points: readonly RunningPressurePoint[];
  minKpa: number;
  maxKpa: number;
  specSource?: SpecSource;
}

export type RunningPressureFigures = {
  minKpa: number;
  maxKpa: number;
  lowestKpa: number;
  highestKpa: number;
  dipPhases: readonly ThrottlePhase[];
  highPhases: readonly ThrottlePhase[];
  specSource: SpecSource;
};

const GENERIC_NOTE = ' (generic limit: confirm in the service manual)';

const PHASE_WORDS: Record<ThrottlePhase, string> = {
  idle: 'at idle',
  snap: 'on snap',
  held: 'at held throttle',
};

function describePhases(phases: readonly ThrottlePhase[]): string {
  return phases.map((phase) => PHASE_WORDS[phase]).join(' and ');
}

function validate(input: RunningPressureInput): void {
  if (input.points.length === 0) throw new RangeError('no running-pressure readings to judge');
  for (const [name, value] of [
    ['minKpa', input.minKpa],
    ['maxKpa', input.maxKpa],
    ...input.points.map((p) => ['kpa', p.kpa] as const),
  ] as const) {
    if (!Number.isFinite(value)) throw new RangeError(`${name} must be a finite number, got ${value}`);
  }
  if (input.minKpa > input.maxKpa) {
    throw new RangeError(`minKpa ${input.minKpa} is above maxKpa ${input.maxKpa}`);
  }
  for (const point of input.points) {
    if (!(THROTTLE_PHASES as readonly string[]).includes(point.phase)) {
      throw new RangeError(`unknown throttle phase "${point.phase}"`);
    }
  }
}

/** The phases, in test order, where some reading crosses the limit. */
function phasesWhere(
  points: readonly RunningPressurePoint[],
  crosses: (kpa: number) => boolean,
): ThrottlePhase[] {
  return THROTTLE_PHASES.filter((phase) => points.some((p) => p.phase === phase && crosses(clean(p.kpa))));
}

/**
 * Judges running pressure against the band. Throws RangeError for no readings, NaN/Infinity,
 * an unknown phase or a band whose minimum is above its maximum.
 */
export function evaluateRunningPressure(input: RunningPressureInput): Evaluation<RunningPressureFigures> {
  validate(input);
  const { points } = input;
  const minKpa = clean(input.minKpa);
  const maxKpa = clean(input.maxKpa);
  const specSource = input.specSource ?? 'generic';
  const dipPhases = phasesWhere(points, (kpa) => kpa < minKpa);
  const highPhases = phasesWhere(points, (kpa) => kpa > maxKpa);
  const missing = THROTTLE_PHASES.filter((phase) => !points.some((p) => p.phase === phase));
  const lowestKpa = clean(Math.min(...points.map((p) => p.kpa)));
  const highestKpa = clean(Math.max(...points.map((p) => p.kpa)));
  const figures: RunningPressureFigures = {
    minKpa,
    maxKpa,
    lowestKpa,
    highestKpa,
    dipPhases,
    highPhases,
    specSource,
  };
  const note = specSource === 'generic' ? GENERIC_NOTE : '';

  if (dipPhases.length > 0) {
    // A band crossed both ways is still lean first: that is what stalls the machine under load.
    const alsoHigh =
      highPhases.length > 0
        ? `; it also rises to ${formatPsiKpa(highestKpa)} ${describePhases(highPhases)}`
        : '';
    return {
      verdict: 'fail',
      reason:
        `Dips to ${formatPsiKpa(lowestKpa)} ${describePhases(dipPhases)}, below the ${formatPsiKpa(minKpa)} ` +
        `minimum: the engine runs lean — restricted filter or strainer most likely, then pump, supply ` +
        `voltage, pick-up or regulator${alsoHigh}${note}`,
      figures,
    };
  }
  if (highPhases.length > 0) {
    return {
      verdict: 'fail',
      reason:
        `Rises to ${formatPsiKpa(highestKpa)} ${describePhases(highPhases)}, above the ${formatPsiKpa(maxKpa)} ` +
        `maximum: a faulty regulator or a restricted return line most likely${note}`,
      figures,
    };
  }
  const band = `${formatPsiKpa(minKpa)} to ${formatPsiKpa(maxKpa)}`;
  if (missing.length > 0) {
    return {
      verdict: 'warn',
      reason:
        `No reading ${describePhases(missing)}: in band where measured, lowest ${formatPsiKpa(lowestKpa)}; ` +
        `check every throttle phase against ${band}${note}`,
      figures,
    };
  }
  return {
    verdict: 'pass',
    reason:
      `Stayed within ${band} at idle, on snap and at held throttle; lowest ${formatPsiKpa(lowestKpa)}, ` +
      `highest ${formatPsiKpa(highestKpa)}${note}`,
    figures,
  };
}
