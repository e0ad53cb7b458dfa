import { useMemo } from 'react';
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { machineDisplayName } from '../../../../shared/api/machines';
import type { Machine } from '../../../../shared/api/machines';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { useMachineList } from '../api/queries';
import type { MachineFilter } from '../api/queries';
import { MACHINE_KIND_LABELS, meterText } from './machine-labels';

const col = dataColumns<Machine>();

type MachineTableProps = {
  filter: MachineFilter;
  /** Names the table for screen readers; the section's heading names it on screen. */
  caption: string;
  /** Where a machine's row links to (the app's paths; features do not know them). */
  machineHref: (id: number) => string;
  /** What to say when there are none, and what to do about it. */
  empty: ReactNode;
};

/** Machines a page at a time, each named by year, make and model and linked to its page. */
export function MachineTable({ filter, caption, machineHref, empty }: MachineTableProps) {
  const machines = useMachineList(filter);
  const columns = useMemo(
    () =>
      col.columns([
        col.accessor((machine) => machineDisplayName(machine), {
          id: 'machine',
          header: 'Machine',
          meta: { rowHeader: true },
          cell: ({ row }) => (
            <Link
              to={machineHref(row.original.id)}
              className="font-bold text-coolant underline underline-offset-4"
            >
              {machineDisplayName(row.original)}
            </Link>
          ),
        }),
        col.accessor((machine) => MACHINE_KIND_LABELS[machine.kind], {
          id: 'kind',
          header: 'Kind',
          meta: { hideOnPhone: true },
        }),
        col.accessor((machine) => machine.vin ?? machine.otherId ?? '', {
          id: 'identity',
          header: 'VIN or other ID',
          cell: ({ row }) => <Identity machine={row.original} />,
        }),
        col.accessor((machine) => meterText(machine.meterReading, machine.meterUnit) ?? '—', {
          id: 'meter',
          header: 'Meter',
          meta: { align: 'end' },
          cell: ({ getValue }) => <span className="whitespace-nowrap">{getValue()}</span>,
        }),
      ]),
    [machineHref],
  );

  if (machines.isPending) return <Loading>Loading the machines…</Loading>;
  if (machines.isError) {
    return (
      <LoadFailure
        title="The machines could not be loaded"
        error={machines.error}
        onRetry={() => void machines.refetch()}
        retrying={machines.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption={caption}
      hideCaption
      columns={columns}
      rows={machines.data}
      getRowId={(machine) => String(machine.id)}
      paging={machines}
      moreLabel="Show more machines"
      empty={empty}
    />
  );
}

function Identity({ machine }: { machine: Machine }) {
  if (machine.vin) return <span className="font-mono break-all">{machine.vin}</span>;
  if (machine.otherId) {
    return (
      <span>
        <span className="font-mono break-all">{machine.otherId}</span>{' '}
        <span className="text-ink-soft">(other ID)</span>
      </span>
    );
  }
  return <span className="text-ink-soft">none recorded</span>;
}
