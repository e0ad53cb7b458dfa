/**
 * IRS business standard mileage rates and the deduction they give. Rates are kept as date ranges,
 * not one per year, because the IRS has changed the rate mid-year (July 2022). Rates are held in
 * tenths of a cent (65.5 ¢ = 655) and miles in thousandths so the product is an exact integer,
 * rounded to the cent once.
 */
import { divRoundHalfUp } from './money';

export interface MileageRate {
  /** First day the rate applies, YYYY-MM-DD, inclusive. */
  from: string;
  /** Last day the rate applies, YYYY-MM-DD, inclusive. */
  to: string;
  tenthsOfCentPerMile: number;
  /** The IRS document that set the rate; "from memory" where it was not checked against the document. */
  source: string;
}

/** Ascending, contiguous, non-overlapping. */
export const IRS_BUSINESS_RATES: readonly MileageRate[] = [
  {
    from: '2019-01-01',
    to: '2019-12-31',
    tenthsOfCentPerMile: 580,
    source: 'IRS Notice 2019-02 (from memory)',
  },
  {
    from: '2020-01-01',
    to: '2020-12-31',
    tenthsOfCentPerMile: 575,
    source: 'IRS Notice 2020-05 (from memory)',
  },
  {
    from: '2021-01-01',
    to: '2021-12-31',
    tenthsOfCentPerMile: 560,
    source: 'IRS Notice 2021-02 (from memory)',
  },
  {
    from: '2022-01-01',
    to: '2022-06-30',
    tenthsOfCentPerMile: 585,
    source: 'IRS Notice 2022-03 (from memory)',
  },
  {
    from: '2022-07-01',
    to: '2022-12-31',
    tenthsOfCentPerMile: 625,
    source: 'IRS Announcement 2022-13, mid-year increase (from memory)',
  },
  { from: '2023-01-01', to: '2023-12-31', tenthsOfCentPerMile: 655, source: 'IRS Notice 2023-03' },
  { from: '2024-01-01', to: '2024-12-31', tenthsOfCentPerMile: 670, source: 'IRS Notice 2024-08' },
  { from: '2025-01-01', to: '2025-12-31', tenthsOfCentPerMile: 700, source: 'IRS Notice 2025-05' },
  { from: '2026-01-01', to: '2026-12-31', tenthsOfCentPerMile: 725, source: 'IRS Notice 2026-10' },
];

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True for a real calendar day written YYYY-MM-DD; ISO dates of that shape compare as strings. */
function isCalendarDate(date: string): boolean {
  const match = ISO_DATE.exec(date);
  if (!match) return false;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const probe = new Date(Date.UTC(year, month - 1, day));
  return probe.getUTCFullYear() === year && probe.getUTCMonth() === month - 1 && probe.getUTCDate() === day;
}

/**
 * The rate in force on a day, or null for a day no rate is known for.
 * @throws RangeError when `date` is not a calendar day written YYYY-MM-DD.
 */
export function rateOn(date: string): MileageRate | null {
  if (!isCalendarDate(date)) throw new RangeError(`not a date (YYYY-MM-DD): ${date}`);
  return IRS_BUSINESS_RATES.find((rate) => rate.from <= date && date <= rate.to) ?? null;
}

/** Every rate in force on some day of a year, in date order: two for 2022, none for an unknown year. */
export function ratesInYear(year: number): MileageRate[] {
  if (!Number.isInteger(year)) return [];
  const first = `${String(year).padStart(4, '0')}-01-01`;
  const last = `${String(year).padStart(4, '0')}-12-31`;
  return IRS_BUSINESS_RATES.filter((rate) => rate.from <= last && first <= rate.to);
}

/** Up to three decimals; trailing zeros past them (1.5000) say nothing more and are allowed. */
const MILES_TEXT = /^(\d*)(?:\.(\d*))?$/;

/**
 * Miles as an exact count of thousandths of a mile.
 * @throws RangeError for a negative, non-finite or non-numeric value, or more than 3 decimals.
 */
function milesInThousandths(miles: number | string): bigint {
  if (typeof miles === 'number' && (!Number.isFinite(miles) || miles < 0)) {
    throw new RangeError(`miles must be a finite number of at least 0, not ${miles}`);
  }
  // String(number) gives the shortest text that round-trips, so 0.1 + 0.2 shows its float noise
  // and is refused rather than silently rounded; exponent forms (1e-7, 1e21) are refused too.
  const text = typeof miles === 'number' ? String(miles) : miles.trim();
  const match = MILES_TEXT.exec(text);
  const whole = match?.[1] ?? '';
  const fraction = (match?.[2] ?? '').replace(/0+$/, '');
  if (!match || (whole === '' && (match[2] ?? '') === '')) {
    throw new RangeError(`miles must be a number of at least 0 with up to 3 decimals, not "${text}"`);
  }
  if (fraction.length > 3) throw new RangeError(`miles may have at most 3 decimals, not "${text}"`);
  return BigInt(whole || '0') * 1000n + BigInt(fraction.padEnd(3, '0'));
}

/**
 * Miles given as a decimal string or number with up to 3 decimals; returns cents, half up, exact
 * (BigInt via divRoundHalfUp from money.ts). 1234.5 mi × 72.5 ¢ = 89 501.25 ¢ → 89 501 ¢.
 * @throws RangeError for bad miles (see above), a rate that is not a whole number of tenths of a
 *   cent at least 0, or a deduction too large to hold exactly.
 */
export function mileageDeductionCents(miles: number | string, tenthsOfCentPerMile: number): number {
  if (!Number.isSafeInteger(tenthsOfCentPerMile) || tenthsOfCentPerMile < 0) {
    throw new RangeError(`rate must be whole tenths of a cent, at least 0, not ${tenthsOfCentPerMile}`);
  }
  const thousandths = milesInThousandths(miles);
  // thousandths of a mile × tenths of a cent = ten-thousandths of a cent.
  const cents = divRoundHalfUp(thousandths * BigInt(tenthsOfCentPerMile), 10_000n);
  if (!Number.isSafeInteger(cents)) throw new RangeError(`deduction too large for ${String(miles)} miles`);
  return cents;
}
