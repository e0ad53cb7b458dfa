import type { MachineDue } from '../../../../shared/api/reports';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { formatCalendarDate, formatDecimal } from '../../../lib/format';

const statusShown: Record<MachineDue['status'], { tone: Tone; word: string }> = {
  overdue: { tone: 'fail', word: 'Overdue' },
  due: { tone: 'warn', word: 'Due' },
  due_soon: { tone: 'quiet', word: 'Due soon' },
};

/** Service items due soon, due or overdue at the week's end, most urgent first as the report sends them. */
export function MachinesDue({ machines, end }: { machines: MachineDue[]; end: string }) {
  return (
    <Panel>
      <h2 className="text-xl font-bold">Machines coming due</h2>
      {machines.length === 0 ? (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          No machine is due for service by {formatCalendarDate(end)}. Set a machine’s service intervals (fuel
          filter, in-tank strainer, oil) and it shows here as each one comes due.
        </p>
      ) : (
        <div className="mt-3 overflow-x-auto">
          {/* Three columns, status under its item, so a phone shows the whole row without scrolling. */}
          <table className="w-full border-collapse text-left text-base">
            <thead>
              <tr className="border-b-2 border-ink">
                <th scope="col" className="py-2 pr-4 font-bold">
                  Machine
                </th>
                <th scope="col" className="py-2 pr-4 font-bold">
                  Service and status
                </th>
                <th scope="col" className="py-2 font-bold">
                  Due
                </th>
              </tr>
            </thead>
            <tbody>
              {machines.map((due) => (
                <tr key={due.serviceIntervalId} className="border-b border-rule align-top">
                  <td className="py-3 pr-4">
                    <span className="block font-bold">{due.machine}</span>
                    <span className="text-ink-soft">{due.customerName}</span>
                  </td>
                  <td className="py-3 pr-4">
                    <span className="mb-1 block">{due.label}</span>
                    <StatusPill tone={statusShown[due.status].tone}>
                      {statusShown[due.status].word}
                    </StatusPill>
                  </td>
                  <td className="py-3">
                    <DueWhen due={due} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Panel>
  );
}

/**
 * The limit that decides first, then the other one: an interval is due by date or by meter,
 * whichever comes first, so both are worth knowing at the phone when booking the visit.
 */
function DueWhen({ due }: { due: MachineDue }) {
  const date = due.dueOn === null ? null : formatCalendarDate(due.dueOn);
  const meter = due.dueAtMeter === null ? null : `at ${formatDecimal(due.dueAtMeter, 1)} ${due.meterUnit}`;
  const meterFirst = (due.dueBy === 'distance' || due.dueBy === 'hours') && meter !== null;
  const [first, second] = meterFirst ? [meter, date] : [date, meter];
  return (
    <>
      {first ? <span className="block font-bold whitespace-nowrap">{first}</span> : null}
      {second ? <span className="block text-ink-soft">or {second}</span> : null}
    </>
  );
}
