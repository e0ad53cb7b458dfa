import { addDays, eachDayOfInterval, format, parseISO } from 'date-fns';
import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { IRS_BUSINESS_RATES, mileageDeductionCents, rateOn, ratesInYear } from '../../shared/mileage';

describe('IRS business standard mileage rates', () => {
  it.each([
    // REFERENCES.md, "Mileage — IRS business standard mileage rates": each rate with its notice.
    ['2023-01-01', 655, 'Notice 2023-03'],
    ['2023-12-31', 655, 'Notice 2023-03'],
    ['2024-02-29', 670, 'Notice 2024-08'],
    ['2024-12-31', 670, 'Notice 2024-08'],
    ['2025-01-01', 700, 'Notice 2025-05'],
    ['2025-07-04', 700, 'Notice 2025-05'],
    ['2026-01-01', 725, 'Notice 2026-10'],
    ['2026-12-31', 725, 'Notice 2026-10'],
  ])('on %s the rate is %i tenths of a cent per mile (IRS %s)', (date, tenths, notice) => {
    const rate = rateOn(date);
    expect(rate?.tenthsOfCentPerMile).toBe(tenths);
    expect(rate?.source).toContain(notice);
    expect(rate?.source).not.toContain('from memory');
  });

  it.each([
    // From memory (REFERENCES.md records only the 2022 pair, also from memory): 2019 58 ¢,
    // 2020 57.5 ¢, 2021 56 ¢, 2022 58.5 ¢ to June 30 then 62.5 ¢ from July 1.
    ['2019-06-15', 580],
    ['2020-01-01', 575],
    ['2021-12-31', 560],
    ['2022-01-01', 585],
    ['2022-06-30', 585],
    ['2022-07-01', 625],
    ['2022-12-31', 625],
  ])('on %s the rate is %i tenths of a cent per mile (from memory, and so marked)', (date, tenths) => {
    const rate = rateOn(date);
    expect(rate?.tenthsOfCentPerMile).toBe(tenths);
    expect(rate?.source).toContain('from memory');
  });

  it('knows no rate before 2019 or after 2026', () => {
    expect(rateOn('2018-12-31')).toBeNull();
    expect(rateOn('2027-01-01')).toBeNull();
    expect(ratesInYear(2018)).toEqual([]);
    expect(ratesInYear(2027)).toEqual([]);
  });

  it('refuses text that is not a calendar day, since ISO dates only compare as text when well formed', () => {
    for (const date of ['2024-1-5', '2023-02-29', '2024-13-01', '2024-00-10', '20240105', '', 'soon']) {
      expect(() => rateOn(date)).toThrow(RangeError);
    }
    // 2024 is a leap year (Gregorian rule: divisible by 4, not a century).
    expect(rateOn('2024-02-29')).not.toBeNull();
  });

  it('lists both 2022 rates for the year and one rate for other years', () => {
    // The mid-year change, from memory (REFERENCES.md): 58.5 ¢ then 62.5 ¢ from July 1.
    expect(ratesInYear(2022).map((r) => r.tenthsOfCentPerMile)).toEqual([585, 625]);
    // Notice 2024-08: 67 ¢ for all of 2024.
    expect(ratesInYear(2024).map((r) => r.tenthsOfCentPerMile)).toEqual([670]);
    expect(ratesInYear(2024.5)).toEqual([]);
  });

  it('covers 2019-01-01 to 2026-12-31 with contiguous, non-overlapping ranges', () => {
    // Day arithmetic cross-checked with date-fns (addDays), not with the module's own comparison.
    expect(IRS_BUSINESS_RATES[0]?.from).toBe('2019-01-01');
    expect(IRS_BUSINESS_RATES.at(-1)?.to).toBe('2026-12-31');
    for (let i = 1; i < IRS_BUSINESS_RATES.length; i += 1) {
      const previous = IRS_BUSINESS_RATES[i - 1]!;
      const next = IRS_BUSINESS_RATES[i]!;
      expect(next.from).toBe(format(addDays(parseISO(previous.to), 1), 'yyyy-MM-dd'));
      expect(next.from <= next.to).toBe(true);
    }
    const days = eachDayOfInterval({ start: parseISO('2019-01-01'), end: parseISO('2026-12-31') });
    for (const day of days) {
      const date = format(day, 'yyyy-MM-dd');
      const holding = IRS_BUSINESS_RATES.filter((r) => r.from <= date && date <= r.to);
      expect(holding).toHaveLength(1);
      expect(rateOn(date)).toBe(holding[0]);
    }
  });
});

describe('mileage deduction in cents', () => {
  it.each([
    // Hand-worked: miles × ¢/mile, then half up to the cent.
    ['1234.5', 725, 89_501], // 1234.5 × 72.5 = 89 501.25 → 89 501
    [1234.5, 725, 89_501], // the same as a number
    [100, 670, 6_700], // 100 × 67 = 6 700
    [1, 655, 66], // 1 × 65.5 = 65.5, a half → 66
    ['3', 625, 188], // 3 × 62.5 = 187.5, a half → 188
    ['12.345', 700, 864], // 12.345 × 70 = 864.15 → 864
    ['0.001', 580, 0], // 0.001 × 58 = 0.058 → 0
    ['0.009', 580, 1], // 0.009 × 58 = 0.522 → 1
    ['1.5000', 700, 105], // trailing zeros add nothing: 1.5 × 70 = 105
    [' 10 ', 725, 725], // 10 × 72.5 = 725
    ['.5', 700, 35], // 0.5 × 70 = 35
    [0, 725, 0],
  ])('%j mi at %i tenths of a cent → %i ¢', (miles, tenths, cents) => {
    expect(mileageDeductionCents(miles, tenths)).toBe(cents);
  });

  it('refuses negative, non-numeric or over-precise miles and a rate that is not whole tenths', () => {
    const bad: (number | string)[] = [-1, '-1', Number.NaN, Infinity, '1.2345', 0.1 + 0.2, 'abc', '', '.'];
    for (const miles of [...bad, '1e3', '1,5', 1e-7]) {
      expect(() => mileageDeductionCents(miles, 700)).toThrow(RangeError);
    }
    expect(() => mileageDeductionCents(10, 72.5)).toThrow(RangeError);
    expect(() => mileageDeductionCents(10, -1)).toThrow(RangeError);
    // 10^20 mi × 72.5 ¢ is far past Number.MAX_SAFE_INTEGER cents.
    expect(() => mileageDeductionCents('100000000000000000000', 725)).toThrow(RangeError);
  });

  it('agrees with decimal.js ROUND_HALF_UP for 0–100 000 miles with 0–3 decimals at every rate', () => {
    // decimal.js: exact decimal arithmetic, the cross-check REFERENCES.md names for money.
    const miles = fc
      .integer({ min: 0, max: 3 })
      .chain((places) =>
        fc
          .integer({ min: 0, max: 100_000 * 10 ** places })
          .map((units) => new Decimal(units).div(10 ** places).toFixed(places)),
      );
    const rates = IRS_BUSINESS_RATES.map((r) => r.tenthsOfCentPerMile);
    fc.assert(
      fc.property(miles, fc.boolean(), (text, asNumber) =>
        rates.every((tenths) => {
          const expected = new Decimal(text).times(tenths).div(10).toDecimalPlaces(0, Decimal.ROUND_HALF_UP);
          return mileageDeductionCents(asNumber ? Number(text) : text, tenths) === expected.toNumber();
        }),
      ),
      { numRuns: 2000 },
    );
  });
});
