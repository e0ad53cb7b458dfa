import { Link } from 'react-router';
import type { MachineDue } from '../../../../shared/api/reports';
import { paths } from '../../../app/paths';
import { Panel } from '../../../components/ui/panel';
import { intervalStatusShown } from '../../../components/ui/interval-status';
import { StatusPill } from '../../../components/ui/status-pill';
import { countOf, formatCalendarDate, formatDecimal } from '../../../lib/format';

/** The whole due list, due soon included, as it stands today. */
const REMINDERS_DUE_SOON = `${paths.reminders}?show=soon`;

type MachinesDueProps = {
  /** The most urgent, as the report sends them (it lists at most MACHINES_DUE_LISTED). */
  machines: MachineDue[];
  /** How many are due soon, due or overdue in all. */
  total: number;
  end: string;
  /** Whether to link to the reminders page for the rest: not for a role that cannot open it. */
  linkToReminders?: boolean;
};

/** Service items due soon, due or overdue at the week's end, most urgent first as the report sends them. */
export function MachinesDue({ machines, total, end, linkToReminders = true }: MachinesDueProps) {
  const more = total - machines.length;
  return (
    <Panel>
      <h2 className="text-xl font-bold">Machines coming due</h2>
      {machines.length > 0 && more > 0 ? (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          {countOf(total, 'service item')} due soon, due or overdue by {formatCalendarDate(end)}; the{' '}
          {formatDecimal(machines.length, 0)} most urgent first.
        </p>
      ) : null}
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
                    <StatusPill tone={intervalStatusShown[due.status].tone}>
                      {intervalStatusShown[due.status].word}
                    </StatusPill>
                  </td>
                  <td className="py-3">
                    <DueWhen due={due} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {more > 0 ? (
            <p className="mt-3 text-lg">
              and {formatDecimal(more, 0)} more
              {linkToReminders ? (
                <>
                  {' '}
                  — see{' '}
                  <Link to={REMINDERS_DUE_SOON} className="font-bold underline underline-offset-4">
                    Reminders
                  </Link>
                </>
              ) : null}
            </p>
          ) : null}
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
