import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { divRoundHalfUp, invoiceTotals, lineTotalCents, taxCents, tripFeeCents } from '../../shared/money';

describe('money in integer cents', () => {
  it('rounds tax half up to the cent as SSUTA §324 asks', () => {
    // SSUTA §324 worked figure (REFERENCES.md): $10.99 × 6.25 % = 0.686875 → $0.69.
    expect(taxCents(1099, 62_500)).toBe(69);
    // 8.875 % on $4.00 = 0.355 → $0.36 (a half rounds up).
    expect(taxCents(400, 88_750)).toBe(36);
  });

  it('prices labour hours and marked-up parts exactly', () => {
    expect(lineTotalCents({ quantityMilli: 1500, unitPriceCents: 9500 })).toBe(14_250);
    // $18.75 part with 25 % markup = $23.4375 → $23.44.
    expect(lineTotalCents({ quantityMilli: 1000, unitPriceCents: 1875, markupBps: 2500 })).toBe(2344);
  });

  it('agrees with decimal.js ROUND_HALF_UP (halves away from zero) for any quotient', () => {
    // decimal.js: a general-purpose exact decimal library, the cross-check REFERENCES.md names.
    fc.assert(
      fc.property(
        fc.bigInt({ min: -(10n ** 15n), max: 10n ** 15n }),
        fc.bigInt({ min: 1n, max: 10n ** 9n }),
        (n, d) => {
          const expected = new Decimal(n.toString())
            .div(d.toString())
            .toDecimalPlaces(0, Decimal.ROUND_HALF_UP);
          return divRoundHalfUp(n, d) === expected.toNumber();
        },
      ),
    );
  });

  it('keeps totals equal to the sum of the lines plus tax, with no float drift', () => {
    const line = fc.record({
      quantityMilli: fc.integer({ min: 1, max: 100_000 }),
      unitPriceCents: fc.integer({ min: 0, max: 5_000_000 }),
      markupBps: fc.integer({ min: 0, max: 10_000 }),
      taxable: fc.boolean(),
    });
    fc.assert(
      fc.property(fc.array(line, { maxLength: 30 }), fc.integer({ min: 0, max: 150_000 }), (lines, ppm) => {
        for (const rounding of ['per_line', 'per_invoice'] as const) {
          const totals = invoiceTotals(lines, ppm, rounding);
          const sum = totals.lines.reduce((s, l) => s + l.totalCents, 0);
          if (totals.subtotalCents !== sum || totals.totalCents !== sum + totals.taxCents) return false;
          if (!Number.isSafeInteger(totals.totalCents)) return false;
          // Exact reference: decimal.js on the same lines.
          const exact = lines.reduce(
            (s, l) =>
              s.plus(
                new Decimal(l.quantityMilli)
                  .times(l.unitPriceCents)
                  .times(10_000 + l.markupBps)
                  .div(10_000_000)
                  .toDecimalPlaces(0, Decimal.ROUND_HALF_UP),
              ),
            new Decimal(0),
          );
          if (!exact.eq(totals.subtotalCents)) return false;
        }
        return true;
      }),
    );
  });

  it('taxes per invoice once, or per line and sums, as the business chose', () => {
    const lines = [
      { quantityMilli: 1000, unitPriceCents: 1099, taxable: true },
      { quantityMilli: 1000, unitPriceCents: 1099, taxable: true },
      { quantityMilli: 1000, unitPriceCents: 5000, taxable: false },
    ];
    // 2 × 0.686875 = 1.37375 → 1.37 per invoice; 0.69 + 0.69 = 1.38 per line.
    expect(invoiceTotals(lines, 62_500, 'per_invoice').taxCents).toBe(137);
    expect(invoiceTotals(lines, 62_500, 'per_line').taxCents).toBe(138);
    expect(invoiceTotals(lines, 62_500, 'per_line').totalCents).toBe(1099 * 2 + 5000 + 138);
  });
});

describe('trip fee', () => {
  // A made-up call-out rule for Ridgeback Mobile Moto: $45 covers the first 10 miles, then $1.50 a mile.
  const rule = { tripFeeBaseCents: 4500, tripFeePerMileCents: 150, tripFeeFreeMiles: 10 };

  it.each([
    // Hand-worked: base + 150 ¢ × (ceil(miles) − 10, never below 0).
    [0, 4500], // inside the free miles: base only
    [9.5, 4500],
    [10, 4500], // exactly the free miles: nothing extra
    [10.2, 4650], // the 11th mile is started: 1 × 150
    [24.1, 6750], // ceil 25 − 10 = 15 × 150 = 2250, + 4500
    [25, 6750],
  ])('%d mi → %i ¢', (miles, cents) => {
    expect(tripFeeCents(miles, rule)).toBe(cents);
  });

  it('charges from the first started mile when no miles are free', () => {
    // Hand-worked: ceil(0.5) = 1 mile × 200 ¢ + 1000 ¢.
    expect(tripFeeCents(0.5, { tripFeeBaseCents: 1000, tripFeePerMileCents: 200, tripFeeFreeMiles: 0 })).toBe(
      1200,
    );
  });

  it('does not charge a started mile for float noise in a computed distance', () => {
    // IEEE 754 doubles: odometer 128.3 − 117.3 = 11.000000000000014; the trip is 11 miles, one past the free 10.
    const miles = 128.3 - 117.3;
    expect(miles).toBeGreaterThan(11);
    expect(tripFeeCents(miles, rule)).toBe(4650);
  });

  it('refuses negative or non-finite miles and a rule that is not whole numbers', () => {
    for (const miles of [-0.1, Number.NaN, Infinity])
      expect(() => tripFeeCents(miles, rule)).toThrow(RangeError);
    expect(() => tripFeeCents(5, { ...rule, tripFeePerMileCents: 1.5 })).toThrow(RangeError);
    expect(() => tripFeeCents(5, { ...rule, tripFeeFreeMiles: -1 })).toThrow(RangeError);
  });

  it('never falls as the distance grows and never drops below the base', () => {
    const anyRule = fc.record({
      tripFeeBaseCents: fc.integer({ min: 0, max: 50_000 }),
      tripFeePerMileCents: fc.integer({ min: 0, max: 1_000 }),
      tripFeeFreeMiles: fc.integer({ min: 0, max: 100 }),
    });
    const miles = fc.double({ min: 0, max: 1_000, noNaN: true });
    fc.assert(
      fc.property(anyRule, miles, miles, (r, a, b) => {
        const [near, far] = a <= b ? [a, b] : [b, a];
        const nearFee = tripFeeCents(near, r);
        return nearFee >= r.tripFeeBaseCents && nearFee <= tripFeeCents(far, r);
      }),
    );
  });
});
