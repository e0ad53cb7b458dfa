import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import type { Machine } from '../../../../shared/api/machines';
import {
  CreateServiceIntervalInputSchema,
  type ServiceInterval,
} from '../../../../shared/api/service-intervals';
import { FormActions } from '../../../components/ui/form-actions';
import { FormField } from '../../../components/ui/form-field';
import { fieldErrorsOf } from '../../../lib/error-text';
import { decimalOrNull, textField } from '../../../lib/form-schema';
import { useRecordServiceDone } from '../api/mutations';
import { meterText } from './machine-labels';

const shape = CreateServiceIntervalInputSchema.shape;
const schema = z.object({
  lastDoneOn: textField(shape.lastDoneOn, (text) => text, 'A date, e.g. 2026-06-01.'),
  lastDoneMeter: textField(shape.lastDoneMeter.unwrap().nullable(), decimalOrNull, 'A number, e.g. 18420.'),
});
type DoneFormValues = z.input<typeof schema>;

/**
 * The service done again: on which day and at what meter. The interval's next due date and meter
 * count from these, and the reminder of the round it ends closes.
 */
export function ServiceDoneForm({
  machine,
  interval,
  today,
  onSaved,
  onCancel,
}: {
  machine: Machine;
  interval: ServiceInterval;
  /** The business's today, YYYY-MM-DD: the day offered until the mechanic gives another. */
  today: string;
  onSaved: (values: { lastDoneOn: string }) => void;
  onCancel: () => void;
}) {
  const record = useRecordServiceDone(machine.id);
  const form = useForm({
    resolver: zodResolver(schema),
    defaultValues: {
      lastDoneOn: today,
      lastDoneMeter: machine.meterReading === null ? '' : String(machine.meterReading),
    } satisfies DoneFormValues,
  });
  const { errors } = form.formState;
  const unitWord = machine.meterUnit === 'h' ? 'hours' : machine.meterUnit;
  const before = meterText(interval.lastDoneMeter, interval.meterUnit);

  const submit = form.handleSubmit((values) => {
    record.mutate(
      {
        intervalId: interval.id,
        lastDoneOn: values.lastDoneOn,
        // Left blank, the meter it was last done at stays: a distance or hours limit then comes
        // due early, never late.
        ...(values.lastDoneMeter === null ? {} : { lastDoneMeter: values.lastDoneMeter }),
      },
      {
        onSuccess: () => onSaved({ lastDoneOn: values.lastDoneOn }),
        onError: (error) => {
          for (const [path, message] of fieldErrorsOf(error)) {
            if (path in form.getValues()) form.setError(path as keyof DoneFormValues, { message });
          }
        },
      },
    );
  });

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`${interval.label} done`}
      className="@container grid gap-5"
    >
      <h3 className="text-xl font-bold">{interval.label}: record it done</h3>
      <div className="grid gap-5 @lg:grid-cols-2">
        <FormField
          label="Done on"
          type="date"
          error={errors.lastDoneOn?.message}
          {...form.register('lastDoneOn')}
        />
        <FormField
          label={`Meter then (${unitWord})`}
          hint={
            before
              ? `Left blank, it stays at ${before}, as last recorded.`
              : 'Left blank, a meter limit cannot be judged.'
          }
          inputMode="decimal"
          autoComplete="off"
          error={errors.lastDoneMeter?.message}
          {...form.register('lastDoneMeter')}
        />
      </div>
      <FormActions
        mutation={record}
        submit={'Record it done'}
        onCancel={onCancel}
        pending="Saving…"
        success="Recorded."
        failure="Nothing was recorded."
      />
    </form>
  );
}
