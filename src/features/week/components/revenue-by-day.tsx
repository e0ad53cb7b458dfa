import { lazy, Suspense } from 'react';
import type { WeekReport } from '../../../../shared/api/reports';
import { Panel } from '../../../components/ui/panel';
import { formatCalendarDate } from '../../../lib/format';
import { formatCents } from '../../../lib/money';

type RevenueByDayList = WeekReport['revenueByDay'];

const RevenueBars = lazy(() => import('./revenue-bars').then((module) => ({ default: module.RevenueBars })));

/**
 * Invoiced revenue per day of the week as bars, with the same figures in a table beneath for anyone
 * who cannot see the chart (or wants the cents).
 */
export function RevenueByDay({ days }: { days: RevenueByDayList }) {
  const anyRevenue = days.some((day) => day.cents !== 0);
  return (
    <Panel>
      <h2 className="text-xl font-bold">Revenue by day</h2>
      {anyRevenue ? (
        <>
          <div className="mt-3 h-[260px]" aria-hidden="true">
            <Suspense fallback={<p className="text-lg text-ink-soft">Drawing the chart…</p>}>
              <RevenueBars days={days} />
            </Suspense>
          </div>
          <details className="mt-3 text-base">
            <summary className="flex min-h-touch cursor-pointer items-center font-bold">
              The same figures as a table
            </summary>
            <RevenueTable days={days} />
          </details>
        </>
      ) : (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          No invoice was issued this week. Invoice a completed job (
          <code className="font-mono font-bold">vanbay invoice create</code>) and its total shows here on the
          day it was issued.
        </p>
      )}
    </Panel>
  );
}

function RevenueTable({ days }: { days: RevenueByDayList }) {
  return (
    <table className="mt-2 w-full max-w-sm border-collapse text-left">
      <caption className="sr-only">Revenue by day</caption>
      <thead>
        <tr className="border-b-2 border-ink">
          <th scope="col" className="py-1 pr-4">
            Day
          </th>
          <th scope="col" className="py-1 text-right">
            Revenue
          </th>
        </tr>
      </thead>
      <tbody>
        {days.map((day) => (
          <tr key={day.date} className="border-b border-rule">
            <th scope="row" className="py-1 pr-4 font-medium">
              {formatCalendarDate(day.date, 'weekday')}
            </th>
            <td className="py-1 text-right font-bold tabular-nums">{formatCents(day.cents)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
