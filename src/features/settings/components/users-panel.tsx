import { zodResolver } from '@hookform/resolvers/zod';
import { useDeferredValue, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { CreateUserInputSchema, ROLES } from '../../../../shared/api/users';
import type { Role, User } from '../../../../shared/api/users';
import { Button } from '../../../components/ui/button';
import { DataTable, dataColumns } from '../../../components/ui/data-table';
import type { DataColumns } from '../../../components/ui/data-table';
import { FormField, SelectField } from '../../../components/ui/form-field';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import { localDay } from '../../../lib/calendar-days';
import { errorText, fieldErrorsOf } from '../../../lib/error-text';
import { formatCalendarDate } from '../../../lib/format';
import { integerOrNull, textField } from '../../../lib/form-schema';
import { useCreateUser, useUpdateUser } from '../api/mutations';
import { useCustomerChoices, useUsers } from '../api/queries';

const roleWords: Record<Role, string> = {
  owner: 'Owner',
  helper: 'Helper',
  bookkeeper: 'Bookkeeper',
  customer: 'Customer',
};

/** What each role may do, in a line, so the owner picks knowing (PRODUCT.md, "Who uses it"). */
const roleMeanings: Record<Role, string> = {
  owner: 'everything, settings included',
  helper: 'jobs, readings and checks; no money settings',
  bookkeeper: 'reads invoices, payments and mileage; edits nothing in the workshop',
  customer: 'their own machines, reports and invoices',
};

/** Staff roles a sign-in can be moved between; a customer's sign-in stays a customer's. */
const STAFF_ROLES = ['owner', 'helper', 'bookkeeper'] as const;

type UsersPanelProps = { selfId: number };

/** Who may sign in, as what; the owner adds people, changes a staff role, or turns a sign-in off. */
export function UsersPanel({ selfId }: UsersPanelProps) {
  const users = useUsers();
  const [columns] = useState(() => userColumns(selfId));
  return (
    <Panel>
      <h2 className="text-xl font-bold">Users and roles</h2>
      <p className="mt-1 max-w-prose text-base text-ink-soft">
        A role change or turning a sign-in off ends that person’s sessions at once.
      </p>
      <div className="mt-4 grid gap-6">
        {users.isPending ? (
          <Loading>Loading the sign-ins…</Loading>
        ) : !users.data ? (
          <LoadFailure
            title="The sign-ins could not be loaded"
            error={users.error!}
            onRetry={() => void users.refetch()}
            retrying={users.isFetching}
          />
        ) : (
          <DataTable
            caption="Sign-ins"
            hideCaption
            columns={columns}
            rows={users.data}
            getRowId={(user) => String(user.id)}
            paging={users}
            moreLabel="Show more sign-ins"
          />
        )}
        <NewUserForm />
      </div>
    </Panel>
  );
}

const column = dataColumns<User>();

function userColumns(selfId: number): DataColumns<User> {
  return [
    column.accessor('name', {
      header: 'Person',
      meta: { rowHeader: true },
      cell: ({ row }) => (
        <>
          <span className="block">
            {row.original.name}
            {row.original.id === selfId ? ' (you)' : ''}
          </span>
          <span className="block font-normal break-all text-ink-soft">{row.original.email}</span>
        </>
      ),
    }),
    column.display({
      id: 'access',
      header: 'Role and sign-in',
      cell: ({ row }) => <UserAccess user={row.original} self={row.original.id === selfId} />,
    }),
  ];
}

/** One person's role and whether they may sign in, each changeable here except one's own. */
function UserAccess({ user, self }: { user: User; self: boolean }) {
  const update = useUpdateUser();
  const lastIn = user.lastSignInAt
    ? `last signed in ${formatCalendarDate(localDay(user.lastSignInAt))}`
    : 'never signed in';
  const fixedRole = self || user.role === 'customer';
  return (
    <div className="grid gap-2">
      <div className="flex flex-wrap items-center gap-3">
        {fixedRole ? (
          <span className="text-lg font-bold">{roleWords[user.role]}</span>
        ) : (
          <select
            aria-label={`Role of ${user.name}`}
            className="min-h-touch rounded-plate border-2 border-ink bg-panel px-3 text-lg font-bold text-ink"
            value={user.role}
            disabled={update.isPending}
            onChange={(event) =>
              update.mutate({
                id: user.id,
                input: { role: event.target.value as (typeof STAFF_ROLES)[number] },
              })
            }
          >
            {STAFF_ROLES.map((role) => (
              <option key={role} value={role}>
                {roleWords[role]}
              </option>
            ))}
          </select>
        )}
        {user.disabled ? (
          <StatusPill tone="fail">Turned off</StatusPill>
        ) : (
          <StatusPill tone="pass">Can sign in</StatusPill>
        )}
        {self ? null : (
          <Button
            variant="secondary"
            disabled={update.isPending}
            onClick={() => update.mutate({ id: user.id, input: { disabled: !user.disabled } })}
          >
            {user.disabled ? 'Let them sign in' : 'Turn off their sign-in'}
          </Button>
        )}
      </div>
      <p className="text-base text-ink-soft">
        {roleMeanings[user.role]}; {lastIn}
      </p>
      <MutationStatus
        mutation={update}
        pending="Saving…"
        success="Saved; their sessions were ended."
        failure="Not changed."
      />
    </div>
  );
}

const shape = CreateUserInputSchema.shape;

const newUserSchema = z
  .object({
    name: textField(shape.name, (text) => text, 'Give their name.'),
    email: textField(shape.email),
    role: z.enum(ROLES),
    password: textField(shape.password),
    customerId: textField(shape.customerId, integerOrNull),
  })
  .superRefine((user, ctx) => {
    if (user.role === 'customer' && user.customerId == null) {
      ctx.addIssue({
        code: 'custom',
        path: ['customerId'],
        message: 'Pick the customer this sign-in is for.',
      });
    }
  })
  .transform((user) => ({ ...user, customerId: user.role === 'customer' ? user.customerId : null }));

type NewUserTexts = { name: string; email: string; role: Role; password: string; customerId: string };
const blankUser: NewUserTexts = { name: '', email: '', role: 'helper', password: '', customerId: '' };

function NewUserForm() {
  const create = useCreateUser();
  const [created, setCreated] = useState<string | null>(null);
  const form = useForm<NewUserTexts, unknown, z.output<typeof newUserSchema>>({
    resolver: zodResolver(newUserSchema),
    defaultValues: blankUser,
  });
  const { errors } = form.formState;
  const [role, customerId] = useWatch({ control: form.control, name: ['role', 'customerId'] });

  const submit = form.handleSubmit((user) => {
    setCreated(null);
    create.mutate(user, {
      onSuccess: (made) => {
        setCreated(
          `${made.name} can now sign in as ${roleWords[made.role].toLowerCase()} with ${made.email}.`,
        );
        form.reset(blankUser);
      },
      onError: (error) => {
        for (const [path, message] of fieldErrorsOf(error)) {
          if (path in blankUser) form.setError(path as keyof NewUserTexts, { message });
        }
      },
    });
  });

  return (
    <form
      aria-label="Add a sign-in"
      className="grid gap-4 border-t-2 border-rule pt-4 md:grid-cols-2"
      noValidate
      onSubmit={(event) => void submit(event)}
    >
      <h3 className="text-lg font-bold md:col-span-2">Add a sign-in</h3>
      <FormField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
      <FormField
        label="E-mail"
        type="email"
        inputMode="email"
        autoComplete="off"
        error={errors.email?.message}
        {...form.register('email')}
      />
      <SelectField
        label="Role"
        hint={roleMeanings[role]}
        options={ROLES.map((r) => ({ value: r, label: roleWords[r] }))}
        error={errors.role?.message}
        {...form.register('role')}
      />
      <FormField
        label="First password"
        hint="At least 10 characters; hand it over and have them change it after signing in"
        type="text"
        autoComplete="new-password"
        error={errors.password?.message}
        {...form.register('password')}
      />
      {role === 'customer' ? (
        <CustomerPicker
          error={errors.customerId?.message}
          onPick={(id) => form.setValue('customerId', id, { shouldValidate: form.formState.isSubmitted })}
          value={customerId}
        />
      ) : null}
      <div className="grid gap-3 md:col-span-2">
        <Button type="submit" className="justify-self-start" disabled={create.isPending}>
          {create.isPending ? 'Adding…' : 'Add the sign-in'}
        </Button>
        <MutationStatus
          mutation={create}
          pending="Adding the sign-in…"
          success={created ?? 'Added.'}
          failure="Not added."
        />
      </div>
    </form>
  );
}

/** A customer sign-in sees that customer's records only: find the customer by name, then pick. */
function CustomerPicker({
  value,
  onPick,
  error,
}: {
  value: string;
  onPick: (id: string) => void;
  error: string | undefined;
}) {
  const [search, setSearch] = useState('');
  const deferred = useDeferredValue(search.trim());
  const choices = useCustomerChoices(deferred, deferred.length > 0);
  const options = [
    { value: '', label: deferred ? 'Choose from the matches' : 'Type a name first' },
    ...(choices.data?.items ?? []).map((customer) => ({ value: String(customer.id), label: customer.name })),
  ];
  return (
    <>
      <FormField
        label="Find the customer"
        type="search"
        autoComplete="off"
        value={search}
        onChange={(event) => setSearch(event.target.value)}
        feedback={
          choices.isError ? (
            <p className="text-base font-bold text-fail">{errorText(choices.error)}</p>
          ) : deferred && choices.data?.items.length === 0 ? (
            <p className="text-base text-ink-soft">Nobody matches; add the customer first.</p>
          ) : null
        }
      />
      <SelectField
        label="Customer"
        options={options}
        value={value}
        error={error}
        onChange={(event) => onPick(event.target.value)}
      />
    </>
  );
}
