import { useState } from 'react';
import { useSearchParams } from 'react-router';
import { PageHeading } from '../../components/ui/page-heading';
import { useSessionUser } from '../../features/session/api/queries';
import { WeekPicker } from '../../features/week/components/week-picker';
import { WeekReview } from '../../features/week/components/week-review';
import { lastDayOf, mondayOf, weekFromParam } from '../../features/week/week-range';
import { formatDateRange } from '../../lib/format';
import { mayOpen } from '../layout/sections';
import { paths } from '../paths';

/** The desk review (PRODUCT.md, "Week review"); the week is in the address, `?start=YYYY-MM-DD`. */
export function Component() {
  const [search, setSearch] = useSearchParams();
  const { role } = useSessionUser();
  // Read once per visit: "this week" should not move under someone reviewing at midnight on Sunday.
  const [today] = useState(() => new Date());
  const thisWeek = mondayOf(today);
  const week = weekFromParam(search.get('start'), today);
  return (
    <>
      <PageHeading title="Week" />
      <div className="mb-6 grid gap-4">
        <p className="text-2xl font-bold" aria-live="polite">
          {formatDateRange(week.start, lastDayOf(week.start))}
        </p>
        {week.understood ? null : (
          <p className="text-lg text-ink-soft">
            The address asked for a date that does not exist, so this is the current week.
          </p>
        )}
        <WeekPicker
          start={week.start}
          thisWeek={thisWeek}
          onPickDay={(day) => setSearch({ start: weekFromParam(day, today).start })}
        />
      </div>
      <WeekReview start={week.start} linkToReminders={mayOpen(paths.reminders, role)} />
    </>
  );
}
