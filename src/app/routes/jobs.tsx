import { useDeferredValue } from 'react';
import { useSearchParams } from 'react-router';
import { Button } from '../../components/ui/button';
import { FormField, SelectField } from '../../components/ui/form-field';
import { PageHeading } from '../../components/ui/page-heading';
import { JobStatusSchema } from '../../../shared/api/jobs';
import { isAllowed } from '../../../shared/api/policy';
import { IsoDateSchema } from '../../../shared/api/common';
import type { JobFilters } from '../../features/jobs/api/queries';
import { JobsTable, STATUS_OPTIONS } from '../../features/jobs/components/jobs-table';
import { NewJobForm } from '../../features/jobs/components/new-job-form';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths } from '../paths';

/** Filters live in the address (`?status=diagnosing&q=carb`), so a filtered list can be bookmarked. */
function filtersFrom(search: URLSearchParams): JobFilters {
  const status = JobStatusSchema.safeParse(search.get('status'));
  const from = IsoDateSchema.safeParse(search.get('from'));
  const to = IsoDateSchema.safeParse(search.get('to'));
  const customerId = Number(search.get('customerId'));
  return {
    status: status.success ? status.data : undefined,
    from: from.success ? from.data : undefined,
    to: to.success ? to.data : undefined,
    customerId: Number.isSafeInteger(customerId) && customerId > 0 ? customerId : undefined,
    q: search.get('q')?.trim() || undefined,
  };
}

export function Component() {
  const { role } = useSessionUser();
  const [search, setSearch] = useSearchParams();
  const filters = filtersFrom(search);
  // Typing in the search box re-renders at once; the request follows the deferred value.
  const deferredQ = useDeferredValue(filters.q);
  const mayBook = isAllowed(role, 'jobs', 'create');
  const creating = mayBook && search.get('new') === '1';
  const filtered = Object.values(filters).some((value) => value !== undefined);

  const setParam = (key: string, value: string) =>
    setSearch(
      (previous) => {
        const next = new URLSearchParams(previous);
        if (value === '') next.delete(key);
        else next.set(key, value);
        return next;
      },
      { replace: true },
    );

  return (
    <>
      <PageHeading title={labelOf(paths.jobs, role)} />
      <div className="mb-6 grid gap-4">
        {mayBook && !creating ? (
          <div>
            <Button onClick={() => setParam('new', '1')}>New job</Button>
          </div>
        ) : null}
        {creating ? <NewJobForm onDone={() => setParam('new', '')} /> : null}
        <form
          role="search"
          aria-label="Filter the jobs"
          className="grid gap-4 sm:grid-cols-2 xl:grid-cols-4"
          onSubmit={(event) => event.preventDefault()}
        >
          <FormField
            label="Search"
            hint="Complaint, customer, make, model or VIN"
            type="search"
            name="q"
            value={search.get('q') ?? ''}
            onChange={(event) => setParam('q', event.target.value)}
          />
          <SelectField
            label="Status"
            name="status"
            options={[{ value: '', label: 'Any status' }, ...STATUS_OPTIONS]}
            value={filters.status ?? ''}
            onChange={(event) => setParam('status', event.target.value)}
          />
          <FormField
            label="Scheduled from"
            type="date"
            name="from"
            value={filters.from ?? ''}
            onChange={(event) => setParam('from', event.target.value)}
          />
          <FormField
            label="Scheduled to"
            type="date"
            name="to"
            value={filters.to ?? ''}
            onChange={(event) => setParam('to', event.target.value)}
          />
        </form>
        {filtered ? (
          <div>
            <Button variant="secondary" onClick={() => setSearch(new URLSearchParams(), { replace: true })}>
              Clear the filters
            </Button>
          </div>
        ) : null}
      </div>
      <JobsTable
        filters={{ ...filters, q: deferredQ }}
        filtered={filtered}
        onNewJob={mayBook ? () => setParam('new', '1') : undefined}
      />
    </>
  );
}
