import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseScaled, scaledToText } from '../../src/lib/decimal-input';

// decimal.js multiplies the typed decimal exactly (no float in between): an independent reference
// for "the text × 10^places" that parseScaled computes by moving digits.
const viaDecimal = (text: string, places: number) =>
  new Decimal(text.replaceAll(',', '').replace('$', '')).times(new Decimal(10).pow(places)).toNumber();

describe('parseScaled', () => {
  it.each([
    // Hand conversions: 100 cents to the dollar, 10 000 ppm to the percent.
    ['95', 2, 9500],
    ['95.5', 2, 9550],
    ['$1,234.56', 2, 123_456],
    [' 0.07 ', 2, 7],
    ['.5', 2, 50],
    ['12.', 2, 1200],
    ['6.25', 4, 62_500],
    ['8.875', 4, 88_750],
    ['25', 2, 2500],
    ['007', 0, 7],
  ])('reads %j at %i places as %i', (text, places, value) => {
    expect(parseScaled(text, places)).toEqual({ ok: true, value });
  });

  it.each([
    ['', 2, 'is not a number'],
    ['.', 2, 'is not a number'],
    ['1.2.3', 2, 'is not a number'],
    ['1,23', 2, 'is not a number'],
    ['12,3456', 2, 'is not a number'],
    ['1e3', 2, 'is not a number'],
    ['12.345', 2, 'takes at most 2 decimals'],
    ['1.5', 0, 'must be a whole number'],
    ['-3', 2, 'cannot be negative'],
    ['99999999999999999', 2, 'is too large'],
  ])('refuses %j at %i places: %s', (text, places, reason) => {
    expect(parseScaled(text, places)).toEqual({ ok: false, reason });
  });

  it('takes a minus sign only when asked to', () => {
    expect(parseScaled('-12.50', 2, { allowNegative: true })).toEqual({ ok: true, value: -1250 });
  });

  it('agrees with decimal.js on any amount typed with up to the allowed decimals', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10 ** 12 }),
        fc.integer({ min: 0, max: 4 }),
        fc.boolean(),
        (scaled, places, grouped) => {
          const digits = String(scaled).padStart(places + 1, '0');
          const whole = digits.slice(0, digits.length - places);
          const text = `${grouped ? whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',') : whole}${places ? `.${digits.slice(-places)}` : ''}`;
          expect(parseScaled(text, places)).toEqual({ ok: true, value: viaDecimal(text, places) });
        },
      ),
    );
  });
});

describe('scaledToText', () => {
  it.each([
    [9500, 2, false, '95.00'],
    [7, 2, false, '0.07'],
    [62_500, 4, true, '6.25'],
    [88_750, 4, true, '8.875'],
    [2500, 2, true, '25'],
    [-1250, 2, false, '-12.50'],
  ])('writes %i at %i places (trim %s) as %j', (value, places, trim, text) => {
    expect(scaledToText(value, places, { trim })).toBe(text);
  });

  it('reads back as it was written, for any whole number', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10 ** 12 }),
        fc.integer({ min: 0, max: 4 }),
        fc.boolean(),
        (value, places, trim) => {
          expect(parseScaled(scaledToText(value, places, { trim }), places)).toEqual({ ok: true, value });
        },
      ),
    );
  });
});
