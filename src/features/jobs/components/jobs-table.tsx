import {
  createColumnHelper,
  createSortedRowModel,
  rowSortingFeature,
  sortFn_alphanumeric,
  sortFn_datetime,
  tableFeatures,
  useTable,
} from '@tanstack/react-table';
import type { ColumnDef } from '@tanstack/react-table';
import { useInfiniteQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import { AlertPanel } from '../../../components/ui/alert-panel';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { JOB_STATUS_LABELS, type JobSummary } from '../../../../shared/api/jobs';
import { pathTo } from '../../../app/paths';
import { countOf } from '../../../lib/format';
import { jobQueries, type JobFilters } from '../api/queries';
import { errorText } from '../../../lib/error-text';
import { formatWhen } from './job-format';
import { JobStatusPill } from './job-status';

const features = tableFeatures({
  rowSortingFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, datetime: sortFn_datetime },
});

const column = createColumnHelper<typeof features, JobSummary>();

/** `scheduledAt` sorts as a time, the unscheduled last; every other column as text or number. */
const columns = column.columns([
  column.accessor('id', {
    header: 'Job',
    sortFn: 'alphanumeric',
    cell: (info) => (
      <Link to={pathTo.job(info.getValue())} className="font-bold underline underline-offset-4">
        #{info.getValue()}
      </Link>
    ),
  }),
  column.accessor('status', {
    header: 'Status',
    sortFn: 'alphanumeric',
    cell: (info) => <JobStatusPill status={info.getValue()} />,
  }),
  column.accessor('customerName', { header: 'Customer', sortFn: 'alphanumeric' }),
  column.accessor('machineName', { header: 'Machine', sortFn: 'alphanumeric' }),
  column.accessor('complaint', {
    header: 'Complaint',
    enableSorting: false,
    cell: (info) => <span className="line-clamp-2 max-w-md">{info.getValue()}</span>,
  }),
  column.accessor((job) => (job.scheduledAt === null ? null : new Date(job.scheduledAt)), {
    id: 'scheduledAt',
    header: 'Scheduled',
    sortFn: 'datetime',
    sortUndefined: 'last',
    cell: (info) => <span className="whitespace-nowrap">{formatWhen(info.row.original.scheduledAt)}</span>,
  }),
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- TanStack's own type for mixed columns.
]) as ColumnDef<typeof features, JobSummary, any>[];

const sortGlyph = { asc: '▲', desc: '▼' } as const;

type JobsTableProps = { filters: JobFilters; filtered: boolean; onNewJob?: (() => void) | undefined };

/**
 * The jobs the filters select, newest first as the server pages them; a header sorts the rows
 * loaded so far (the note under the table says so, since more may wait behind "Show more").
 */
export function JobsTable({ filters, filtered, onNewJob }: JobsTableProps) {
  const jobs = useInfiniteQuery(jobQueries.list(filters));
  const rows = jobs.data ?? [];
  const table = useTable({ features, columns, data: rows, getRowId: (job) => String(job.id) });

  if (jobs.isPending) {
    return (
      <p role="status" className="text-lg text-ink-soft">
        Loading jobs…
      </p>
    );
  }
  if (jobs.isError) {
    return (
      <AlertPanel title="The jobs could not be loaded">
        <p>{errorText(jobs.error)}</p>
        <Button className="mt-4" onClick={() => void jobs.refetch()} disabled={jobs.isFetching}>
          {jobs.isFetching ? 'Trying again…' : 'Try again'}
        </Button>
      </AlertPanel>
    );
  }
  if (rows.length === 0) {
    return filtered ? (
      <EmptyState title="No job matches these filters">
        <p>Clear a filter or search for fewer words.</p>
      </EmptyState>
    ) : (
      <EmptyState title="No jobs yet">
        <p>
          Book the first one{onNewJob ? ' with “New job” above' : ''}, or from the van with{' '}
          <code className="font-mono font-bold">vanbay job new</code>.
        </p>
      </EmptyState>
    );
  }

  return (
    <div className="grid gap-3">
      <div className="overflow-x-auto rounded-plate border-2 border-rule bg-panel">
        <table className="w-full border-collapse text-left text-base">
          <caption className="sr-only">Jobs, {countOf(rows.length, 'row')} loaded</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b-2 border-ink">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={
                        sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined
                      }
                      className="px-4 py-2 font-bold whitespace-nowrap"
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex min-h-touch items-center gap-2 font-bold underline-offset-4 hover:underline"
                        >
                          <table.FlexRender header={header} />
                          <span aria-hidden="true">{sorted ? sortGlyph[sorted] : '↕'}</span>
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-rule align-top last:border-b-0">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-4 py-3">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        {jobs.hasNextPage ? (
          <Button
            variant="secondary"
            onClick={() => void jobs.fetchNextPage()}
            disabled={jobs.isFetchingNextPage}
          >
            {jobs.isFetchingNextPage ? 'Loading more jobs…' : 'Show more jobs'}
          </Button>
        ) : null}
        <span className="text-base text-ink-soft" aria-live="polite">
          {jobs.isFetchNextPageError
            ? 'The next page did not load. Try again.'
            : jobs.hasNextPage
              ? `${countOf(rows.length, 'job')} loaded, newest first; sorting orders the loaded ones.`
              : `All ${countOf(rows.length, 'job')} shown.`}
        </span>
      </div>
    </div>
  );
}

export const STATUS_OPTIONS = Object.entries(JOB_STATUS_LABELS).map(([value, label]) => ({ value, label }));
