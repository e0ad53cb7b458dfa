/**
 * Wet compression test: a little oil in a low cylinder seals the rings for a moment. A clear rise
 * points to worn rings; no rise points to valves or the head gasket (REFERENCES.md, "Compression
 * and leak-down": common practice). A rise of a tenth of the dry reading counts as clear —
 * common practice, no published source.
 */
import type { Evaluation } from './types';
import { round } from './types';

export const WET_RISE_PCT = 10;

export type WetTestCause = 'rings' | 'valves_or_gasket' | 'inconclusive';

export function evaluateWetTest(input: {
  dryKpa: readonly number[];
  wetKpa: readonly number[];
}): Evaluation<{ cause: WetTestCause; risePct: readonly number[]; lowCylinders: readonly number[] }> {
  const { dryKpa, wetKpa } = input;
  if ([...dryKpa, ...wetKpa].some((v) => !Number.isFinite(v) || v <= 0)) {
    throw new RangeError('compression readings must be positive numbers');
  }
  if (dryKpa.length === 0 || dryKpa.length !== wetKpa.length) {
    return {
      verdict: 'warn',
      reason:
        'Wet readings do not match the dry ones cylinder for cylinder: re-test each cylinder dry and wet.',
      figures: { cause: 'inconclusive', risePct: [], lowCylinders: [] },
    };
  }
  const risePct = dryKpa.map((dry, i) => round((((wetKpa[i] as number) - dry) / dry) * 100, 1));
  const highest = Math.max(...dryKpa);
  // The cylinders the wet test is about: the low ones, or every one on a single-cylinder engine.
  const low = dryKpa.length === 1 ? [0] : dryKpa.flatMap((dry, i) => (dry < highest * 0.9 ? [i] : []));
  const judged = low.length > 0 ? low : dryKpa.map((_, i) => i);
  const rose = judged.filter((i) => (risePct[i] as number) >= WET_RISE_PCT);
  const lowCylinders = judged.map((i) => i + 1);
  const names = lowCylinders.map((n) => `#${n}`).join(', ');
  if (rose.length === judged.length) {
    return {
      verdict: 'fail',
      reason: `Oil raised compression on cylinder ${names}: worn rings or cylinder wall.`,
      figures: { cause: 'rings', risePct, lowCylinders },
    };
  }
  if (rose.length === 0) {
    return {
      verdict: 'fail',
      reason: `Oil did not raise compression on cylinder ${names}: valves or head gasket leaking — a leak-down test will tell which.`,
      figures: { cause: 'valves_or_gasket', risePct, lowCylinders },
    };
  }
  return {
    verdict: 'warn',
    reason: `Mixed result on cylinders ${names}: run a leak-down test to find where the pressure goes.`,
    figures: { cause: 'inconclusive', risePct, lowCylinders },
  };
}
