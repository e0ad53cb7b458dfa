import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { SPEC_SOURCES, type Machine, type MeterUnit } from '../../../../shared/api/machines';
import { SERVICE_ITEMS, type ServiceItem } from '../../../../shared/api/reminders';
import {
  CreateServiceIntervalInputSchema,
  type CreateServiceIntervalInput,
} from '../../../../shared/api/service-intervals';
import { FormActions } from '../../../components/ui/form-actions';
import { FormField, SelectField } from '../../../components/ui/form-field';
import { fieldErrorsOf } from '../../../lib/error-text';
import { decimalOrNull, integerOrNull, textField } from '../../../lib/form-schema';
import { useCreateServiceInterval } from '../api/mutations';

/** What the list calls each item until the mechanic names it otherwise. */
const ITEM_LABELS: Record<ServiceItem, string> = {
  fuel_filter: 'Fuel filter',
  in_tank_strainer: 'In-tank strainer',
  oil: 'Engine oil and filter',
  spark_plug: 'Spark plug',
  other: 'Other',
};

const shape = CreateServiceIntervalInputSchema.shape;
const nothing = (value: number | null) => value ?? undefined;

/** The form for a machine whose meter counts in `unit`: its limit is checked as the API checks it. */
function formSchemaFor(unit: MeterUnit) {
  const meterLimit = (unit === 'h' ? shape.everyHours : shape.everyMiles).unwrap().nullable();
  return z
    .object({
      item: z.enum(SERVICE_ITEMS),
      label: z.string(),
      everyMeter: textField(meterLimit, decimalOrNull, 'A number, e.g. 4000 or 100.'),
      everyMonths: textField(shape.everyMonths.unwrap().nullable(), integerOrNull, 'Whole months, e.g. 12.'),
      lastDoneOn: textField(shape.lastDoneOn, (text) => text, 'A date, e.g. 2026-06-01.'),
      lastDoneMeter: textField(
        shape.lastDoneMeter.unwrap().nullable(),
        decimalOrNull,
        'A number, e.g. 18420.',
      ),
      source: z.enum(SPEC_SOURCES),
    })
    .refine((values) => values.everyMeter !== null || values.everyMonths !== null, {
      message: 'Give a meter limit, a months limit, or both: whichever comes first is due.',
      path: ['everyMonths'],
    });
}
type IntervalFormValues = z.input<ReturnType<typeof formSchemaFor>>;

const itemOptions = SERVICE_ITEMS.map((item) => ({ value: item, label: ITEM_LABELS[item] }));
const sourceOptions = [
  { value: 'manual', label: 'This machine’s service manual' },
  { value: 'generic', label: 'Generic, still to confirm in the manual' },
];

/**
 * A new service interval for a machine: a limit on its own meter (miles, kilometres or hours), a
 * months limit, or both, and when it was last done. The server judges where it stands.
 */
export function ServiceIntervalForm({
  machine,
  today,
  onSaved,
  onCancel,
}: {
  machine: Machine;
  /** The business's today, YYYY-MM-DD: "last done" until the mechanic gives another day. */
  today: string;
  onSaved: () => void;
  onCancel: () => void;
}) {
  const create = useCreateServiceInterval(machine.id);
  const unit = machine.meterUnit;
  const schema = useMemo(() => formSchemaFor(unit), [unit]);
  const form = useForm({
    resolver: zodResolver(schema),
    defaultValues: {
      item: 'fuel_filter',
      label: '',
      everyMeter: '',
      everyMonths: '',
      lastDoneOn: today,
      lastDoneMeter: machine.meterReading === null ? '' : String(machine.meterReading),
      // Not from the manual until the mechanic says so: it shows as generic, to confirm.
      source: 'generic',
    } satisfies IntervalFormValues,
  });
  const { errors } = form.formState;

  const submit = form.handleSubmit((values) => {
    const limit = nothing(values.everyMeter);
    const body: CreateServiceIntervalInput = {
      item: values.item,
      label: values.label.trim() || ITEM_LABELS[values.item],
      ...(unit === 'h' ? { everyHours: limit } : unit === 'km' ? { everyKm: limit } : { everyMiles: limit }),
      everyMonths: nothing(values.everyMonths),
      lastDoneOn: values.lastDoneOn,
      lastDoneMeter: nothing(values.lastDoneMeter),
      source: values.source,
    };
    create.mutate(body, {
      onSuccess: onSaved,
      onError: (error) => {
        for (const [path, message] of fieldErrorsOf(error)) {
          const field =
            { everyHours: 'everyMeter', everyKm: 'everyMeter', everyMiles: 'everyMeter' }[path] ?? path;
          if (field in form.getValues()) form.setError(field as keyof IntervalFormValues, { message });
        }
      },
    });
  });

  const unitWord = unit === 'h' ? 'hours' : unit;
  return (
    <form onSubmit={submit} noValidate aria-label="New service interval" className="@container grid gap-5">
      <div className="grid gap-5 @lg:grid-cols-2">
        <SelectField
          label="Service"
          options={itemOptions}
          error={errors.item?.message}
          {...form.register('item')}
        />
        <FormField
          label="Name on the list"
          hint="Left blank, the service's own name."
          autoComplete="off"
          error={errors.label?.message}
          {...form.register('label')}
        />
        <FormField
          label={`Every (${unitWord})`}
          hint={`On this machine's meter, in ${unitWord}.`}
          inputMode="decimal"
          autoComplete="off"
          error={errors.everyMeter?.message}
          {...form.register('everyMeter')}
        />
        <FormField
          label="Every (months)"
          hint="Whichever limit comes first is due."
          inputMode="numeric"
          autoComplete="off"
          error={errors.everyMonths?.message}
          {...form.register('everyMonths')}
        />
        <FormField
          label="Last done on"
          type="date"
          error={errors.lastDoneOn?.message}
          {...form.register('lastDoneOn')}
        />
        <FormField
          label={`Last done at (${unitWord})`}
          hint="The meter then; left blank, the meter limit cannot be judged."
          inputMode="decimal"
          autoComplete="off"
          error={errors.lastDoneMeter?.message}
          {...form.register('lastDoneMeter')}
        />
        <SelectField
          label="Where the interval comes from"
          options={sourceOptions}
          error={errors.source?.message}
          {...form.register('source')}
        />
      </div>
      <FormActions
        mutation={create}
        submit={'Add the interval'}
        onCancel={onCancel}
        pending="Saving the interval…"
        success="Interval added."
        failure="The interval was not added."
      />
    </form>
  );
}
