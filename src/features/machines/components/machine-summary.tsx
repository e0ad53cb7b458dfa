import type { ReactNode } from 'react';
import type { Machine } from '../../../../shared/api/machines';
import { FactList } from '../../../components/ui/fact-list';
import type { Fact } from '../../../components/ui/fact-list';
import { formatInstant } from '../../../lib/format';
import { MACHINE_KIND_LABELS, meterText } from './machine-labels';

/** The machine's identity and meter as recorded; `owner` is the customer, linked by the page. */
export function MachineSummary({ machine, owner }: { machine: Machine; owner?: ReactNode }) {
  const meter = meterText(machine.meterReading, machine.meterUnit);
  const facts: Fact[] = [
    ...(owner ? [{ term: 'Owner', value: owner }] : []),
    { term: 'Kind', value: MACHINE_KIND_LABELS[machine.kind] },
    { term: 'Year', value: machine.year ?? <span className="text-ink-soft">not recorded</span> },
    { term: 'VIN', value: <VinFact machine={machine} /> },
    ...(machine.otherId
      ? [{ term: 'Other ID', value: <span className="font-mono">{machine.otherId}</span> }]
      : []),
    {
      term: 'Meter',
      value: meter ? (
        <>
          {meter}
          {machine.meterReadAt ? (
            <span className="text-ink-soft"> (read {formatInstant(machine.meterReadAt)})</span>
          ) : null}
        </>
      ) : (
        <span className="text-ink-soft">no reading yet ({machine.meterUnit})</span>
      ),
    },
    ...(machine.notes ? [{ term: 'Workshop notes', value: machine.notes }] : []),
  ];
  return <FactList facts={facts} />;
}

function VinFact({ machine }: { machine: Machine }) {
  if (!machine.vin) return <span className="text-ink-soft">none recorded</span>;
  return (
    <>
      <span className="font-mono break-all">{machine.vin}</span>
      {machine.modelYears.length > 0 ? (
        <span className="block text-base text-ink-soft">
          Model year code {machine.vin[9]}: {machine.modelYears.join(' or ')}
        </span>
      ) : null}
    </>
  );
}
