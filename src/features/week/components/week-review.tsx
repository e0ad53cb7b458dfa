import { AlertPanel } from '../../../components/ui/alert-panel';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ApiError } from '../../../lib/api-client';
import { formatCalendarDate, formatDateRange } from '../../../lib/format';
import { useWeekReport } from '../api/queries';
import { CheckVerdicts } from './check-verdicts';
import { MachinesDue } from './machines-due';
import { RevenueByDay } from './revenue-by-day';
import { isQuietWeek, WeekFigures } from './week-figures';

/**
 * The review of the week starting `start`: its figures, the money by day, the checks, what comes
 * due. `linkToReminders` is for the route to turn off for a role without the reminders page.
 */
export function WeekReview({ start, linkToReminders = true }: { start: string; linkToReminders?: boolean }) {
  const report = useWeekReport(start);

  if (report.isPending) return <WeekLoading />;
  if (report.isError) {
    return (
      <AlertPanel title="The week review could not be loaded">
        <p>{failureReason(report.error)}</p>
        <Button className="mt-4" onClick={() => void report.refetch()} disabled={report.isFetching}>
          {report.isFetching ? 'Trying again…' : 'Try again'}
        </Button>
      </AlertPanel>
    );
  }

  const week = report.data;
  return (
    // minmax(0, 1fr) columns, so the wide due table scrolls inside its panel instead of widening the page.
    <div className="grid grid-cols-1 gap-6">
      {isQuietWeek(week) ? (
        <EmptyState title="Nothing was recorded in this week">
          <p>
            Jobs completed, invoices issued, payments taken, van trips and guided checks from{' '}
            {formatDateRange(week.start, week.end)} show up here. Pick another week above, or record the work
            from the van: <code className="font-mono font-bold">vanbay job new</code>,{' '}
            <code className="font-mono font-bold">vanbay trip start</code>.
          </p>
        </EmptyState>
      ) : null}
      <WeekFigures report={week} />
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <RevenueByDay days={week.revenueByDay} />
        <CheckVerdicts checks={week.checks} />
      </div>
      <MachinesDue
        machines={week.machinesDue}
        total={week.machinesDueTotal}
        end={week.end}
        linkToReminders={linkToReminders}
      />
      <p className="text-base text-ink-soft">
        Days run midnight to midnight in the business’s time zone ({week.timezone}); balances and due dates
        are as they stood at the end of {formatCalendarDate(week.end)}.
      </p>
    </div>
  );
}

/** Tiles' outlines where the figures will be, so the page does not jump when they arrive. */
function WeekLoading() {
  return (
    <div className="grid gap-6" aria-busy="true">
      <p role="status" className="text-lg text-ink-soft">
        Loading the week’s figures…
      </p>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 xl:grid-cols-4" aria-hidden="true">
        {Array.from({ length: 8 }, (_, i) => (
          <div key={i} className="h-32 rounded-plate border-2 border-dashed border-rule bg-panel" />
        ))}
      </div>
    </div>
  );
}

function failureReason(error: Error): string {
  if (error instanceof ApiError && error.status === 0) {
    return 'The Vanbay server did not answer. Check that it is running (npm start), then try again.';
  }
  if (error instanceof ApiError && error.status === 403) {
    return 'Your sign-in may not read the week review: it is for the owner and the bookkeeper.';
  }
  if (error instanceof ApiError)
    return `The server answered ${error.status} (${error.code}): ${error.message}`;
  return error.message;
}
