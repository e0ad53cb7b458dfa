import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateCompression } from '../../../shared/evaluators/compression';
import { psiToKpa } from '../../../shared/units';

const psi = (...values: number[]) => values.map(psiToKpa);

describe('evaluateCompression', () => {
  it.each([
    // spreadPct = (max − min) / max × 100 (CONTRACT.md); bands 10 % / 25 % are common practice,
    // no published source (REFERENCES.md "Compression and leak-down").
    // Hand-worked: (152 − 148) / 152 = 2.63 %.
    { readings: [150, 148, 152, 150], spread: 2.6, lowestPct: 97.4, verdict: 'pass', low: [] },
    // Hand-worked: (160 − 130) / 160 = 18.75 %; 90 % of 160 is 144, so cylinder 3 is low.
    { readings: [160, 150, 130, 158], spread: 18.8, lowestPct: 81.3, verdict: 'warn', low: [3] },
    // Hand-worked: (160 − 100) / 160 = 37.5 %, the lowest 62.5 % of the highest.
    { readings: [160, 100, 158, 140], spread: 37.5, lowestPct: 62.5, verdict: 'fail', low: [2, 4] },
    // Edges (inclusive): 10 % passes, 25 % warns, 25.1 % fails.
    { readings: [100, 90], spread: 10, lowestPct: 90, verdict: 'pass', low: [] },
    { readings: [100, 75], spread: 25, lowestPct: 75, verdict: 'warn', low: [2] },
    { readings: [100, 74.9], spread: 25.1, lowestPct: 74.9, verdict: 'fail', low: [2] },
  ] as const)(
    '$readings psi: spread $spread %, $verdict',
    ({ readings, spread, lowestPct, verdict, low }) => {
      const result = evaluateCompression({ kpa: psi(...readings) });
      expect(result.figures.spreadPct).toBe(spread);
      expect(result.figures.lowestPctOfHighest).toBe(lowestPct);
      expect(result.verdict).toBe(verdict);
      expect(result.figures.lowCylinders).toEqual(low);
      expect(result.figures.cylinders).toBe(readings.length);
    },
  );

  it('advises the wet test when a cylinder is low', () => {
    // REFERENCES.md: a wet test that raises a low cylinder points to rings; no rise to valves or gasket.
    const result = evaluateCompression({ kpa: psi(160, 150, 130, 158) });
    expect(result.reason).toMatch(/^Cylinder 3 low: spread 18\.8 %/);
    expect(result.reason).toMatch(/a rise points to rings, no rise to valves or head gasket/);
    expect(result.reason).toMatch(/\(generic limit: confirm in the service manual\)$/);
    expect(evaluateCompression({ kpa: psi(150, 148) }).reason).not.toMatch(/wet test/);
  });

  it('fails a cylinder below the manual minimum and names it', () => {
    const result = evaluateCompression({
      kpa: psi(150, 148, 110, 150),
      minKpa: psiToKpa(120),
      specSource: 'manual',
    });
    expect(result.verdict).toBe('fail');
    expect(result.figures.belowMinCylinders).toEqual([3]);
    expect(result.figures.specSource).toBe('manual');
    expect(result.reason).toMatch(/^Cylinder 3 below the 120 psi \(827\.4 kPa\) minimum/);
    expect(result.reason).not.toMatch(/generic/);
  });

  it('fails evenly low cylinders that are all under the minimum', () => {
    // Spread 0 % passes on its own; the minimum still decides.
    const result = evaluateCompression({ kpa: psi(100, 100), minKpa: psiToKpa(120) });
    expect(result.verdict).toBe('fail');
    expect(result.figures.belowMinCylinders).toEqual([1, 2]);
    expect(result.figures.spreadPct).toBe(0);
    expect(result.figures.specSource).toBe('generic');
  });

  it('passes a reading exactly on the minimum', () => {
    const result = evaluateCompression({ kpa: psi(120, 121), minKpa: psiToKpa(120) });
    expect(result.verdict).toBe('pass');
  });

  it('passes one cylinder against nothing and asks for the manual figure', () => {
    const result = evaluateCompression({ kpa: psi(150) });
    expect(result.verdict).toBe('pass');
    expect(result.figures.spreadPct).toBe(0);
    expect(result.figures.minKpa).toBeNull();
    expect(result.figures.specSource).toBeNull();
    expect(result.reason).toMatch(
      /^One cylinder at 150 psi \(1034\.2 kPa\): compare with the service manual's figure$/,
    );
    expect(evaluateCompression({ kpa: psi(150), minKpa: psiToKpa(160) }).verdict).toBe('fail');
  });

  it('keeps the spread between 0 and 100 % whatever the order of the cylinders', () => {
    // Properties of (max − min) / max for positive readings; max and min ignore order.
    const readings = fc.array(fc.double({ min: 1, max: 2000, noNaN: true }), { minLength: 1, maxLength: 12 });
    const withOrder = readings.chain((values) =>
      fc.tuple(fc.constant(values), fc.shuffledSubarray(values, { minLength: values.length })),
    );
    fc.assert(
      fc.property(withOrder, ([values, shuffled]) => {
        const a = evaluateCompression({ kpa: values });
        const b = evaluateCompression({ kpa: shuffled });
        expect(a.figures.spreadPct).toBeGreaterThanOrEqual(0);
        expect(a.figures.spreadPct).toBeLessThanOrEqual(100);
        expect(b.figures.spreadPct).toBe(a.figures.spreadPct);
        expect(b.verdict).toBe(a.verdict);
        expect(b.figures.lowCylinders.length).toBe(a.figures.lowCylinders.length);
      }),
    );
  });

  it.each([
    { name: 'no readings', kpa: [] },
    { name: 'a zero reading', kpa: [1000, 0] },
    { name: 'a negative reading', kpa: [1000, -5] },
    { name: 'NaN', kpa: [1000, Number.NaN] },
    { name: 'Infinity', kpa: [Number.POSITIVE_INFINITY] },
  ])('throws RangeError for $name', ({ kpa }) => {
    expect(() => evaluateCompression({ kpa })).toThrow(RangeError);
  });
});
