import fc from 'fast-check';
import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  UNITS,
  UnitError,
  convert,
  dimensionOf,
  formatMeasurement,
  kpaToPsi,
  parseMeasurement,
  psiToKpa,
  readingToCanonical,
  type UnitId,
} from '../../shared/units';

/** |actual − expected| within `tolerance` of |expected|. */
function expectRelative(actual: number, expected: number, tolerance: number) {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

const UNIT_IDS = Object.keys(UNITS) as UnitId[];

describe('conversion factors (NIST SP 811, Appendix B.8, and the exact definitions behind them)', () => {
  it('converts psi and bar', () => {
    // NIST SP 811 B.8 / REFERENCES.md: 1 psi = 6.894 757 293 168 kPa (from 1 lbf = 0.453 592 37 kg ×
    // 9.806 65 m/s² over (0.0254 m)²); 1 bar = 100 kPa exactly = 14.503 773 773 psi.
    expectRelative(convert(1, 'psi', 'kPa'), 6.894757293168, 1e-9);
    expectRelative(psiToKpa(1), 6.894757293168, 1e-9);
    expectRelative(convert(1, 'bar', 'psi'), 14.503773773, 1e-9);
    expectRelative(kpaToPsi(100), 14.503773773, 1e-9);
    expect(convert(1, 'bar', 'kPa')).toBe(100);
  });

  it('converts US gallons and fluid ounces', () => {
    // REFERENCES.md: 1 US gal = 231 in³ = 3.785 411 784 L exactly; 1 US fl oz = 1/128 gal =
    // 29.573 529 562 5 mL exactly. Compared to 1e-15: the decimal itself is not a binary double.
    expectRelative(convert(1, 'gal', 'L'), 3.785411784, 1e-15);
    expectRelative(convert(1, 'floz', 'mL'), 29.5735295625, 1e-15);
    // 128 fl oz = 1 gal, by the definition above.
    expectRelative(convert(128, 'floz', 'gal'), 1, 1e-15);
  });

  it('converts miles to kilometres', () => {
    // REFERENCES.md: 1 mile = 1.609 344 km exactly (international mile).
    expect(convert(1, 'mi', 'km')).toBe(1.609344);
    expectRelative(convert(1.609344, 'km', 'mi'), 1, 1e-15);
  });

  it.each([
    // °F = °C × 9/5 + 32 (REFERENCES.md): −40 is where the scales meet; water freezes at 32 °F / 0 °C
    // and boils at 212 °F / 100 °C at standard pressure (the definitions of the two scales).
    [-40, -40],
    [32, 0],
    [212, 100],
  ])('%d °F is %d °C and back', (fahrenheit, celsius) => {
    expect(convert(fahrenheit, 'F', 'C')).toBe(celsius);
    expect(convert(celsius, 'C', 'F')).toBe(fahrenheit);
  });

  it('converts flow', () => {
    // 1 gal/h = 3.785 411 784 L/h (the gallon's definition above, per hour).
    expectRelative(convert(1, 'gal/h', 'L/h'), 3.785411784, 1e-15);
    // Arithmetic: 100 mL/min × 60 min/h = 6 000 mL/h = 6 L/h.
    expectRelative(convert(100, 'mL/min', 'L/h'), 6, 1e-15);
  });
});

describe('every linear unit agrees with mathjs', () => {
  // mathjs (general-purpose unit library) names used: kPa psi bar V mV mL L gal floz L/h mL/min gal/h
  // km mi s min h ohm kohm, and degC degF for temperature. mathjs's gal and floz are the US liquid
  // ones. `ratio` has no mathjs counterpart and no other unit in its dimension, so it has no pair.
  const MATHJS_NAME: Record<Exclude<UnitId, 'ratio' | 'C' | 'F'>, string> = {
    kPa: 'kPa',
    psi: 'psi',
    bar: 'bar',
    V: 'V',
    mV: 'mV',
    mL: 'mL',
    L: 'L',
    gal: 'gal',
    floz: 'floz',
    'L/h': 'L/h',
    'mL/min': 'mL/min',
    'gal/h': 'gal/h',
    km: 'km',
    mi: 'mi',
    s: 's',
    min: 'min',
    h: 'h',
    ohm: 'ohm',
    kohm: 'kohm',
  };
  const linear = Object.keys(MATHJS_NAME) as (keyof typeof MATHJS_NAME)[];

  it('names every linear unit Vanbay knows', () => {
    expect([...linear].sort()).toEqual(UNIT_IDS.filter((id) => !['ratio', 'C', 'F'].includes(id)).sort());
  });

  it('gives the same factor for every pair of one dimension, to 1e-9 (mathjs carries psi to ~1e-11)', () => {
    let pairs = 0;
    for (const from of linear) {
      for (const to of linear) {
        if (from === to || dimensionOf(from) !== dimensionOf(to)) continue;
        for (const value of [1, 43, 0.25, -5]) {
          expectRelative(
            convert(value, from, to),
            unit(value, MATHJS_NAME[from]).toNumber(MATHJS_NAME[to]),
            1e-9,
          );
        }
        pairs += 1;
      }
    }
    // 3 pressure + 2 voltage + 4 volume + 3 flow + 2 distance + 3 time + 2 resistance units.
    expect(pairs).toBe(3 * 2 + 2 * 1 + 4 * 3 + 3 * 2 + 2 * 1 + 3 * 2 + 2 * 1);
  });

  it('converts temperature as mathjs degF/degC do', () => {
    for (const value of [-40, -5, 0, 21.1, 32, 98.6, 212, 500]) {
      // Absolute tolerance near 0: mathjs goes through kelvin, so its 0-ish results carry ~1e-14 noise.
      expect(convert(value, 'F', 'C')).toBeCloseTo(unit(value, 'degF').toNumber('degC'), 9);
      expect(convert(value, 'C', 'F')).toBeCloseTo(unit(value, 'degC').toNumber('degF'), 9);
    }
  });
});

describe('round trips', () => {
  it('convert(convert(x, a, b), b, a) ≈ x for every pair of units of one dimension', () => {
    const pairs = UNIT_IDS.flatMap((a) =>
      UNIT_IDS.filter((b) => dimensionOf(a) === dimensionOf(b)).map((b) => [a, b] as const),
    );
    fc.assert(
      fc.property(fc.constantFrom(...pairs), fc.double({ min: -1e9, max: 1e9, noNaN: true }), ([a, b], x) => {
        const back = convert(convert(x, a, b), b, a);
        // Relative 1e-12; the scale has a floor of 1 because the 32 °F offset makes the error
        // absolute (about 32 × 2⁻⁵² ≈ 7e-15) for temperatures near 0.
        return Math.abs(back - x) <= 1e-12 * Math.max(Math.abs(x), 1);
      }),
      { numRuns: 2000 },
    );
  });

  it('refuses to convert between dimensions', () => {
    expect(() => convert(43, 'psi', 'L')).toThrow(UnitError);
    expect(() => convert(12, 'V', 'kPa')).toThrow(UnitError);
    expect(() => convert(20, 'C', 'km')).toThrow(UnitError);
  });
});

describe('reading what the mechanic typed', () => {
  it.each([
    ['43psi', 43, 'psi'],
    ['3 bar', 3, 'bar'],
    ['250 mL', 250, 'mL'],
    ['12.4V', 12.4, 'V'],
    ['-5 °C', -5, 'C'],
    ['1.5 gal/h', 1.5, 'gal/h'],
    ['40 lph', 40, 'L/h'],
    ['0.5L', 0.5, 'L'],
  ])('reads %s', (text, value, unitId) => {
    expect(parseMeasurement(text)).toEqual({ value, unit: unitId });
  });

  it('refuses an unknown unit and text that is not a number', () => {
    expect(() => parseMeasurement('43 furlongs')).toThrow(UnitError);
    expect(() => parseMeasurement('43 furlongs')).toThrow(/furlongs/);
    expect(() => parseMeasurement('abc')).toThrow(UnitError);
  });

  it('refuses a decimal comma and says to use a point', () => {
    expect(() => parseMeasurement('3,5 bar')).toThrow(UnitError);
    expect(() => parseMeasurement('3,5 bar')).toThrow(/point/);
  });

  it('needs a unit unless a default is given', () => {
    expect(() => parseMeasurement('43')).toThrow(UnitError);
    expect(parseMeasurement('43', { defaultUnit: 'psi' })).toEqual({ value: 43, unit: 'psi' });
  });

  it('refuses a voltage where a pressure is expected', () => {
    expect(() => parseMeasurement('12.4V', { dimension: 'pressure' })).toThrow(UnitError);
    expect(parseMeasurement('43psi', { dimension: 'pressure' })).toEqual({ value: 43, unit: 'psi' });
  });

  it('stores a pressure typed in psi as kPa and keeps what was typed', () => {
    const reading = readingToCanonical('pressure', '43psi');
    expect(reading.unit).toBe('kPa');
    // 43 × 6.894 757 293 168 = 296.474 563 606 224 kPa (NIST SP 811 B.8 factor, arithmetic).
    expectRelative(reading.value, 296.474563606224, 1e-12);
    expect(reading).toMatchObject({ enteredValue: 43, enteredUnit: 'psi' });
    expect(() => readingToCanonical('pressure', '12.4V')).toThrow(UnitError);
  });

  it('formats a value with its unit label', () => {
    expect(formatMeasurement(43, 'psi')).toBe('43 psi');
    expect(formatMeasurement(21.14, 'C')).toBe('21.1 °C');
    expect(formatMeasurement(14.7, 'ratio')).toBe('14.7:1');
  });
});
