import { useId } from 'react';
import type { ChoiceField, ChoicesField, Field } from '../../../../shared/procedures/types';
import { UNITS } from '../../../../shared/units';
import { toneGlyphs } from '../../../components/ui/tone';
import { readField, type Draft } from '../walk';

type FieldInputProps = {
  field: Field;
  draft: Draft;
  onChange: (key: string, value: string | string[]) => void;
};

/** How a typed field is written, shown under its label before anything is typed. */
function typingHint(field: Field): string {
  switch (field.type) {
    case 'measurement':
      return `In ${UNITS[field.defaultUnit].label} unless you type a unit, e.g. 12.4V, 43psi, 3 bar.`;
    case 'series':
      return `Seconds since the pump stopped and the reading, in ${UNITS[field.defaultUnit].label} unless typed.`;
    case 'list':
      return `One reading per ${field.itemLabel}, separated by commas, in ${UNITS[field.defaultUnit].label} unless typed.`;
    default:
      return '';
  }
}

/** One field of the current step, labelled, with what its text is read as while it is typed. */
export function FieldInput({ field, draft, onChange }: FieldInputProps) {
  if (field.type === 'choice') return <ChoiceInput field={field} draft={draft} onChange={onChange} />;
  if (field.type === 'choices') return <ChoicesInput field={field} draft={draft} onChange={onChange} />;
  return <TypedInput field={field} draft={draft} onChange={onChange} />;
}

function TypedInput({ field, draft, onChange }: FieldInputProps) {
  const id = useId();
  const read = readField(field, draft);
  const text = typeof draft[field.key] === 'string' ? (draft[field.key] as string) : '';
  return (
    <div className="grid gap-1">
      <label htmlFor={id} className="text-lg font-bold">
        {field.label}
        {field.optional ? <span className="font-medium text-ink-soft"> (optional)</span> : null}
      </label>
      {field.hint ? (
        <p id={`${id}-hint`} className="text-base text-ink-soft">
          {field.hint}
        </p>
      ) : null}
      <input
        id={id}
        type="text"
        inputMode="text"
        autoComplete="off"
        autoCapitalize="off"
        spellCheck={false}
        enterKeyHint="done"
        value={text}
        onChange={(event) => onChange(field.key, event.target.value)}
        aria-describedby={`${field.hint ? `${id}-hint ` : ''}${id}-read`}
        aria-invalid={read.state === 'error'}
        className={`min-h-touch w-full max-w-xl rounded-plate border-2 bg-panel px-3 font-mono text-xl text-ink ${
          read.state === 'error' ? 'border-fail' : 'border-ink'
        }`}
      />
      <p id={`${id}-read`} className="min-h-6 text-base">
        {read.state === 'read' ? (
          <>
            <span className="font-bold">Read as</span> <span className="tabular-nums">{read.shown}</span>
          </>
        ) : read.state === 'error' ? (
          <span className="font-bold text-fail">
            <span aria-hidden="true">{toneGlyphs.fail} </span>
            {read.error}
          </span>
        ) : (
          <span className="text-ink-soft">{typingHint(field)}</span>
        )}
      </p>
    </div>
  );
}

type OptionFieldProps<F> = { field: F; draft: Draft; onChange: FieldInputProps['onChange'] };

// Whole-row labels at touch height: a gloved thumb hits the words, not a 16 px circle.
const optionRow =
  'flex min-h-touch cursor-pointer items-center gap-3 rounded-plate border-2 border-ink bg-panel px-4 py-2 text-lg has-checked:border-coolant has-checked:bg-ground has-checked:font-bold';
const optionMark = 'h-6 w-6 shrink-0 accent-coolant';

function ChoiceInput({ field, draft, onChange }: OptionFieldProps<ChoiceField>) {
  const name = useId();
  const value = draft[field.key];
  return (
    <fieldset className="grid gap-2">
      <legend className="mb-1 text-lg font-bold">{field.label}</legend>
      {field.hint ? <p className="text-base text-ink-soft">{field.hint}</p> : null}
      {field.options.map((option) => (
        <label key={option.value} className={optionRow}>
          <input
            type="radio"
            name={name}
            value={option.value}
            checked={value === option.value}
            onChange={() => onChange(field.key, option.value)}
            className={optionMark}
          />
          {option.label}
        </label>
      ))}
    </fieldset>
  );
}

function ChoicesInput({ field, draft, onChange }: OptionFieldProps<ChoicesField>) {
  const picked = Array.isArray(draft[field.key]) ? (draft[field.key] as string[]) : [];
  const toggle = (value: string, on: boolean) =>
    onChange(field.key, on ? [...picked, value] : picked.filter((v) => v !== value));
  return (
    <fieldset className="grid gap-2">
      <legend className="mb-1 text-lg font-bold">{field.label}</legend>
      <p className="text-base text-ink-soft">{field.hint ?? 'Tick every one that applies, or none.'}</p>
      {field.options.map((option) => (
        <label key={option.value} className={optionRow}>
          <input
            type="checkbox"
            value={option.value}
            checked={picked.includes(option.value)}
            onChange={(event) => toggle(option.value, event.target.checked)}
            className={optionMark}
          />
          {option.label}
        </label>
      ))}
    </fieldset>
  );
}
