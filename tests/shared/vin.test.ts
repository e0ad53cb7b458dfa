import { describe, expect, it } from 'vitest';
import { isValidVin, vinCheckDigit, withCheckDigit } from '../../shared/vin';

describe('VIN check digit (49 CFR 565.15)', () => {
  it('accepts the worked example 1M8GDM9AXKP042788 with check digit X', () => {
    // The example reproduced with the regulation's transliteration and weight tables (REFERENCES.md).
    expect(vinCheckDigit('1M8GDM9AXKP042788')).toBe('X');
    expect(isValidVin('1M8GDM9AXKP042788')).toBe(true);
  });

  it('accepts 11111111111111111, listed as valid in REFERENCES.md', () => {
    // Arithmetic check: the weights sum to 89, and 89 mod 11 = 1, the digit in position 9.
    expect(vinCheckDigit('11111111111111111')).toBe('1');
    expect(isValidVin('11111111111111111')).toBe(true);
  });

  it('breaks when any one character other than position 9 changes', () => {
    const valid = '1M8GDM9AXKP042788';
    let broken = 0;
    for (let i = 0; i < 17; i += 1) {
      if (i === 8) continue;
      const swapped = valid[i] === '3' ? '4' : '3';
      if (!isValidVin(valid.slice(0, i) + swapped + valid.slice(i + 1))) broken += 1;
    }
    expect(broken).toBe(16);
  });

  it('refuses letters the regulation never uses (I, O, Q) and wrong lengths', () => {
    expect(vinCheckDigit('1M8GDM9AXKP04278O')).toBeNull();
    expect(vinCheckDigit('1M8GDM9AXKP04278')).toBeNull();
    expect(isValidVin('')).toBe(false);
  });

  it('writes the check digit into a VIN body', () => {
    expect(withCheckDigit('1M8GDM9A0KP042788')).toBe('1M8GDM9AXKP042788');
  });
});
