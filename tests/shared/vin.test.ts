import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
// @ts-expect-error -- vin-validator ships no type declarations; its one function is typed below.
import vinValidator from 'vin-validator';
import {
  isValidVin,
  modelYearsForCode,
  modelYearsFromVin,
  vinCheckDigit,
  withCheckDigit,
} from '../../shared/vin';

const validateWithLibrary: (vin: string) => boolean = vinValidator.validate;

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

describe('VIN model year, position 10 (49 CFR 565.15)', () => {
  it('reads the worked example 1M8GDM9AXKP042788: position 10 is K, 1989 or 2019', () => {
    // REFERENCES.md: A = 1980 or 2010 … on a 30-year cycle; K is the 10th code (I skipped) → 1989/2019.
    expect(modelYearsFromVin('1M8GDM9AXKP042788')).toEqual([1989, 2019]);
    expect(modelYearsFromVin('  1m8gdm9axkp042788 ')).toEqual([1989, 2019]);
  });

  it.each([
    // Each row from REFERENCES.md (49 CFR 565.15 cycle): A = 1980/2010, Y = 2000/2030, 1 = 2001/2031, 9 = 2009/2039.
    ['A', [1980, 2010]],
    ['a', [1980, 2010]],
    ['Y', [2000, 2030]],
    ['1', [2001, 2031]],
    ['9', [2009, 2039]],
  ])('code %s stands for %j', (code, years) => {
    expect(modelYearsForCode(code)).toEqual(years);
  });

  it('gives no year for characters outside the cycle: 0, U, Z and the never-used I, O, Q', () => {
    // 49 CFR 565.15 (REFERENCES.md): the year codes skip I, O, Q, U, Z and 0.
    for (const code of ['0', 'U', 'Z', 'I', 'O', 'Q', 'u', 'z', '', 'AB', '-', ' ']) {
      expect(modelYearsForCode(code)).toEqual([]);
    }
    expect(modelYearsFromVin('1M8GDM9AX0P042788')).toEqual([]);
    expect(modelYearsFromVin('1M8GDM9AXUP042788')).toEqual([]);
    expect(modelYearsFromVin('1M8GDM9AXKP04278')).toEqual([]);
    expect(modelYearsFromVin('')).toEqual([]);
  });

  it('maps each code to two years 30 apart, covering 1980–2039 once each, letters then digits', () => {
    // 49 CFR 565.15 (REFERENCES.md): 30 codes, A–Y then 1–9, repeating every 30 years.
    const alphanumerics = [...'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789'];
    const codes = alphanumerics.filter((c) => modelYearsForCode(c).length > 0);
    expect(alphanumerics.filter((c) => !codes.includes(c)).sort()).toEqual(['0', 'I', 'O', 'Q', 'U', 'Z']);
    const years: number[] = [];
    for (const code of codes) {
      const candidates = modelYearsForCode(code);
      expect(candidates).toHaveLength(2);
      expect(candidates[1]! - candidates[0]!).toBe(30);
      years.push(...candidates);
    }
    expect(years.sort((a, b) => a - b)).toEqual(Array.from({ length: 60 }, (_, i) => 1980 + i));
    // Ordered by first year, the codes read as the letters in order, then the digits 1–9.
    const byYear = [...codes].sort((a, b) => modelYearsForCode(a)[0]! - modelYearsForCode(b)[0]!);
    expect(byYear.join('')).toBe('ABCDEFGHJKLMNPRSTVWXY123456789');
  });
});

describe('VIN validity cross-checked against the npm library vin-validator', () => {
  const VIN_ALPHABET = [...'ABCDEFGHJKLMNPRSTUVWXYZ0123456789abcdefghjklmnprstuvwxyz'];

  it('agrees on random 17-character strings from the VIN alphabet, half of them given a right check digit', () => {
    // vin-validator implements the same 49 CFR 565.15 tables; upper and lower case are both fed in.
    fc.assert(
      fc.property(
        fc.array(fc.constantFrom(...VIN_ALPHABET), { minLength: 17, maxLength: 17 }),
        fc.boolean(),
        (chars, fixDigit) => {
          const vin = fixDigit ? withCheckDigit(chars.join('')) : chars.join('');
          const ours = isValidVin(vin);
          if (fixDigit && !ours) return false;
          return ours === validateWithLibrary(vin);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('agrees that I, O, Q and wrong lengths are never valid', () => {
    // vin-validator's pattern excludes I, O, Q and requires 17 characters, as 49 CFR 565.15 does.
    for (const vin of ['1M8GDM9AXKP04278O', '1M8GDM9AXKP0427I8', '1M8GDM9AXKP04278', '1M8GDM9AXKP0427888']) {
      expect(isValidVin(vin)).toBe(false);
      expect(validateWithLibrary(vin)).toBe(false);
    }
  });

  it('differs only on surrounding whitespace: Vanbay trims a pasted VIN, vin-validator does not', () => {
    // Found by a wider fast-check run over the VIN alphabet plus I, O, Q, spaces, tabs and lengths
    // 15–19: whitespace around a VIN was the only disagreement, which is why the property above
    // draws from the VIN alphabet alone.
    expect(isValidVin(' 1M8GDM9AXKP042788\t')).toBe(true);
    expect(validateWithLibrary(' 1M8GDM9AXKP042788\t')).toBe(false);
  });
});
