import { useSearchParams } from 'react-router';
import { isAllowed } from '../../../shared/api/policy';
import type { IntervalStatus } from '../../../shared/api/reminders';
import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';
import { DueTable } from '../../features/reminders/components/due-table';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths, pathTo } from '../paths';

/** What the list holds: what needs a reminder now, or that plus what comes due in the next weeks. */
const VIEWS = {
  due: { label: 'Due and overdue', statuses: ['overdue', 'due'] },
  soon: { label: 'Due soon too', statuses: ['overdue', 'due', 'due_soon'] },
} as const satisfies Record<string, { label: string; statuses: readonly IntervalStatus[] }>;
type View = keyof typeof VIEWS;

const links = { machine: pathTo.machine, customer: pathTo.customer };

/** Service items due by distance, hours or months (whichever comes first), and the reminders for them. */
export function Component() {
  const { role } = useSessionUser();
  const [search, setSearch] = useSearchParams();
  const view: View = search.get('show') === 'soon' ? 'soon' : 'due';
  const canSend = isAllowed(role, 'reminders', 'create') && isAllowed(role, 'reminders', 'update');
  return (
    <>
      <PageHeading title={labelOf(paths.reminders, role)}>
        Each machine’s service items as they stand today.{' '}
        {canSend
          ? 'Send a reminder and the customer gets an e-mail naming the machine, the item and when it is due.'
          : 'The owner sends the reminders.'}
      </PageHeading>
      <div className="grid gap-6">
        <div role="group" aria-label="Which items" className="flex flex-wrap gap-2">
          {(Object.keys(VIEWS) as View[]).map((key) => (
            <button
              key={key}
              type="button"
              aria-pressed={view === key}
              onClick={() => setSearch(key === 'due' ? {} : { show: key }, { replace: true })}
              className={`min-h-touch rounded-plate border-2 px-4 text-base font-bold ${
                view === key
                  ? 'border-ink bg-ink text-ground'
                  : 'border-ink bg-panel text-ink hover:bg-ground'
              }`}
            >
              {VIEWS[key].label}
            </button>
          ))}
        </div>
        <DueTable
          filter={{ statuses: VIEWS[view].statuses }}
          links={links}
          canSend={canSend}
          empty={
            <EmptyState title={view === 'due' ? 'Nothing is due or overdue' : 'Nothing is coming due'}>
              <p>
                {view === 'due'
                  ? 'No service item on any machine is due today. Look at “Due soon too” to plan the next weeks.'
                  : 'No machine has a service item coming due.'}{' '}
                Only machines with service intervals set show here: open a machine to see its intervals.
              </p>
            </EmptyState>
          }
        />
      </div>
    </>
  );
}
