import { useId } from 'react';
import type { InputHTMLAttributes } from 'react';

type TextFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'className'> & { label: string };

/** A labelled input at touch size; the label sits above so a long one never squeezes the field. */
export function TextField({ label, ...input }: TextFieldProps) {
  const id = useId();
  return (
    <div className="grid gap-1">
      <label htmlFor={id} className="text-base font-bold">
        {label}
      </label>
      <input
        id={id}
        className="min-h-touch w-full rounded-plate border-2 border-ink bg-panel px-3 text-lg text-ink"
        {...input}
      />
    </div>
  );
}
