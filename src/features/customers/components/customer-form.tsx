import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { CreateCustomerInputSchema } from '../../../../shared/api/customers';
import type { CreateCustomerInput, Customer, UpdateCustomerInput } from '../../../../shared/api/customers';
import { FormActions } from '../../../components/ui/form-actions';
import { FormField, TextAreaField } from '../../../components/ui/form-field';
import { fieldErrorsOf } from '../../../lib/error-text';
import { blankAsNull, textField } from '../../../lib/form-schema';
import { useCreateCustomer, useUpdateCustomer } from '../api/mutations';

const shape = CreateCustomerInputSchema.shape;

/** One address line per line of the box; blank lines dropped. */
const addressLines = (text: string) =>
  text
    .split('\n')
    .map((line) => line.trim())
    .filter((line) => line !== '');

const customerFormSchema = z.object({
  name: z.string().trim().min(1, 'Give the customer’s name.').pipe(textField(shape.name)),
  email: textField(shape.email, blankAsNull, 'An e-mail address, e.g. name@example.test.'),
  phone: textField(shape.phone, blankAsNull),
  address: textField(shape.addressLines, addressLines),
  town: textField(shape.town, blankAsNull),
  notes: textField(shape.notes, blankAsNull),
});
type CustomerFormValues = z.input<typeof customerFormSchema>;
type FieldName = keyof CustomerFormValues;
const FIELD_NAMES = Object.keys(customerFormSchema.shape) as FieldName[];
/** The API's name for each form field (the address box is `addressLines`). */
const apiName: Record<FieldName, keyof CreateCustomerInput> = {
  name: 'name',
  email: 'email',
  phone: 'phone',
  address: 'addressLines',
  town: 'town',
  notes: 'notes',
};

function defaultsOf(customer: Customer | undefined): CustomerFormValues {
  return {
    name: customer?.name ?? '',
    email: customer?.email ?? '',
    phone: customer?.phone ?? '',
    address: customer?.addressLines.join('\n') ?? '',
    town: customer?.town ?? '',
    notes: customer?.notes ?? '',
  };
}

type CustomerFormProps =
  | { mode: 'create'; onSaved: (customer: Customer) => void; onCancel: () => void }
  | { mode: 'edit'; customer: Customer; onSaved: (customer: Customer) => void; onCancel: () => void };

/** Contact details: a new customer, or a change to one (only what changed is sent). */
export function CustomerForm(props: CustomerFormProps) {
  const customer = props.mode === 'edit' ? props.customer : undefined;
  const create = useCreateCustomer();
  const update = useUpdateCustomer(customer?.id ?? 0);
  const mutation = props.mode === 'create' ? create : update;
  const form = useForm({ resolver: zodResolver(customerFormSchema), defaultValues: defaultsOf(customer) });
  const { errors } = form.formState;

  function showServerErrors(error: Error) {
    for (const [path, message] of fieldErrorsOf(error)) {
      const field = FIELD_NAMES.find(
        (name) => path === apiName[name] || path.startsWith(`${apiName[name]}.`),
      );
      if (field) form.setError(field, { message });
    }
  }

  const submit = form.handleSubmit((values) => {
    const dirty = form.formState.dirtyFields;
    const sent = props.mode === 'create' ? FIELD_NAMES : FIELD_NAMES.filter((name) => dirty[name]);
    if (sent.length === 0) {
      props.onCancel();
      return;
    }
    const body = Object.fromEntries(sent.map((name) => [apiName[name], values[name]]));
    if (props.mode === 'create') {
      create.mutate(body as CreateCustomerInput, { onSuccess: props.onSaved, onError: showServerErrors });
    } else {
      update.mutate(body as UpdateCustomerInput, { onSuccess: props.onSaved, onError: showServerErrors });
    }
  });

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={props.mode === 'create' ? 'New customer' : 'Contact details'}
      className="@container grid gap-5"
    >
      {/* Two columns where the form itself has room (a container query), wherever it is placed. */}
      <div className="grid gap-5 @lg:grid-cols-2">
        <FormField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
        <FormField
          label="Phone"
          type="tel"
          autoComplete="off"
          error={errors.phone?.message}
          {...form.register('phone')}
        />
        <FormField
          label="E-mail"
          type="email"
          hint="Invoices and service reminders go here."
          autoComplete="off"
          error={errors.email?.message}
          {...form.register('email')}
        />
        <FormField label="Town" autoComplete="off" error={errors.town?.message} {...form.register('town')} />
      </div>
      <TextAreaField
        label="Address"
        hint="One line per line, up to four; the town goes in its own box."
        error={errors.address?.message}
        {...form.register('address')}
      />
      <TextAreaField
        label="Workshop notes"
        hint="Gate codes, where the machine is kept. Not shown to the customer."
        error={errors.notes?.message}
        {...form.register('notes')}
      />
      <FormActions
        mutation={mutation}
        submit={props.mode === 'create' ? 'Add the customer' : 'Save changes'}
        onCancel={props.onCancel}
        pending="Saving the customer…"
        success="Customer saved."
        failure="The customer was not saved."
      />
    </form>
  );
}
