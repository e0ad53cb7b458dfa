// @ts-expect-error -- vin-validator ships no type declarations; its one function is typed below.
import vinValidatorModule from 'vin-validator';
import { describe, expect, it } from 'vitest';
import { withCheckDigit } from '../../shared/vin';
import { vinFeedback } from '../../src/features/machines/components/vin-feedback';

const vinValidator = vinValidatorModule as { validate: (vin: string) => boolean };

// 49 CFR 565.15 worked example, as widely reproduced (REFERENCES.md, "VIN"): check digit X.
const EXAMPLE = '1M8GDM9AXKP042788';

describe('vinFeedback', () => {
  it('passes the worked example and names both model years of code K (1989, 2019)', () => {
    expect(vinValidator.validate(EXAMPLE)).toBe(true);
    expect(vinFeedback(EXAMPLE)).toEqual({
      tone: 'pass',
      valid: true,
      text: 'Check digit matches. Model year code K: 1989 or 2019.',
    });
  });

  it('agrees with the vin-validator package on every single-character change of position 9', () => {
    // Position 9 is the check digit: exactly one of 0–9, X is right (49 CFR 565.15).
    for (const digit of '0123456789X') {
      const vin = `${EXAMPLE.slice(0, 8)}${digit}${EXAMPLE.slice(9)}`;
      expect(vinFeedback(vin).valid, vin).toBe(vinValidator.validate(vin));
    }
  });

  it('is quiet while a VIN is still short, and fails as soon as it cannot be one', () => {
    expect(vinFeedback('1M8GD')).toMatchObject({ tone: 'quiet', valid: null, text: '5 of 17 characters.' });
    expect(vinFeedback('1M8GDQ')).toMatchObject({ tone: 'fail', valid: false });
    expect(vinFeedback('1M8-GD').text).toBe('Only letters and digits: “-” is not part of a VIN.');
    expect(vinFeedback(`${EXAMPLE}1`)).toMatchObject({ tone: 'fail', text: '18 characters: a VIN has 17.' });
  });

  it('warns when the year typed is not one the model year code stands for', () => {
    expect(vinFeedback(EXAMPLE, '2019').tone).toBe('pass');
    expect(vinFeedback(EXAMPLE, '1989').tone).toBe('pass');
    expect(vinFeedback(EXAMPLE, '2020')).toMatchObject({ tone: 'warn', valid: true });
  });

  it('reads 1 in position 10 as 2001 or 2031: 11111111111111111 is valid (REFERENCES.md)', () => {
    expect(vinValidator.validate('11111111111111111')).toBe(true);
    expect(vinFeedback('11111111111111111').text).toBe(
      'Check digit matches. Model year code 1: 2001 or 2031.',
    );
  });

  it('says so when position 10 is no year code (0 is not one, 49 CFR 565.15)', () => {
    const vin = withCheckDigit('1M8GDM9A00P042788');
    expect(vinValidator.validate(vin)).toBe(true);
    expect(vinFeedback(vin)).toMatchObject({
      tone: 'pass',
      text: 'Check digit matches. Position 10 (0) is not a model year code.',
    });
  });
});
