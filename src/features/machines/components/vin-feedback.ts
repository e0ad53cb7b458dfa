import type { Tone } from '../../../components/ui/tone';
import { modelYearsFromVin, vinCheckDigit } from '../../../../shared/vin';

export type VinFeedback = {
  tone: Tone;
  text: string;
  /** True once the VIN is complete and its check digit matches; false when it is certainly wrong. */
  valid: boolean | null;
};

const VIN_LENGTH = 17;

/**
 * What to tell the mechanic about a VIN while it is being typed (49 CFR 565.15): quiet while it
 * is still short and could be right, a failure the moment it cannot be (a letter that never
 * appears, one character too many, a check digit that does not match), and once it checks out,
 * the model years position 10 stands for, checked against the year field when that is filled in.
 */
export function vinFeedback(typed: string, yearTyped = ''): VinFeedback {
  const vin = typed.trim().toUpperCase();
  if (vin === '') {
    return {
      tone: 'quiet',
      valid: null,
      text: 'Leave blank when the machine has none: a watercraft’s HIN or an engine serial goes in Other ID.',
    };
  }
  const stray = vin.match(/[^A-Z0-9]/);
  if (stray) {
    const shown = stray[0] === ' ' ? 'a space' : `“${stray[0]}”`;
    return { tone: 'fail', valid: false, text: `Only letters and digits: ${shown} is not part of a VIN.` };
  }
  const confusable = vin.match(/[IOQ]/);
  if (confusable) {
    return {
      tone: 'fail',
      valid: false,
      text: `${confusable[0]} never appears in a VIN (I, O and Q are left out): is it a ${confusable[0] === 'I' ? '1' : '0'}?`,
    };
  }
  if (vin.length < VIN_LENGTH) {
    return { tone: 'quiet', valid: null, text: `${vin.length} of ${VIN_LENGTH} characters.` };
  }
  if (vin.length > VIN_LENGTH) {
    return { tone: 'fail', valid: false, text: `${vin.length} characters: a VIN has ${VIN_LENGTH}.` };
  }
  const expected = vinCheckDigit(vin);
  if (expected !== vin[8]) {
    return {
      tone: 'fail',
      valid: false,
      text: `Check digit (9th character) is ${vin[8]}, but this VIN needs ${expected}: a character is mistyped.`,
    };
  }
  const years = modelYearsFromVin(vin);
  if (years.length === 0) {
    return {
      tone: 'pass',
      valid: true,
      text: `Check digit matches. Position 10 (${vin[9]}) is not a model year code.`,
    };
  }
  const yearsText = years.join(' or ');
  const year = Number(yearTyped.trim());
  if (/^\d{4}$/.test(yearTyped.trim()) && !years.includes(year)) {
    return {
      tone: 'warn',
      valid: true,
      text: `Check digit matches, but model year code ${vin[9]} stands for ${yearsText}, not ${year}.`,
    };
  }
  return { tone: 'pass', valid: true, text: `Check digit matches. Model year code ${vin[9]}: ${yearsText}.` };
}
