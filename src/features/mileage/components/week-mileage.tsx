import { addDays, format } from 'date-fns';
import { Link } from 'react-router';
import { buttonClasses } from '../../../components/ui/button';
import { LoadFailure } from '../../../components/ui/load-failure';
import { Panel } from '../../../components/ui/panel';
import { calendarDate, formatDateRange } from '../../../lib/format';
import { useWeekMileage } from '../api/queries';
import { deductionText, milesText } from './mileage-totals';

/** The seven days from `start` moved by whole weeks, YYYY-MM-DD. */
export function weekMoved(start: string, weeks: number): string {
  return format(addDays(calendarDate(start), weeks * 7), 'yyyy-MM-dd');
}

type WeekMileageProps = {
  /** The week's first day (a Monday, as the week review counts). */
  start: string;
  /** The week totals come from the week report, which only the owner and the bookkeeper may read. */
  canRead: boolean;
  /** The address of another week, for the previous and next links. */
  weekHref: (start: string) => string;
};

/** One week's miles and deduction, with the way to the weeks either side. */
export function WeekMileage({ start, canRead, weekHref }: WeekMileageProps) {
  const week = useWeekMileage(start, canRead);
  const end = weekMoved(start, 1);
  const last = format(addDays(calendarDate(end), -1), 'yyyy-MM-dd');
  return (
    <Panel>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-xl font-bold">
          Week of <span aria-live="polite">{formatDateRange(start, last)}</span>
        </h2>
        <div className="flex gap-2">
          <Link to={weekHref(weekMoved(start, -1))} className={buttonClasses('secondary')}>
            ← Week before
          </Link>
          <Link to={weekHref(end)} className={buttonClasses('secondary')}>
            Week after →
          </Link>
        </div>
      </div>
      {!canRead ? (
        <p className="mt-3 text-lg text-ink-soft">
          Week totals come from the week review, which is for the owner and the bookkeeper. The trips of the
          week are in the log below.
        </p>
      ) : week.isPending ? (
        <p role="status" className="mt-3 text-lg text-ink-soft">
          Loading the week…
        </p>
      ) : week.isError ? (
        <div className="mt-3">
          <LoadFailure
            title="The week’s miles could not be loaded"
            error={week.error}
            onRetry={() => void week.refetch()}
            retrying={week.isFetching}
          />
        </div>
      ) : (
        <dl className="mt-3 grid grid-cols-2 gap-3">
          <div>
            <dt className="text-sm font-bold tracking-wider uppercase">Week’s miles</dt>
            <dd className="text-2xl font-bold tabular-nums">{milesText(week.data.miles)}</dd>
          </div>
          <div>
            <dt className="text-sm font-bold tracking-wider uppercase">Week’s deduction</dt>
            <dd className="text-2xl font-bold tabular-nums">{deductionText(week.data.deductionCents)}</dd>
          </div>
        </dl>
      )}
    </Panel>
  );
}
