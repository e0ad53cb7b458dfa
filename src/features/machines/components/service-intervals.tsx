import { useMemo } from 'react';
import type { ServiceInterval } from '../../../../shared/api/service-intervals';
import { convert } from '../../../../shared/units';
import { Button } from '../../../components/ui/button';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { intervalStatusShown } from '../../../components/ui/interval-status';
import { StatusPill } from '../../../components/ui/status-pill';
import { formatCalendarDate, formatDecimal } from '../../../lib/format';
import { useServiceIntervals } from '../api/queries';
import { meterText } from './machine-labels';

/** "8,000 km (4,971 mi) or 12 months": every limit, whichever comes first, in the machine's unit too. */
function everyText(interval: ServiceInterval): string {
  const parts: string[] = [];
  if (interval.everyKm !== null) {
    const km = `${formatDecimal(interval.everyKm, 0)} km`;
    // 1 mi = 1.609 344 km exactly (shared/units.ts, NIST SP 811 B.8).
    parts.push(
      interval.meterUnit === 'mi'
        ? `${km} (${formatDecimal(convert(interval.everyKm, 'km', 'mi'), 0)} mi)`
        : km,
    );
  }
  if (interval.everyHours !== null) parts.push(`${formatDecimal(interval.everyHours, 1)} h`);
  if (interval.everyMonths !== null) {
    parts.push(`${interval.everyMonths} ${interval.everyMonths === 1 ? 'month' : 'months'}`);
  }
  return parts.join(' or ');
}

const col = dataColumns<ServiceInterval>();
/** The columns; with `onRecord`, the standing cell ends in the button that records it done. */
function columnsFor(onRecord?: (interval: ServiceInterval) => void) {
  return col.columns([
    col.accessor('label', { header: 'Service', meta: { rowHeader: true } }),
    col.accessor((interval) => everyText(interval), {
      id: 'every',
      header: 'Every',
      meta: { hideOnPhone: true },
    }),
    col.accessor('lastDoneOn', {
      header: 'Last done',
      cell: ({ row }) => {
        const { lastDoneOn, lastDoneMeter, meterUnit } = row.original;
        const meter = meterText(lastDoneMeter, meterUnit);
        return (
          <>
            <span className="block whitespace-nowrap">
              {lastDoneOn ? formatCalendarDate(lastDoneOn) : 'not recorded'}
            </span>
            {meter ? <span className="block text-ink-soft">at {meter}</span> : null}
          </>
        );
      },
    }),
    col.accessor((interval) => interval.state.status, {
      id: 'status',
      header: 'Where it stands',
      cell: ({ row }) => {
        const shown = intervalStatusShown[row.original.state.status];
        return (
          <div className="grid gap-1">
            <span>
              <StatusPill tone={shown.tone}>{shown.word}</StatusPill>
            </span>
            <span className="max-w-prose text-base">{row.original.state.reason}</span>
            {row.original.source === 'generic' ? (
              <span className="text-base font-bold text-warn">
                Interval: generic — confirm in the service manual
              </span>
            ) : null}
            {onRecord ? (
              // In this cell, not a column of its own: on a phone the last column is off the screen.
              <Button
                variant="secondary"
                className="mt-1 justify-self-start whitespace-nowrap"
                aria-label={`Record ${row.original.label} done`}
                onClick={() => onRecord(row.original)}
              >
                Record done
              </Button>
            ) : null}
          </div>
        );
      },
    }),
  ]);
}

/**
 * The machine's service items and where each stands today, judged by the server; with `onRecord`,
 * each row offers to record the service done.
 */
export function ServiceIntervals({
  machineId,
  mayAdd = false,
  onRecord,
}: {
  machineId: number;
  mayAdd?: boolean;
  onRecord?: (interval: ServiceInterval) => void;
}) {
  const intervals = useServiceIntervals(machineId);
  const shownColumns = useMemo(() => columnsFor(onRecord), [onRecord]);
  if (intervals.isPending) return <Loading>Loading the service intervals…</Loading>;
  if (intervals.isError) {
    return (
      <LoadFailure
        title="The service intervals could not be loaded"
        error={intervals.error}
        onRetry={() => void intervals.refetch()}
        retrying={intervals.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption="Service intervals"
      hideCaption
      columns={shownColumns}
      rows={intervals.data.items}
      getRowId={(interval) => String(interval.id)}
      empty={
        <EmptyState title="No service intervals set">
          <p>
            Without intervals this machine never comes due on the Reminders page.{' '}
            {mayAdd
              ? 'Add its fuel filter, in-tank strainer and oil intervals from the service manual with “Add an interval”.'
              : 'The workshop sets its fuel filter, in-tank strainer and oil intervals from the service manual.'}
          </p>
        </EmptyState>
      }
    />
  );
}
