import { useState } from 'react';
import type { FormEvent } from 'react';
import { useNavigate, useSearchParams } from 'react-router';
import type { SessionUser } from '../../../shared/api/auth';
import { isAllowed } from '../../../shared/api/policy';
import { Button } from '../../components/ui/button';
import { EmptyState } from '../../components/ui/empty-state';
import { FormField } from '../../components/ui/form-field';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { CustomerForm } from '../../features/customers/components/customer-form';
import { CustomerTable } from '../../features/customers/components/customer-table';
import { MachineTable } from '../../features/machines/components/machine-table';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths, pathTo } from '../paths';
import { CustomerOwnRecord } from './customer';

/**
 * The workshop's customers and machines, searched from the address (`?q=…`) so a search can be
 * bookmarked; a customer signing in sees their own record and machines here instead.
 */
export function Component() {
  const user = useSessionUser();
  if (user.role === 'customer') return <YourMachines user={user} />;
  return <CustomersDesk user={user} />;
}

function CustomersDesk({ user }: { user: SessionUser }) {
  const [search, setSearch] = useSearchParams();
  const navigate = useNavigate();
  const q = search.get('q')?.trim() ?? '';
  const [typed, setTyped] = useState(q);
  const mayAdd = isAllowed(user.role, 'customers', 'create');
  const adding = mayAdd && search.get('new') === '1';

  const setParams = (change: (next: URLSearchParams) => void) =>
    setSearch((previous) => {
      const next = new URLSearchParams(previous);
      change(next);
      return next;
    });

  function submitSearch(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setParams((next) => (typed.trim() === '' ? next.delete('q') : next.set('q', typed.trim())));
  }

  return (
    <>
      <PageHeading title={labelOf(paths.customers, user.role)} />
      <div className="grid gap-8">
        <div className="flex flex-wrap items-end gap-4">
          <form role="search" onSubmit={submitSearch} className="flex flex-wrap items-end gap-3">
            <FormField
              label="Search"
              type="search"
              hint="Name, phone or e-mail; make, model or VIN."
              className="w-full sm:w-96"
              value={typed}
              onChange={(event) => setTyped(event.target.value)}
            />
            <Button type="submit">Search</Button>
            {q !== '' ? (
              <Button
                variant="secondary"
                onClick={() => {
                  setTyped('');
                  setParams((next) => next.delete('q'));
                }}
              >
                Clear
              </Button>
            ) : null}
          </form>
          {mayAdd && !adding ? (
            <Button variant="secondary" onClick={() => setParams((next) => next.set('new', '1'))}>
              New customer
            </Button>
          ) : null}
        </div>

        {adding ? (
          <Panel>
            <h2 className="mb-4 text-xl font-bold">New customer</h2>
            <CustomerForm
              mode="create"
              onSaved={(customer) => void navigate(pathTo.customer(customer.id))}
              onCancel={() => setParams((next) => next.delete('new'))}
            />
          </Panel>
        ) : null}

        <section aria-labelledby="customers-heading" className="grid gap-3">
          <h2 id="customers-heading" className="text-2xl font-bold">
            {q ? `Customers matching “${q}”` : 'Customers'}
          </h2>
          <CustomerTable
            filter={{ q }}
            customerHref={pathTo.customer}
            empty={
              <EmptyState title={q ? 'No customer matches' : 'No customers yet'}>
                <p>
                  {q
                    ? `Nobody’s name, phone or e-mail contains “${q}”. Check the spelling, or search by phone number.`
                    : mayAdd
                      ? 'Add the first one with “New customer” above; their machines go on their record.'
                      : 'The owner or the helper adds customers as the work comes in.'}
                </p>
              </EmptyState>
            }
          />
        </section>

        <section aria-labelledby="machines-heading" className="grid gap-3">
          <h2 id="machines-heading" className="text-2xl font-bold">
            {q ? `Machines matching “${q}”` : 'Machines'}
          </h2>
          <MachineTable
            filter={{ q }}
            caption={q ? `Machines matching “${q}”` : 'All machines'}
            machineHref={pathTo.machine}
            empty={
              <EmptyState title={q ? 'No machine matches' : 'No machines yet'}>
                <p>
                  {q
                    ? `No make, model, VIN or other ID contains “${q}”. A VIN can be searched by its last six characters.`
                    : 'Open a customer and add their machine there: a machine always belongs to its owner.'}
                </p>
              </EmptyState>
            }
          />
        </section>
      </div>
    </>
  );
}

/** The customer's own view: their record and their machines, read only (PRODUCT.md, "Who uses it"). */
function YourMachines({ user }: { user: SessionUser }) {
  return (
    <>
      <PageHeading title={labelOf(paths.customers, user.role)}>
        Each machine’s service history, the checks run on it and what the workshop found.
      </PageHeading>
      {user.customerId === null ? (
        <EmptyState title="Your sign-in is not linked to a customer record">
          <p>Ask the workshop to link your sign-in to your record; your machines show here once it is.</p>
        </EmptyState>
      ) : (
        <CustomerOwnRecord customerId={user.customerId} />
      )}
    </>
  );
}
