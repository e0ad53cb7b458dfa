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
