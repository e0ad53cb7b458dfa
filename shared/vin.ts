/**
 * VIN check digit per 49 CFR 565.15: letters transliterate to numbers, each position has a
 * weight, the sum of products mod 11 is the check digit (10 is written X) in position 9.
 */
// prettier-ignore
const TRANSLITERATION: Record<string, number> = {
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8,
  J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
};
const WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];
/** 17 characters from digits and letters other than I, O and Q. */
const VIN_PATTERN = /^[A-HJ-NPR-Z0-9]{17}$/;

/** The check digit a VIN should carry, or null when it cannot be a VIN at all. */
export function vinCheckDigit(vin: string): string | null {
  const upper = vin.trim().toUpperCase();
  if (!VIN_PATTERN.test(upper)) return null;
  let sum = 0;
  for (let i = 0; i < 17; i += 1) {
    const char = upper[i] as string;
    const value = /\d/.test(char) ? Number(char) : (TRANSLITERATION[char] as number);
    sum += value * (WEIGHTS[i] as number);
  }
  const remainder = sum % 11;
  return remainder === 10 ? 'X' : String(remainder);
}

export function isValidVin(vin: string): boolean {
  const digit = vinCheckDigit(vin);
  return digit !== null && vin.trim().toUpperCase()[8] === digit;
}

/** Writes the right check digit into position 9 of a 17-character VIN body. */
export function withCheckDigit(vin: string): string {
  const upper = vin.trim().toUpperCase();
  const digit = vinCheckDigit(upper);
  if (digit === null) throw new RangeError(`not a VIN body: ${vin}`);
  return `${upper.slice(0, 8)}${digit}${upper.slice(9)}`;
}

/**
 * Position 10 model year codes in cycle order (49 CFR 565.15): A–Y without I, O, Q, U and Z, then
 * 1–9. The code at index i stands for 1980 + i, and again every 30 years after.
 */
const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const MODEL_YEAR_CYCLE = MODEL_YEAR_CODES.length;
const FIRST_MODEL_YEAR = 1980;
/** The last year of the second cycle; later cycles are left out until they are near. */
const LAST_MODEL_YEAR = 2039;

/** Every model year a position 10 code can stand for, ascending; [] for a character that is not a code. */
export function modelYearsForCode(code: string): number[] {
  if (code.length !== 1) return [];
  const index = MODEL_YEAR_CODES.indexOf(code.toUpperCase());
  if (index < 0) return [];
  const years: number[] = [];
  for (let year = FIRST_MODEL_YEAR + index; year <= LAST_MODEL_YEAR; year += MODEL_YEAR_CYCLE) {
    years.push(year);
  }
  return years;
}

/**
 * Every model year position 10 can stand for (49 CFR 565.15 30-year cycle, 1980–2039), ascending;
 * [] when position 10 is not a year code or the text is not 17 chars. The machine record decides
 * between the candidates, so none is preferred here.
 */
export function modelYearsFromVin(vin: string): number[] {
  const trimmed = vin.trim();
  if (trimmed.length !== 17) return [];
  return modelYearsForCode(trimmed[9] as string);
}
