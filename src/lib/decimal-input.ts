/**
 * Typed decimals to scaled whole numbers and back, by string arithmetic only: "$1,234.56" at two
 * places is 123 456 (cents), "6.25" at four places is 62 500 (a percent as parts per million),
 * and no float ever rounds a digit on the way (the same reason shared/money.ts keeps cents).
 */

/** Digits grouped by commas in threes ("1,234,567") or not at all; a dot and up to `places` more. */
const DECIMAL = /^(\d{1,3}(?:,\d{3})+|\d+)?(?:\.(\d*))?$/;

export type ScaledResult = { ok: true; value: number } | { ok: false; reason: string };

/**
 * Reads `text` as a decimal with at most `places` decimals and returns it times 10^places.
 * A leading "$" and surrounding spaces are allowed; a minus sign only with `allowNegative`.
 * More decimals than `places` are refused, not rounded: "12.345" dollars is a typo to ask about.
 */
export function parseScaled(text: string, places: number, { allowNegative = false } = {}): ScaledResult {
  let rest = text.trim();
  let negative = false;
  if (rest.startsWith('-') || rest.startsWith('−')) {
    if (!allowNegative) return { ok: false, reason: 'cannot be negative' };
    negative = true;
    rest = rest.slice(1).trim();
  }
  if (rest.startsWith('$')) rest = rest.slice(1).trim();
  const match = DECIMAL.exec(rest);
  if (rest === '' || rest === '.' || !match) return { ok: false, reason: 'is not a number' };
  const whole = (match[1] ?? '').replaceAll(',', '') || '0';
  const fraction = match[2] ?? '';
  if (fraction.length > places) {
    return {
      ok: false,
      reason: places === 0 ? 'must be a whole number' : `takes at most ${places} decimals`,
    };
  }
  const digits = `${whole}${fraction.padEnd(places, '0')}`.replace(/^0+(?=\d)/, '');
  const value = Number(digits);
  if (!Number.isSafeInteger(value)) return { ok: false, reason: 'is too large' };
  return { ok: true, value: negative && value !== 0 ? -value : value };
}

/**
 * A scaled whole number as typed text: 9 500 at two places is "95.00"; with `trim`, trailing zeros
 * go, so 62 500 at four places is "6.25" and 2 500 at two is "25".
 */
export function scaledToText(value: number, places: number, { trim = false } = {}): string {
  if (!Number.isSafeInteger(value)) throw new RangeError(`not a whole number: ${value}`);
  const sign = value < 0 ? '-' : '';
  const digits = String(Math.abs(value)).padStart(places + 1, '0');
  const whole = digits.slice(0, digits.length - places);
  let fraction = places === 0 ? '' : digits.slice(-places);
  if (trim) fraction = fraction.replace(/0+$/, '');
  return `${sign}${whole}${fraction ? `.${fraction}` : ''}`;
}
