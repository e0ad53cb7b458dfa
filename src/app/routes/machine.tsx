import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { Link, useParams } from 'react-router';
import { machineDisplayName } from '../../../shared/api/machines';
import type { Machine } from '../../../shared/api/machines';
import { isAllowed } from '../../../shared/api/policy';
import type { ServiceInterval } from '../../../shared/api/service-intervals';
import type { Role } from '../../../shared/api/users';
import { Button } from '../../components/ui/button';
import { EmptyState } from '../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../components/ui/load-failure';
import { PageHeading } from '../../components/ui/page-heading';
import { Panel } from '../../components/ui/panel';
import { ApiError } from '../../lib/api-client';
import { businessSettingsQuery } from '../../lib/business-settings';
import { todayIn, todayIso } from '../../lib/calendar-days';
import { formatCalendarDate } from '../../lib/format';
import { useCustomer } from '../../features/customers/api/queries';
import { useMachine } from '../../features/machines/api/queries';
import { MachineForm } from '../../features/machines/components/machine-form';
import { MachineSummary } from '../../features/machines/components/machine-summary';
import { ServiceHistory } from '../../features/machines/components/service-history';
import type { HistoryLinks } from '../../features/machines/components/service-history';
import { ServiceDoneForm } from '../../features/machines/components/service-done-form';
import { ServiceIntervalForm } from '../../features/machines/components/service-interval-form';
import { ServiceIntervals } from '../../features/machines/components/service-intervals';
import { SpecsForm, SpecsList } from '../../features/machines/components/specs-form';
import { reminderQueries } from '../../features/reminders/api/queries';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf, sectionAt } from '../layout/sections';
import { paths, pathTo } from '../paths';
import { idFrom } from './customer';

/** A visit links to its job and a check to its report only where this role has those pages. */
function historyLinksFor(role: Role): HistoryLinks {
  const jobsOpen = sectionAt(paths.jobs)?.roles.includes(role) ?? false;
  return {
    job: jobsOpen ? pathTo.job : null,
    checkRun: jobsOpen && isAllowed(role, 'checks', 'read') ? pathTo.checkRun : null,
  };
}

/** One machine: who owns it, what it is, its fuel specs, what is due and every visit so far. */
export function Component() {
  const { role } = useSessionUser();
  const id = idFrom(useParams().machineId);
  if (id === null) return <NoSuchMachine role={role} />;
  return <MachinePage id={id} role={role} />;
}

function MachinePage({ id, role }: { id: number; role: Role }) {
  const machine = useMachine(id);
  if (machine.isPending) {
    return (
      <>
        <PageHeading title="Machine" />
        <Loading>Loading the machine…</Loading>
      </>
    );
  }
  if (machine.isError) {
    if (machine.error instanceof ApiError && machine.error.status === 404)
      return <NoSuchMachine role={role} />;
    return (
      <>
        <PageHeading title="Machine" />
        <LoadFailure
          title="The machine could not be loaded"
          error={machine.error}
          onRetry={() => void machine.refetch()}
          retrying={machine.isFetching}
        />
      </>
    );
  }
  return <MachineRecord machine={machine.data} role={role} />;
}

function MachineRecord({ machine, role }: { machine: Machine; role: Role }) {
  const mayEdit = isAllowed(role, 'machines', 'update');
  const isCustomer = role === 'customer';
  return (
    <>
      <Link
        to={pathTo.customer(machine.customerId)}
        className="mb-2 inline-flex min-h-touch items-center font-bold text-coolant underline underline-offset-4"
      >
        ← {isCustomer ? labelOf(paths.customers, role) : <OwnerName customerId={machine.customerId} />}
      </Link>
      <PageHeading title={machineDisplayName(machine)} />
      {machine.archivedAt ? (
        <p className="mb-6 text-lg font-bold text-warn">
          Archived: kept for its history, no longer reminded of anything.
        </p>
      ) : null}
      <div className="grid gap-8">
        <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
          <Details machine={machine} mayEdit={mayEdit} isCustomer={isCustomer} />
          <Panel>
            <h2 className="text-xl font-bold">Fuel specs</h2>
            <p className="mt-1 mb-4 max-w-prose text-base text-ink-soft">
              {mayEdit
                ? 'From this machine’s service manual. A check judges against these; any left blank uses Vanbay’s generic figure, which is no specification.'
                : 'The limits the workshop’s checks on this machine judge against.'}
            </p>
            {mayEdit ? <SpecsForm machine={machine} /> : <SpecsList machine={machine} />}
          </Panel>
        </div>

        {isAllowed(role, 'serviceIntervals', 'list') ? (
          <IntervalsSection
            machine={machine}
            mayAdd={isAllowed(role, 'serviceIntervals', 'create')}
            mayRecord={isAllowed(role, 'serviceIntervals', 'update')}
          />
        ) : null}

        <section aria-labelledby="history-heading" className="grid gap-3">
          <h2 id="history-heading" className="text-2xl font-bold">
            Service history
          </h2>
          <ServiceHistory
            machineId={machine.id}
            links={historyLinksFor(role)}
            showReadings={isAllowed(role, 'readings', 'list')}
            showLineItems={isAllowed(role, 'lineItems', 'list')}
            emptyHint={
              isCustomer
                ? 'Each visit the workshop makes to this machine shows here, with what was measured and what was done.'
                : 'Book a job for this machine from Jobs (or vanbay job new at the roadside); each visit then shows here.'
            }
          />
        </section>
      </div>
    </>
  );
}

