import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { CreateMachineInputSchema, MACHINE_KINDS, METER_UNITS } from '../../../../shared/api/machines';
import type { CreateMachineBody, Machine, UpdateMachineBody } from '../../../../shared/api/machines';
import { modelYearsFromVin } from '../../../../shared/vin';
import { FormActions } from '../../../components/ui/form-actions';
import { FormField, SelectField, TextAreaField } from '../../../components/ui/form-field';
import { fieldErrorsOf } from '../../../lib/error-text';
import { blankAsNull, decimalOrNull, integerOrNull, textField } from '../../../lib/form-schema';
import { useCreateMachine, useUpdateMachine } from '../api/mutations';
import { MACHINE_KIND_LABELS, METER_UNIT_LABELS } from './machine-labels';
import { VinField } from './vin-field';

const shape = CreateMachineInputSchema.shape;

const machineFormSchema = z
  .object({
    kind: z.enum(MACHINE_KINDS),
    year: textField(shape.year, integerOrNull, 'The year is four digits, e.g. 2019.'),
    make: z.string().trim().min(1, 'Give the make.').pipe(textField(shape.make)),
    model: z.string().trim().min(1, 'Give the model.').pipe(textField(shape.model)),
    vin: textField(shape.vin, blankAsNull),
    otherId: textField(shape.otherId, blankAsNull),
    meterUnit: z.enum(METER_UNITS),
    meterReading: textField(shape.meterReading, decimalOrNull, 'A number, e.g. 18420 or 312.5.'),
    notes: textField(shape.notes, blankAsNull),
  })
  // The server's rule too (49 CFR 565.15 position 10): a year the VIN's model year code cannot mean.
  .superRefine((machine, ctx) => {
    if (!machine.vin || machine.year === null || machine.year === undefined) return;
    const years = modelYearsFromVin(machine.vin);
    if (years.length > 0 && !years.includes(machine.year)) {
      ctx.addIssue({
        code: 'custom',
        path: ['year'],
        message: `${machine.year} does not match the VIN: its model year code stands for ${years.join(' or ')}.`,
      });
    }
  });
type MachineFormValues = z.input<typeof machineFormSchema>;
type FieldName = keyof MachineFormValues;
const FIELD_NAMES: FieldName[] = [
  'kind',
  'year',
  'make',
  'model',
  'vin',
  'otherId',
  'meterUnit',
  'meterReading',
  'notes',
];

function defaultsOf(machine: Machine | undefined): MachineFormValues {
  return {
    kind: machine?.kind ?? 'motorcycle',
    year: machine?.year === null || machine?.year === undefined ? '' : String(machine.year),
    make: machine?.make ?? '',
    model: machine?.model ?? '',
    vin: machine?.vin ?? '',
    otherId: machine?.otherId ?? '',
    meterUnit: machine?.meterUnit ?? 'mi',
    meterReading:
      machine?.meterReading === null || machine?.meterReading === undefined
        ? ''
        : String(machine.meterReading),
    notes: machine?.notes ?? '',
  };
}

const kindOptions = MACHINE_KINDS.map((kind) => ({ value: kind, label: MACHINE_KIND_LABELS[kind] }));
const meterOptions = METER_UNITS.map((unit) => ({ value: unit, label: METER_UNIT_LABELS[unit] }));

type MachineFormProps =
  | { mode: 'create'; customerId: number; onSaved: (machine: Machine) => void; onCancel: () => void }
  | { mode: 'edit'; machine: Machine; onSaved: (machine: Machine) => void; onCancel: () => void };

/** A machine's identity and meter: a new one for a customer, or a change to one (only what changed is sent). */
export function MachineForm(props: MachineFormProps) {
  const machine = props.mode === 'edit' ? props.machine : undefined;
  const create = useCreateMachine();
  const update = useUpdateMachine(machine?.id ?? 0);
  const mutation = props.mode === 'create' ? create : update;

  const form = useForm({ resolver: zodResolver(machineFormSchema), defaultValues: defaultsOf(machine) });
  const { errors } = form.formState;
  const [vin, year] = useWatch({ control: form.control, name: ['vin', 'year'] });

  function showServerErrors(error: Error) {
    for (const [path, message] of fieldErrorsOf(error)) {
      if ((FIELD_NAMES as string[]).includes(path)) form.setError(path as FieldName, { message });
    }
  }

  const submit = form.handleSubmit((values) => {
    if (props.mode === 'create') {
      const body: CreateMachineBody = { customerId: props.customerId, ...values };
      create.mutate(body, { onSuccess: props.onSaved, onError: showServerErrors });
      return;
    }
    const dirty = form.formState.dirtyFields;
    const changed = FIELD_NAMES.filter((name) => dirty[name]);
    if (changed.length === 0) {
      props.onCancel();
      return;
    }
    const body = Object.fromEntries(changed.map((name) => [name, values[name]])) as UpdateMachineBody;
    update.mutate(body, { onSuccess: props.onSaved, onError: showServerErrors });
  });

  const verb = props.mode === 'create' ? 'Add the machine' : 'Save changes';
  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={props.mode === 'create' ? 'New machine' : 'Machine details'}
      className="@container grid gap-5"
    >
      {/* Two columns where the form itself has room (a container query), wherever it is placed. */}
      <div className="grid gap-5 @lg:grid-cols-2">
        <SelectField
          label="Kind"
          options={kindOptions}
          error={errors.kind?.message}
          {...form.register('kind')}
        />
        <FormField
          label="Year"
          hint="Model year, from the title or the frame plate."
          inputMode="numeric"
          autoComplete="off"
          error={errors.year?.message}
          {...form.register('year')}
        />
        <FormField label="Make" autoComplete="off" error={errors.make?.message} {...form.register('make')} />
        <FormField
          label="Model"
          autoComplete="off"
          error={errors.model?.message}
          {...form.register('model')}
        />
        <VinField vin={vin} year={year} error={errors.vin?.message} {...form.register('vin')} />
        <FormField
          label="Other ID"
          hint="HIN, frame or engine serial, when there is no VIN. Not checked."
          autoComplete="off"
          error={errors.otherId?.message}
          {...form.register('otherId')}
        />
        <SelectField
          label="Meter"
          hint="How this machine counts its use."
          options={meterOptions}
          error={errors.meterUnit?.message}
          {...form.register('meterUnit')}
        />
        <FormField
          label="Meter reading"
          hint="As it reads today, in the meter’s unit."
          inputMode="decimal"
          autoComplete="off"
          error={errors.meterReading?.message}
          {...form.register('meterReading')}
        />
      </div>
      <TextAreaField
        label="Workshop notes"
        hint="Not shown to the customer."
        error={errors.notes?.message}
        {...form.register('notes')}
      />
      <FormActions
        mutation={mutation}
        submit={verb}
        onCancel={props.onCancel}
        pending="Saving the machine…"
        success="Machine saved."
        failure="The machine was not saved."
      />
    </form>
  );
}
