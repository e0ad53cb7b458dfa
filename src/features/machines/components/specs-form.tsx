import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { UpdateMachineInputSchema } from '../../../../shared/api/machines';
import type { Machine, MachineSpecKey, UpdateMachineBody } from '../../../../shared/api/machines';
import { Button } from '../../../components/ui/button';
import { FormField, TextAreaField } from '../../../components/ui/form-field';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { toneGlyphs } from '../../../components/ui/tone';
import { ApiError } from '../../../lib/api-client';
import { fieldErrorsOf } from '../../../lib/error-text';
import { blankAsNull, textField } from '../../../lib/form-schema';
import { useUpdateMachine } from '../api/mutations';
import {
  GENERIC_SPEC_LABEL,
  SPEC_FIELDS,
  specInputText,
  specInUse,
  specText,
  withSpecLabels,
} from './spec-format';

const shape = UpdateMachineInputSchema.shape;

/**
 * Each spec is checked by the shared schema itself: typed with its unit ("40 psi", "2.8 bar"),
 * converted to the stored unit, range-checked. Blank means "use the generic figure" (null).
 */
const specsFormSchema = z.object({
  fuelPressureMinKpa: textField(shape.fuelPressureMinKpa, blankAsNull),
  fuelPressureMaxKpa: textField(shape.fuelPressureMaxKpa, blankAsNull),
  holdMaxDropKpa: textField(shape.holdMaxDropKpa, blankAsNull),
  holdMinutes: textField(shape.holdMinutes, blankAsNull),
  flowMinLph: textField(shape.flowMinLph, blankAsNull),
  specsNote: textField(shape.specsNote, blankAsNull),
});
type SpecsFormValues = z.input<typeof specsFormSchema>;
type FieldName = keyof SpecsFormValues;
const FIELD_NAMES = Object.keys(specsFormSchema.shape) as FieldName[];

/** The form as the machine stands: the manual's figures in the mechanic's units, blank where generic. */
function specDefaults(machine: Machine): SpecsFormValues {
  const typed = (key: MachineSpecKey) => {
    const value = machine[key];
    return value === null ? '' : specInputText(key, value);
  };
  return {
    fuelPressureMinKpa: typed('fuelPressureMinKpa'),
    fuelPressureMaxKpa: typed('fuelPressureMaxKpa'),
    holdMaxDropKpa: typed('holdMaxDropKpa'),
    holdMinutes: typed('holdMinutes'),
    flowMinLph: typed('flowMinLph'),
    specsNote: machine.specsNote ?? '',
  };
}

/**
 * The fuel specs from the machine's service manual. Only the fields changed are sent, so a
 * figure shown rounded ("43.5 psi") is never written back over the exact one stored.
 */
export function SpecsForm({ machine }: { machine: Machine }) {
  const update = useUpdateMachine(machine.id);
  const form = useForm({ resolver: zodResolver(specsFormSchema), defaultValues: specDefaults(machine) });
  const { errors, isDirty } = form.formState;

  const submit = form.handleSubmit((values) => {
    const dirty = form.formState.dirtyFields;
    const changed = FIELD_NAMES.filter((name) => dirty[name]);
    if (changed.length === 0) return;
    const body = Object.fromEntries(changed.map((name) => [name, values[name]])) as UpdateMachineBody;
    update.mutate(body, {
      onSuccess: (saved) => form.reset(specDefaults(saved)),
      onError: (error) => {
        for (const [path, message] of fieldErrorsOf(error)) {
          if ((FIELD_NAMES as string[]).includes(path)) {
            form.setError(path as FieldName, { message: withSpecLabels(message) });
          }
        }
      },
    });
  });

  // The server's words name fields by key; the page names them by label.
  const failure =
    update.error instanceof ApiError
      ? new ApiError(update.error.status, update.error.code, withSpecLabels(update.error.message))
      : update.error;

  return (
    <form onSubmit={submit} noValidate aria-label="Fuel specs" className="@container grid gap-5">
      {/* Two columns where the form itself has room (a container query), wherever it is placed. */}
      <div className="grid gap-5 @lg:grid-cols-2">
        {SPEC_FIELDS.map((field) => {
          const inUse = specInUse(machine, field.key);
          return (
            <FormField
              key={field.key}
              label={field.label}
              hint={`With its unit, e.g. ${field.example}. Blank: the generic ${specText(field.key, machine.specs[field.key].genericValue)}.`}
              inputMode="decimal"
              autoComplete="off"
              error={errors[field.key]?.message}
              feedback={<SpecInUse text={inUse.text} generic={inUse.generic} />}
              {...form.register(field.key)}
            />
          );
        })}
      </div>
      <TextAreaField
        label="Where these figures come from"
        hint="The manual and its page, so the next visit can check them."
        error={errors.specsNote?.message}
        {...form.register('specsNote')}
      />
      <div className="grid gap-3">
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={update.isPending || !isDirty}>
            {update.isPending ? 'Saving the specs…' : 'Save specs'}
          </Button>
          {isDirty ? (
            <Button variant="secondary" disabled={update.isPending} onClick={() => form.reset()}>
              Undo changes
            </Button>
          ) : null}
        </div>
        <MutationStatus
          mutation={{ ...update, error: failure }}
          pending="Saving the specs…"
          success="Specs saved. Checks on this machine now judge against them."
          failure="The specs were not saved."
        />
      </div>
    </form>
  );
}

function SpecInUse({ text, generic }: { text: string; generic: boolean }) {
  return (
    <p className={`flex gap-2 text-base ${generic ? 'text-warn' : 'text-ink'}`}>
      <span aria-hidden="true">{generic ? toneGlyphs.warn : toneGlyphs.pass}</span>
      <span>
        Checks use {text}: {generic ? <strong>{GENERIC_SPEC_LABEL}</strong> : 'from the service manual'}.
      </span>
    </p>
  );
}

/** The specs for someone who may not change them: each figure and where it comes from. */
export function SpecsList({ machine }: { machine: Machine }) {
  return (
    <div className="grid gap-3">
      <dl className="grid gap-3">
        {SPEC_FIELDS.map((field) => {
          const inUse = specInUse(machine, field.key);
          return (
            <div key={field.key} className="grid gap-0.5 border-b border-rule pb-3 last:border-b-0">
              <dt className="text-base font-bold text-ink-soft">{field.label}</dt>
              <dd className="text-lg">
                {inUse.text}{' '}
                <span className={inUse.generic ? 'font-bold text-warn' : 'text-ink-soft'}>
                  ({inUse.generic ? GENERIC_SPEC_LABEL : 'from the service manual'})
                </span>
              </dd>
            </div>
          );
        })}
      </dl>
      {machine.specsNote ? <p className="text-base text-ink-soft">Source: {machine.specsNote}</p> : null}
    </div>
  );
}