function Details({
  machine,
  mayEdit,
  isCustomer,
}: {
  machine: Machine;
  mayEdit: boolean;
  isCustomer: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const [saved, setSaved] = useState(false);
  const owner = isCustomer ? undefined : (
    <Link
      to={pathTo.customer(machine.customerId)}
      className="font-bold text-coolant underline underline-offset-4"
    >
      <OwnerName customerId={machine.customerId} />
    </Link>
  );
  return (
    <Panel>
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-xl font-bold">{editing ? 'Edit the machine' : 'Machine'}</h2>
        {mayEdit && !editing ? (
          <Button
            variant="secondary"
            onClick={() => {
              setSaved(false);
              setEditing(true);
            }}
          >
            Edit details
          </Button>
        ) : null}
      </div>
      {editing ? (
        <MachineForm
          mode="edit"
          machine={machine}
          onSaved={() => {
            setEditing(false);
            setSaved(true);
          }}
          onCancel={() => setEditing(false)}
        />
      ) : (
        <>
          <MachineSummary machine={machine} owner={owner} />
          <p role="status" className="mt-3 text-base font-bold text-pass">
            {saved ? 'Machine saved.' : ''}
          </p>
        </>
      )}
    </Panel>
  );
}

/** The machine's service intervals, and for the workshop a form to add one. */
function IntervalsSection({
  machine,
  mayAdd,
  mayRecord,
}: {
  machine: Machine;
  mayAdd: boolean;
  mayRecord: boolean;
}) {
  const queryClient = useQueryClient();
  // The day the server counts as today is the business's, whatever this device's zone.
  const business = useQuery(businessSettingsQuery());
  const today = business.data ? todayIn(business.data.timezone) : todayIso();
  const [adding, setAdding] = useState(false);
  const [recording, setRecording] = useState<ServiceInterval | null>(null);
  const [said, setSaid] = useState('');
  const record = useCallback((interval: ServiceInterval) => {
    setSaid('');
    setAdding(false);
    setRecording(interval);
  }, []);
  return (
    <section aria-labelledby="intervals-heading" className="grid gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="intervals-heading" className="text-2xl font-bold">
          Service intervals
        </h2>
        {mayAdd && !adding ? (
          <Button
            variant="secondary"
            onClick={() => {
              setSaid('');
              setRecording(null);
              setAdding(true);
            }}
          >
            Add an interval
          </Button>
        ) : null}
      </div>
      {adding ? (
        <Panel>
          <ServiceIntervalForm
            machine={machine}
            today={today}
            onSaved={() => {
              setAdding(false);
              setSaid('Interval added.');
            }}
            onCancel={() => setAdding(false)}
          />
        </Panel>
      ) : null}
      {recording ? (
        <Panel>
          <ServiceDoneForm
            key={recording.id}
            machine={machine}
            interval={recording}
            today={today}
            onSaved={({ lastDoneOn }) => {
              setRecording(null);
              setSaid(`${recording.label}: recorded done on ${formatCalendarDate(lastDoneOn)}.`);
              // Its reminder for the round closed with it: the due list reads again.
              void queryClient.invalidateQueries({ queryKey: reminderQueries.all() });
            }}
            onCancel={() => setRecording(null)}
          />
        </Panel>
      ) : null}
      <p role="status" className="text-base font-bold text-pass">
        {said}
      </p>
      <ServiceIntervals machineId={machine.id} mayAdd={mayAdd} onRecord={mayRecord ? record : undefined} />
    </section>
  );
}

/** The owner's name once their record has loaded; "Owner" until then or if it cannot be read. */
function OwnerName({ customerId }: { customerId: number }) {
  const customer = useCustomer(customerId);
  return <>{customer.data?.name ?? 'Owner'}</>;
}

function NoSuchMachine({ role }: { role: Role }) {
  return (
    <>
      <PageHeading title="No such machine" />
      <EmptyState title="Nothing to show at this address">
        <p>
          {role === 'customer'
            ? 'This machine is not on your record. Your own machines are under “Your machines”.'
            : 'The machine may have been archived with its customer, or the address is mistyped. Find it by VIN or model on the list.'}
        </p>
        <Link
          to={paths.customers}
          className="mt-3 inline-flex min-h-touch items-center font-bold text-coolant underline underline-offset-4"
        >
          Go to {labelOf(paths.customers, role)}
        </Link>
      </EmptyState>
    </>
  );
}
