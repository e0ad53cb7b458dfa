import fc from 'fast-check';
import { unit, type Unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  evaluateFlowVolume,
  GENERIC_MIN_FLOW_LPH,
  litersPerHour,
} from '../../../shared/evaluators/flow-volume';

describe('litersPerHour', () => {
  it.each([
    // Hand-worked: 250 mL in 30 s = 0.25 L × (3600 / 30) = 30 L/h.
    { ml: 250, seconds: 30, lph: 30 },
    // Hand-worked: 1000 mL in 60 s = 1 L/min = 60 L/h.
    { ml: 1000, seconds: 60, lph: 60 },
    // NIST SP 811 B.8: 1 US gal = 3785.411784 mL, so 1 gal in 1 h = 3.785411784 L/h.
    { ml: 3785.411784, seconds: 3600, lph: 3.785411784 },
  ])('$ml mL in $seconds s = $lph L/h', ({ ml, seconds, lph }) => {
    expect(litersPerHour(ml, seconds)).toBeCloseTo(lph, 10);
  });

  it('agrees with mathjs units for any volume and time', () => {
    // mathjs: a general-purpose unit library, used as a cross-check.
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1e5, noNaN: true }),
        fc.double({ min: 0.1, max: 1e4, noNaN: true }),
        (ml, s) => {
          const expected = (unit(ml, 'mL').divide(unit(s, 's')) as Unit).toNumber('L/h');
          // Relative tolerance: REFERENCES.md says to compare libraries at 1e-6 or tighter.
          expect(Math.abs(litersPerHour(ml, s) - expected)).toBeLessThanOrEqual(1e-9 * Math.max(expected, 1));
        },
      ),
    );
  });

  it('scales linearly with the volume collected', () => {
    // Property: the rate is volume over time, so k times the volume is k times the rate.
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e4, noNaN: true }),
        fc.double({ min: 1, max: 600, noNaN: true }),
        fc.integer({ min: 1, max: 50 }),
        (ml, s, k) => {
          const ratio = litersPerHour(k * ml, s) / litersPerHour(ml, s);
          expect(ratio).toBeCloseTo(k, 9);
        },
      ),
    );
  });

  it.each([
    { ml: -1, seconds: 30 },
    { ml: 250, seconds: 0 },
    { ml: 250, seconds: -5 },
    { ml: Number.NaN, seconds: 30 },
    { ml: 250, seconds: Number.POSITIVE_INFINITY },
  ])('throws RangeError for $ml mL in $seconds s', ({ ml, seconds }) => {
    expect(() => litersPerHour(ml, seconds)).toThrow(RangeError);
    expect(() => evaluateFlowVolume({ ml, seconds })).toThrow(RangeError);
  });
});

describe('evaluateFlowVolume', () => {
  it('passes exactly the generic 30 L/h and labels it generic', () => {
    // Hand-worked: 250 mL in 30 s = 30 L/h, equal to the generic minimum (equal passes).
    const result = evaluateFlowVolume({ ml: 250, seconds: 30 });
    expect(GENERIC_MIN_FLOW_LPH).toBe(30);
    expect(result.verdict).toBe('pass');
    expect(result.figures).toEqual({
      ml: 250,
      seconds: 30,
      litersPerHour: 30,
      minLph: 30,
      specSource: 'generic',
    });
    // rules.md: a generic limit's reason ends with "(generic limit: confirm in the service manual)".
    expect(result.reason).toMatch(/\(generic limit: confirm in the service manual\)$/);
  });

  it.each([
    // Hand-worked: 240 mL / 30 s = 28.8 L/h, under 30.
    { ml: 240, seconds: 30, lph: 28.8, verdict: 'fail' },
    // Hand-worked: 400 mL / 30 s = 48 L/h.
    { ml: 400, seconds: 30, lph: 48, verdict: 'pass' },
    // Hand-worked: 100 mL / 7 s = 51.428… L/h, shown to 2 decimals.
    { ml: 100, seconds: 7, lph: 51.43, verdict: 'pass' },
  ] as const)('$ml mL in $seconds s is $lph L/h: $verdict', ({ ml, seconds, lph, verdict }) => {
    const result = evaluateFlowVolume({ ml, seconds });
    expect(result.figures.litersPerHour).toBe(lph);
    expect(result.verdict).toBe(verdict);
  });

  it('fails a weak stream and points at a restriction', () => {
    // REFERENCES.md "Fuel delivery": the most common cause of low delivery is a restricted filter or strainer.
    const result = evaluateFlowVolume({ ml: 240, seconds: 30 });
    expect(result.reason).toMatch(/^Flowed 28\.8 L\/h \(240 mL in 30 s\), below the 30 L\/h minimum/);
    expect(result.reason).toMatch(/filter or strainer/);
  });

  it('fails no flow at all', () => {
    const result = evaluateFlowVolume({ ml: 0, seconds: 30 });
    expect(result.verdict).toBe('fail');
    expect(result.figures.litersPerHour).toBe(0);
    expect(result.reason).toMatch(/^No flow/);
  });

  it('judges against a manual minimum without the generic label', () => {
    // Hand-worked: 300 mL / 30 s = 36 L/h, under a 40 L/h manual figure.
    const result = evaluateFlowVolume({ ml: 300, seconds: 30, minLph: 40, specSource: 'manual' });
    expect(result.verdict).toBe('fail');
    expect(result.figures.specSource).toBe('manual');
    expect(result.reason).not.toMatch(/generic/);
  });

  it('throws RangeError for a minimum that is not positive', () => {
    expect(() => evaluateFlowVolume({ ml: 250, seconds: 30, minLph: 0 })).toThrow(RangeError);
    expect(() => evaluateFlowVolume({ ml: 250, seconds: 30, minLph: Number.NaN })).toThrow(RangeError);
  });
});
