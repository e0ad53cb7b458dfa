import type { Verdict } from '../api/readings';

export type { Verdict };

/** A number an evaluator decided on, or a label, or a list of them: all serialisable as JSON. */
export type Figure = number | string | boolean | null | readonly (number | string)[];

/**
 * What every evaluator returns: the verdict, the numbers behind it and one line in plain words
 * that a customer could read. `figures` is what the server stores beside a check step.
 */
export interface Evaluation<F extends Record<string, Figure> = Record<string, Figure>> {
  verdict: Verdict;
  reason: string;
  figures: F;
}

/** Where a limit came from: the machine's service manual, or Vanbay's generic default. */
export type SpecSource = 'manual' | 'generic';

const VERDICT_RANK: Record<Verdict, number> = { pass: 0, warn: 1, fail: 2 };

/** The worst of some verdicts (fail over warn over pass); pass for none. */
export function worstVerdict(verdicts: readonly (Verdict | null | undefined)[]): Verdict {
  let worst: Verdict = 'pass';
  for (const verdict of verdicts) {
    if (verdict && VERDICT_RANK[verdict] > VERDICT_RANK[worst]) worst = verdict;
  }
  return worst;
}

/**
 * Drops the float noise of decimal arithmetic (12.6 − 12.2 = 0.40000000000000036) so that
 * comparisons at a limit and the numbers shown agree with what the mechanic typed. Twelve
 * significant digits is far below any gauge's resolution.
 */
export function clean(value: number): number {
  if (!Number.isFinite(value)) return value;
  return Number(value.toPrecision(12));
}

/** Rounds for display and JSON: `places` decimals, float noise removed. */
export function round(value: number, places: number): number {
  const factor = 10 ** places;
  return clean(Math.round(clean(value) * factor) / factor);
}
