import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { countOf, formatCalendarDate, formatDecimal } from '../../src/lib/format';
import { formatCents } from '../../src/lib/money';

// ECMA-402's en-US dollar format, fed the exact decimal string decimal.js makes of cents ÷ 100 (a
// string input is formatted exactly, with no float in between): an independent cross-check.
const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
const viaDecimal = (cents: number) => usd.format(new Decimal(cents).div(100).toFixed(2) as unknown as number);

describe('formatCents', () => {
  it.each([
    // Hand conversions: 100 ¢ to the dollar, US digit grouping.
    [0, '$0.00'],
    [5, '$0.05'],
    [99, '$0.99'],
    [100, '$1.00'],
    [147_145, '$1,471.45'],
    [123_456_789, '$1,234,567.89'],
    [-1_200, '-$12.00'],
  ])('writes %i cents as %s', (cents, text) => {
    expect(formatCents(cents)).toBe(text);
  });

  it('agrees with decimal.js and Intl for any whole number of cents', () => {
    fc.assert(
      fc.property(fc.integer({ min: -(10 ** 13), max: 10 ** 13 }), (cents) => {
        expect(formatCents(cents)).toBe(viaDecimal(cents));
      }),
    );
  });

  it.each([
    // Whole dollars, halves away from zero (decimal.js ROUND_HALF_UP is the same rule).
    [149, '$1'],
    [150, '$2'],
    [-150, '-$2'],
    [150_049, '$1,500'],
  ])('rounds %i cents to whole dollars as %s for chart axes', (cents, text) => {
    expect(formatCents(cents, { wholeDollars: true })).toBe(text);
    expect(text.replace(/[$,]/g, '')).toBe(
      new Decimal(cents).div(100).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toString(),
    );
  });

  it.each([12.5, Number.NaN, Infinity, 2 ** 53])('refuses %s, which is no whole number of cents', (value) => {
    expect(() => formatCents(value)).toThrow(RangeError);
  });
});

describe('numbers and dates', () => {
  it.each([
    // Rounding to the places asked, trailing zeros dropped (ECMA-402 maximumFractionDigits).
    [185.234, 1, '185.2'],
    [6.25, 2, '6.25'],
    [6, 2, '6'],
    [18_841, 1, '18,841'],
  ])('writes %d to at most %i places as %s', (value, places, text) => {
    expect(formatDecimal(value, places)).toBe(text);
  });

  it('counts in the singular for one only', () => {
    expect([0, 1, 2].map((n) => countOf(n, 'invoice'))).toEqual(['0 invoices', '1 invoice', '2 invoices']);
  });

  it('reads a calendar date as that day, whatever the time zone', () => {
    // 2026-11-16 is a Monday (JavaScript's own Date.UTC, ECMA-262, read in UTC so no zone can shift it).
    expect(new Date(Date.UTC(2026, 10, 16)).getUTCDay()).toBe(1);
    expect(formatCalendarDate('2026-11-16', 'weekday')).toBe('Mon, Nov 16');
    expect(formatCalendarDate('2026-10-10')).toBe('Oct 10, 2026');
  });

  it.each(['2026-02-30', '2026-13-01', '16/11/2026', ''])('refuses %j, which is no calendar date', (text) => {
    expect(() => formatCalendarDate(text)).toThrow(RangeError);
  });
});
