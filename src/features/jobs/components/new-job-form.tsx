import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useDeferredValue, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { useNavigate } from 'react-router';
import { z } from 'zod';
import { Button } from '../../../components/ui/button';
import { FormField, SelectField, TextAreaField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import { CreateJobInputSchema } from '../../../../shared/api/jobs';
import { machineDisplayName } from '../../../../shared/api/machines';
import { pathTo } from '../../../app/paths';
import { jobQueries } from '../api/queries';
import { useCreateJob } from '../api/mutations';
import { errorText } from '../../../lib/error-text';

/** The form's own fields as typed; turned into the API's CreateJobInput on submit. */
const NewJobFormSchema = z.object({
  customerId: z.coerce.number<string>().int().positive('Choose the customer'),
  machineId: z.coerce.number<string>().int().positive('Choose the machine'),
  complaint: CreateJobInputSchema.shape.complaint,
  location: z.string().trim().max(200, 'At most 200 characters'),
  /** `datetime-local` text: the browser's own zone, turned into an instant on submit. */
  scheduledAt: z.string(),
});
type NewJobForm = z.input<typeof NewJobFormSchema>;

/**
 * Booking a job at the desk: find the customer by typing, pick one of their machines, say what is
 * wrong. Customers and machines are created on their own page (or with `vanbay job new` at the
 * roadside, which creates them on the spot).
 */
export function NewJobForm({ onDone }: { onDone: () => void }) {
  const navigate = useNavigate();
  const create = useCreateJob();
  const [search, setSearch] = useState('');
  const deferred = useDeferredValue(search.trim());
  const customers = useQuery({ ...jobQueries.customerSearch(deferred), enabled: deferred.length > 0 });
  const form = useForm<NewJobForm, unknown, z.output<typeof NewJobFormSchema>>({
    resolver: zodResolver(NewJobFormSchema),
    defaultValues: { customerId: '', machineId: '', complaint: '', location: '', scheduledAt: '' },
  });
  const customerId = Number(useWatch({ control: form.control, name: 'customerId' }));
  const machines = useQuery({ ...jobQueries.machinesOf(customerId), enabled: customerId > 0 });
  const errors = form.formState.errors;

  const submit = form.handleSubmit(async (values) => {
    const job = await create.mutateAsync({
      customerId: values.customerId,
      machineId: values.machineId,
      complaint: values.complaint,
      location: values.location === '' ? null : values.location,
      scheduledAt: values.scheduledAt === '' ? null : new Date(values.scheduledAt).toISOString(),
    });
    onDone();
    void navigate(pathTo.job(job.id));
  });

  const customerOptions = [
    { value: '', label: deferred ? 'Choose from the matches' : 'Type a name above first' },
    ...(customers.data?.items ?? []).map((c) => ({ value: String(c.id), label: c.name })),
  ];
  const machineOptions = [
    { value: '', label: customerId > 0 ? 'Choose the machine' : 'Choose the customer first' },
    ...(machines.data?.items ?? []).map((m) => ({
      value: String(m.id),
      label: `${machineDisplayName(m)}${m.vin ? ` · VIN …${m.vin.slice(-6)}` : ''}`,
    })),
  ];

  return (
    <Panel>
      <h2 className="text-xl font-bold">New job</h2>
      <form className="mt-4 grid gap-4 md:grid-cols-2" onSubmit={(event) => void submit(event)} noValidate>
        <FormField
          label="Find the customer"
          hint="Name, e-mail or phone"
          type="search"
          value={search}
          autoFocus
          onChange={(event) => setSearch(event.target.value)}
          feedback={
            deferred && customers.data?.items.length === 0 ? (
              <p className="text-base text-ink-soft">
                Nobody matches. Add them under Customers &amp; machines first.
              </p>
            ) : null
          }
        />
        <SelectField
          label="Customer"
          options={customerOptions}
          error={errors.customerId?.message}
          {...form.register('customerId', { onChange: () => form.setValue('machineId', '') })}
        />
        <SelectField
          label="Machine"
          options={machineOptions}
          error={errors.machineId?.message}
          {...form.register('machineId')}
        />
        <FormField
          label="Scheduled for"
          hint="Leave empty if not booked for a time"
          type="datetime-local"
          error={errors.scheduledAt?.message}
          {...form.register('scheduledAt')}
        />
        <TextAreaField
          className="md:col-span-2"
          label="Complaint"
          hint="What the customer says is wrong, in their words"
          error={errors.complaint?.message}
          {...form.register('complaint')}
        />
        <FormField
          className="md:col-span-2"
          label="Where"
          hint="An address, a trailhead, a roadside"
          error={errors.location?.message}
          {...form.register('location')}
        />
        <div className="flex flex-wrap items-center gap-3 md:col-span-2">
          <Button type="submit" disabled={create.isPending}>
            {create.isPending ? 'Booking…' : 'Book the job'}
          </Button>
          <Button variant="secondary" onClick={onDone}>
            Cancel
          </Button>
          {create.isError ? (
            <p role="alert" className="text-base font-bold text-fail">
              Not booked: {errorText(create.error)}
            </p>
          ) : null}
        </div>
      </form>
    </Panel>
  );
}
