import { describe, expect, it } from 'vitest';
import { evaluateRunningPressure, type ThrottlePhase } from '../../../shared/evaluators/running-pressure';
import { psiToKpa } from '../../../shared/units';

/** A 39–47 psi band around the common 43 psi (3 bar) — REFERENCES.md "Fuel delivery", common practice. */
const band = { minKpa: psiToKpa(39), maxKpa: psiToKpa(47) };

const run = (readings: readonly (readonly [ThrottlePhase, number])[], specSource?: 'manual' | 'generic') =>
  evaluateRunningPressure({
    points: readings.map(([phase, psi]) => ({ phase, kpa: psiToKpa(psi) })),
    ...band,
    specSource,
  });

describe('evaluateRunningPressure', () => {
  it.each([
    // PRODUCT.md "Fuel delivery check": every phase must stay in the spec band.
    {
      name: 'all in band',
      readings: [
        ['idle', 43],
        ['snap', 41],
        ['held', 42],
      ],
      verdict: 'pass',
      dip: [],
      high: [],
    },
    {
      name: 'dip only on snap',
      readings: [
        ['idle', 43],
        ['snap', 35],
        ['held', 42],
      ],
      verdict: 'fail',
      dip: ['snap'],
      high: [],
    },
    {
      name: 'dip on snap and held',
      readings: [
        ['idle', 43],
        ['snap', 36],
        ['held', 38],
      ],
      verdict: 'fail',
      dip: ['snap', 'held'],
      high: [],
    },
    {
      name: 'high at idle',
      readings: [
        ['idle', 50],
        ['snap', 45],
        ['held', 44],
      ],
      verdict: 'fail',
      dip: [],
      high: ['idle'],
    },
    {
      name: 'both ways',
      readings: [
        ['idle', 49],
        ['snap', 34],
        ['held', 42],
      ],
      verdict: 'fail',
      dip: ['snap'],
      high: ['idle'],
    },
    {
      name: 'held missing',
      readings: [
        ['idle', 43],
        ['snap', 42],
      ],
      verdict: 'warn',
      dip: [],
      high: [],
    },
    {
      name: 'held missing, snap dips',
      readings: [
        ['idle', 43],
        ['snap', 30],
      ],
      verdict: 'fail',
      dip: ['snap'],
      high: [],
    },
  ] as const)('$name: $verdict', ({ readings, verdict, dip, high }) => {
    const result = run(readings);
    expect(result.verdict).toBe(verdict);
    expect(result.figures.dipPhases).toEqual(dip);
    expect(result.figures.highPhases).toEqual(high);
  });

  it('says a dip on snap means lean running, filter or strainer first', () => {
    // PRODUCT.md "Fuel delivery check" lists the lean causes, most likely first.
    const result = run([
      ['idle', 43],
      ['snap', 35],
      ['held', 42],
    ]);
    expect(result.reason).toMatch(
      /^Dips to 35 psi \(241\.3 kPa\) on snap, below the 39 psi \(268\.9 kPa\) minimum: the engine runs lean/,
    );
    expect(result.reason).toMatch(/restricted filter or strainer most likely, then pump, supply voltage/);
    // NIST SP 811 B.8: 35 psi = 241.316 5 kPa.
    expect(result.figures.lowestKpa).toBeCloseTo(35 * 6.894757293168, 9);
  });

  it('blames the regulator or return when it only runs high', () => {
    const result = run(
      [
        ['idle', 50],
        ['snap', 45],
        ['held', 44],
      ],
      'manual',
    );
    expect(result.reason).toMatch(/^Rises to 50 psi .* at idle, above the 47 psi .* maximum: .*regulator/);
    expect(result.reason).toMatch(/return/);
    expect(result.reason).not.toMatch(/generic/);
  });

  it('names the missing phases when it warns', () => {
    const result = run([['snap', 42]]);
    expect(result.verdict).toBe('warn');
    expect(result.reason).toMatch(/^No reading at idle and at held throttle/);
  });

  it('passes readings exactly on the band edges', () => {
    // Edges belong to the band: "below" the minimum or "above" the maximum fails, not equal.
    expect(
      run([
        ['idle', 39],
        ['snap', 47],
        ['held', 39],
      ]).verdict,
    ).toBe('pass');
  });

  it('labels the generic band', () => {
    // rules.md: a generic limit's reason ends with "(generic limit: confirm in the service manual)".
    expect(
      run([
        ['idle', 43],
        ['snap', 41],
        ['held', 42],
      ]).reason,
    ).toMatch(/\(generic limit: confirm in the service manual\)$/);
  });

  it.each([
    { name: 'no readings', input: { points: [], ...band } },
    { name: 'NaN reading', input: { points: [{ phase: 'idle', kpa: Number.NaN }], ...band } },
    {
      name: 'infinite limit',
      input: { points: [{ phase: 'idle', kpa: 290 }], minKpa: 250, maxKpa: Infinity },
    },
    {
      name: 'minimum above maximum',
      input: { points: [{ phase: 'idle', kpa: 290 }], minKpa: 400, maxKpa: 250 },
    },
    { name: 'unknown phase', input: { points: [{ phase: 'cruise' as ThrottlePhase, kpa: 290 }], ...band } },
  ] as const)('throws RangeError for $name', ({ input }) => {
    expect(() => evaluateRunningPressure(input)).toThrow(RangeError);
  });
});
