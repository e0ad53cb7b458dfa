import { useId } from 'react';
import type { ComponentPropsWithRef, ReactNode } from 'react';
import { toneGlyphs } from './tone';

/** The look of a text input, select or textarea at touch size, with a thick edge that survives glare. */
const controlClasses =
  'min-h-touch w-full rounded-plate border-2 border-ink bg-panel px-3 text-lg text-ink aria-[invalid=true]:border-3 aria-[invalid=true]:border-fail';

type FieldFrame = {
  label: string;
  /** A line under the label: the unit, the format, what the field is for. */
  hint?: ReactNode;
  /** Shown under the control and tied to it; marked by the fail glyph as well as colour. */
  error?: string | undefined;
  /** Live feedback under the control (a count, a check as typed). */
  feedback?: ReactNode;
  /** Classes on the field's wrapper (its grid placement). */
  className?: string;
};

/** Ids that tie one control to its label, hint, live feedback and error. */
function useFieldIds(hint: ReactNode, error: string | undefined, feedback: ReactNode) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const feedbackId = `${id}-feedback`;
  const describedBy = [hint ? hintId : null, feedback ? feedbackId : null, error ? errorId : null]
    .filter(Boolean)
    .join(' ');
  return { id, hintId, errorId, feedbackId, describedBy: describedBy || undefined };
}

function Frame({
  id,
  hintId,
  errorId,
  feedbackId,
  label,
  hint,
  error,
  feedback,
  className = '',
  children,
}: FieldFrame & { id: string; hintId: string; errorId: string; feedbackId: string; children: ReactNode }) {
  return (
    <div className={`grid content-start gap-1 ${className}`}>
      <label htmlFor={id} className="text-base font-bold">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-base text-ink-soft">
          {hint}
        </p>
      ) : null}
      {children}
      {feedback ? <div id={feedbackId}>{feedback}</div> : null}
      {error ? (
        <p id={errorId} className="flex gap-2 text-base font-bold text-fail">
          <span aria-hidden="true">{toneGlyphs.fail}</span>
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}

type FormFieldProps = Omit<ComponentPropsWithRef<'input'>, 'id' | 'className'> &
  FieldFrame & {
    /** Classes on the input itself (a monospaced VIN). */
    inputClassName?: string;
  };

/** A labelled input; react-hook-form's `register(...)` spreads onto it as it is. */
export function FormField({
  label,
  hint,
  error,
  feedback,
  className,
  inputClassName = '',
  ...input
}: FormFieldProps) {
  const ids = useFieldIds(hint, error, feedback);
  return (
    <Frame {...ids} label={label} hint={hint} error={error} feedback={feedback} className={className}>
      <input
        id={ids.id}
        aria-invalid={error ? true : undefined}
        aria-describedby={ids.describedBy}
        className={`${controlClasses} ${inputClassName}`}
        {...input}
      />
    </Frame>
  );
}

export type SelectOption = { value: string; label: string };

type SelectFieldProps = Omit<ComponentPropsWithRef<'select'>, 'id' | 'className' | 'children'> &
  FieldFrame & { options: readonly SelectOption[] };

export function SelectField({
  label,
  hint,
  error,
  feedback,
  className,
  options,
  ...select
}: SelectFieldProps) {
  const ids = useFieldIds(hint, error, feedback);
  return (
    <Frame {...ids} label={label} hint={hint} error={error} feedback={feedback} className={className}>
      <select
        id={ids.id}
        aria-invalid={error ? true : undefined}
        aria-describedby={ids.describedBy}
        className={controlClasses}
        {...select}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </Frame>
  );
}

type TextAreaFieldProps = Omit<ComponentPropsWithRef<'textarea'>, 'id' | 'className'> & FieldFrame;

export function TextAreaField({
  label,
  hint,
  error,
  feedback,
  className,
  rows = 3,
  ...textarea
}: TextAreaFieldProps) {
  const ids = useFieldIds(hint, error, feedback);
  return (
    <Frame {...ids} label={label} hint={hint} error={error} feedback={feedback} className={className}>
      <textarea
        id={ids.id}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={ids.describedBy}
        className={`${controlClasses} py-2`}
        {...textarea}
      />
    </Frame>
  );
}
