import type { Trip } from '../../../../shared/api/trips';
import { DataTable, dataColumns } from '../../../components/ui/data-table';
import type { DataColumns } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { StatusPill } from '../../../components/ui/status-pill';
import { formatCalendarDate, formatDecimal } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { useTripList } from '../api/queries';
import { milesText } from './mileage-totals';

const column = dataColumns<Trip>();

/** The log's columns follow IRS Publication 463's sample log: date, where, why, odometer, miles. */
const columns: DataColumns<Trip> = [
  column.accessor('tripDate', {
    header: 'Date',
    meta: { rowHeader: true },
    cell: ({ getValue }) => <span className="whitespace-nowrap">{formatCalendarDate(getValue())}</span>,
  }),
  column.accessor('destination', {
    header: 'Where and why',
    cell: ({ row }) => (
      <>
        <span className="block font-bold">{row.original.destination}</span>
        <span className="block text-ink-soft">{row.original.purpose}</span>
      </>
    ),
  }),
  column.display({
    id: 'odometer',
    header: 'Odometer',
    meta: { align: 'end' },
    cell: ({ row }) => {
      const trip = row.original;
      const reading = (value: number) => `${formatDecimal(value, 1)}`;
      return (
        <span className="whitespace-nowrap">
          {reading(trip.startOdometer)} → {trip.endOdometer === null ? '…' : reading(trip.endOdometer)}{' '}
          {trip.odometerUnit}
        </span>
      );
    },
  }),
  column.accessor('miles', {
    header: 'Miles',
    meta: { align: 'end' },
    cell: ({ getValue }) => {
      const miles = getValue();
      return miles === null ? (
        <StatusPill tone="quiet">Under way</StatusPill>
      ) : (
        <span className="whitespace-nowrap">{milesText(miles)}</span>
      );
    },
  }),
  column.accessor('rateCentsPerMile', {
    header: 'Rate',
    meta: { align: 'end' },
    cell: ({ getValue }) => {
      const rate = getValue();
      return (
        <span className="whitespace-nowrap">{rate === null ? '—' : `${formatDecimal(rate, 1)}¢/mi`}</span>
      );
    },
  }),
  column.accessor('deductionCents', {
    header: 'Deduction',
    meta: { align: 'end' },
    cell: ({ getValue }) => {
      const cents = getValue();
      return <span className="whitespace-nowrap">{cents === null ? '—' : formatCents(cents)}</span>;
    },
  }),
];

/** The year's trips, newest entered first, a page at a time. */
export function TripLog({ year }: { year: number }) {
  const trips = useTripList(year);
  if (trips.isPending) return <Loading>Loading the trip log…</Loading>;
  if (!trips.data) {
    return (
      <LoadFailure
        title="The trip log could not be loaded"
        error={trips.error!}
        onRetry={() => void trips.refetch()}
        retrying={trips.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption={`Trip log, ${year}`}
      columns={columns}
      rows={trips.data}
      getRowId={(trip) => String(trip.id)}
      paging={trips}
      moreLabel="Show more trips"
      empty={
        <EmptyState title={`No trips logged in ${year}`}>
          <p>
            Log a trip from the van as you drive:{' '}
            <code className="font-mono font-bold">vanbay trip start</code> when you set off and{' '}
            <code className="font-mono font-bold">vanbay trip end</code> with the odometer when you arrive.
            Each one lands here with its miles and deduction.
          </p>
        </EmptyState>
      }
    />
  );
}
