import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { isAllowed } from '../../../shared/api/policy';
import type { Role } from '../../../shared/api/users';
import { Button } from '../../components/ui/button';
import { EmptyState } from '../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../components/ui/load-failure';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { ApiError } from '../../lib/api-client';
import { useCustomer } from '../../features/customers/api/queries';
import { CustomerRecord } from '../../features/customers/components/customer-record';
import { MachineForm } from '../../features/machines/components/machine-form';
import { MachineTable } from '../../features/machines/components/machine-table';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths, pathTo } from '../paths';

/** A route id is a positive whole number; anything else is no record at all, and is not asked for. */
export function idFrom(param: string | undefined): number | null {
  if (!param || !/^\d{1,10}$/.test(param)) return null;
  const id = Number(param);
  return id > 0 && id <= 2_147_483_647 ? id : null;
}

/** One customer: contact details, and their machines with a way to add one. */
export function Component() {
  const { role } = useSessionUser();
  const id = idFrom(useParams().customerId);
  if (id === null) return <NoSuchCustomer role={role} />;
  return <CustomerPage id={id} role={role} />;
}

function CustomerPage({ id, role }: { id: number; role: Role }) {
  const customer = useCustomer(id);
  if (customer.isPending) {
    return (
      <>
        <PageHeading title="Customer" />
        <Loading>Loading the customer…</Loading>
      </>
    );
  }
  if (customer.isError) {
    if (customer.error instanceof ApiError && customer.error.status === 404)
      return <NoSuchCustomer role={role} />;
    return (
      <>
        <PageHeading title="Customer" />
        <LoadFailure
          title="The customer could not be loaded"
          error={customer.error}
          onRetry={() => void customer.refetch()}
          retrying={customer.isFetching}
        />
      </>
    );
  }
  return (
    <>
      <BackToList role={role} />
      <PageHeading title={customer.data.name} />
      <div className="grid gap-8">
        <CustomerRecord customer={customer.data} canEdit={isAllowed(role, 'customers', 'update')} />
        <CustomerMachines customerId={id} role={role} />
      </div>
    </>
  );
}

/** The customer's machines, and for the workshop the form that adds one to this record. */
function CustomerMachines({ customerId, role }: { customerId: number; role: Role }) {
  const navigate = useNavigate();
  const [adding, setAdding] = useState(false);
  const mayAdd = isAllowed(role, 'machines', 'create');
  const isCustomer = role === 'customer';
  return (
    <section aria-labelledby="machines-heading" className="grid gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="machines-heading" className="text-2xl font-bold">
          Machines
        </h2>
        {mayAdd && !adding ? <Button onClick={() => setAdding(true)}>Add a machine</Button> : null}
      </div>
      {adding ? (
        <Panel>
          <h3 className="mb-4 text-xl font-bold">New machine</h3>
          <MachineForm
            mode="create"
            customerId={customerId}
            onSaved={(machine) => void navigate(pathTo.machine(machine.id))}
            onCancel={() => setAdding(false)}
          />
        </Panel>
      ) : null}
      <MachineTable
        filter={{ customerId }}
        caption={isCustomer ? 'Your machines' : 'This customer’s machines'}
        machineHref={pathTo.machine}
        empty={
          <EmptyState title="No machines on this record yet">
            <p>
              {isCustomer
                ? 'The workshop adds your machines at the first visit; each one then shows here with its history.'
                : mayAdd
                  ? 'Add the machine with its VIN (or HIN or serial) and its meter reading, using “Add a machine” above.'
                  : 'The owner or the helper adds machines at the first visit.'}
            </p>
          </EmptyState>
        }
      />
    </section>
  );
}

/**
 * A customer's own record on their "Your machines" page: read only, whatever the page around
 * it, because the policy gives a customer no writes to customers or machines.
 */
export function CustomerOwnRecord({ customerId }: { customerId: number }) {
  const customer = useCustomer(customerId);
  return (
    <div className="grid gap-8">
      {customer.isPending ? <Loading>Loading your record…</Loading> : null}
      {customer.isError ? (
        <LoadFailure
          title="Your record could not be loaded"
          error={customer.error}
          onRetry={() => void customer.refetch()}
          retrying={customer.isFetching}
        />
      ) : null}
      {customer.data ? <CustomerRecord customer={customer.data} canEdit={false} /> : null}
      <CustomerMachines customerId={customerId} role="customer" />
    </div>
  );
}

function BackToList({ role }: { role: Role }) {
  return (
    <Link
      to={paths.customers}
      className="mb-2 inline-flex min-h-touch items-center font-bold text-coolant underline underline-offset-4"
    >
      ← {labelOf(paths.customers, role)}
    </Link>
  );
}

function NoSuchCustomer({ role }: { role: Role }) {
  return (
    <>
      <BackToList role={role} />
      <PageHeading title="No such customer" />
      <EmptyState title="Nothing to show at this address">
        <p>
          {role === 'customer'
            ? 'This is not your record. Your own machines are under “Your machines”.'
            : 'The customer may have been archived, or the address is mistyped. Search for them on the list.'}
        </p>
      </EmptyState>
    </>
  );
}
