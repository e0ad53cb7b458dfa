import type { ComponentPropsWithRef } from 'react';
import { FormField } from '../../../components/ui/form-field';
import { toneGlyphs } from '../../../components/ui/tone';
import type { Tone } from '../../../components/ui/tone';
import { vinFeedback } from './vin-feedback';

const feedbackTone: Record<Tone, string> = {
  pass: 'text-pass',
  warn: 'text-warn',
  fail: 'text-fail',
  quiet: 'text-ink-soft',
};

type VinFieldProps = Omit<ComponentPropsWithRef<'input'>, 'id' | 'className'> & {
  /** The field as typed so far (the form's watched value). */
  vin: string;
  /** The year field as typed, to check against the model year code. */
  year: string;
  /** The form's error after a save was tried; live feedback already covers what it can see. */
  error?: string | undefined;
};

/** The VIN input with its check as typed: character count, forbidden letters, check digit, model years. */
export function VinField({ vin, year, error, ...input }: VinFieldProps) {
  const feedback = vinFeedback(vin, year);
  // The live line already says what is wrong with a VIN that cannot be right; once a save was
  // tried, one still too short becomes an error too, not only a count.
  const length = vin.trim().length;
  const shownError =
    !error || feedback.tone === 'fail'
      ? undefined
      : feedback.valid === null && length > 0
        ? `Only ${length} of 17 characters: finish the VIN, or leave it blank.`
        : error;
  return (
    <FormField
      label="VIN"
      autoComplete="off"
      autoCapitalize="characters"
      spellCheck={false}
      maxLength={24}
      error={shownError}
      aria-invalid={feedback.valid === false || shownError ? true : undefined}
      feedback={
        <p aria-live="polite" className={`flex gap-2 text-base font-bold ${feedbackTone[feedback.tone]}`}>
          <span aria-hidden="true">{toneGlyphs[feedback.tone]}</span>
          <span>{feedback.text}</span>
        </p>
      }
      // Shown as capitals while typed; the shared schema upper-cases what is saved.
      inputClassName="font-mono uppercase tracking-wide"
      {...input}
    />
  );
}
