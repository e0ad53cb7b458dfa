/**
 * Air-fuel ratio to lambda, and whether the mixture is lean, rich or stoichiometric for the fuel
 * in the tank (REFERENCES.md, "Air-fuel ratio").
 */
import { clean, round, type Evaluation, type Verdict } from './types';

export const FUELS = ['gasoline', 'e10', 'e85', 'ethanol', 'methanol'] as const;
export type Fuel = (typeof FUELS)[number];

/**
 * Stoichiometric AFR by mass (REFERENCES.md): gasoline 14.7 (Heywood gives ≈ 14.6, from memory),
 * E10 14.1 and E85 9.8 as mass-weighted blends, ethanol 9.0, methanol 6.4 (6.4–6.5 is quoted).
 */
export const STOICHIOMETRIC_AFR: Record<Fuel, number> = {
  gasoline: 14.7,
  e10: 14.1,
  e85: 9.8,
  ethanol: 9.0,
  methanol: 6.4,
};

export type Mixture = 'lean' | 'rich' | 'stoichiometric';

export interface MixtureInput {
  afr: number;
  fuel: Fuel;
}

export type MixtureFigures = {
  afr: number;
  fuel: Fuel;
  stoichAfr: number;
  lambda: number;
  mixture: Mixture;
};

/** Within half a percent of λ = 1 a wide-band sensor cannot tell lean from rich. */
const STOICH_TOLERANCE = 0.005;

/**
 * Verdict bands on λ — common practice, no published source: ±5 % passes; lean beyond 1.10 risks
 * overheating and damage; rich below 0.85 fouls plugs.
 */
const PASS_RICH = 0.95;
const PASS_LEAN = 1.05;
const WARN_RICH = 0.85;
const WARN_LEAN = 1.1;

const FUEL_WORDS: Record<Fuel, string> = {
  gasoline: 'gasoline',
  e10: 'E10',
  e85: 'E85',
  ethanol: 'ethanol',
  methanol: 'methanol',
};

const LOAD_NOTE = 'under heavy load a richer mixture is normal';

export function classifyMixture(lambda: number): Mixture {
  if (Math.abs(lambda - 1) < STOICH_TOLERANCE) return 'stoichiometric';
  return lambda > 1 ? 'lean' : 'rich';
}

function verdictFor(lambda: number): Verdict {
  if (lambda >= PASS_RICH && lambda <= PASS_LEAN) return 'pass';
  if (lambda >= WARN_RICH && lambda <= WARN_LEAN) return 'warn';
  return 'fail';
}

function meaning(lambda: number, verdict: Verdict): string {
  if (verdict === 'pass') return `close to stoichiometric; ${LOAD_NOTE}`;
  if (lambda > 1) {
    return verdict === 'warn'
      ? `lean: look for an air leak or low fuel pressure; ${LOAD_NOTE}`
      : `dangerously lean: risks overheating and engine damage — find the cause before riding; ${LOAD_NOTE}`;
  }
  return verdict === 'warn'
    ? `rich: ${LOAD_NOTE}, but at idle or cruise check for high fuel pressure, a leaking injector or a blocked air filter`
    : `very rich: fouls plugs — ${LOAD_NOTE}, but not this rich; check for high fuel pressure, a leaking injector or a blocked air filter`;
}

/** Lambda for an AFR reading. Throws RangeError for NaN/Infinity, an AFR ≤ 0 or an unknown fuel. */
export function evaluateMixture(input: MixtureInput): Evaluation<MixtureFigures> {
  const { afr, fuel } = input;
  if (!Number.isFinite(afr)) throw new RangeError(`afr must be a finite number, got ${afr}`);
  if (afr <= 0) throw new RangeError(`afr must be positive, got ${afr}`);
  if (!(FUELS as readonly string[]).includes(fuel)) throw new RangeError(`unknown fuel "${fuel}"`);

  const stoichAfr = STOICHIOMETRIC_AFR[fuel];
  // Decided on the unrounded ratio (float noise removed), shown to four places.
  const lambda = clean(afr / stoichAfr);
  const mixture = classifyMixture(lambda);
  const verdict = verdictFor(lambda);
  return {
    verdict,
    reason: `Lambda ${round(lambda, 2)} (AFR ${round(afr, 2)}:1 on ${FUEL_WORDS[fuel]}, stoichiometric ${stoichAfr}:1): ${meaning(lambda, verdict)}`,
    figures: { afr, fuel, stoichAfr, lambda: round(lambda, 4), mixture },
  };
}
