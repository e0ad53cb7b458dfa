import { useState } from 'react';
import { Link, useSearchParams } from 'react-router';
import { format, startOfWeek } from 'date-fns';
import { IsoDateSchema } from '../../../shared/api/common';
import { isAllowed } from '../../../shared/api/policy';
import { buttonClasses } from '../../components/ui/button';
import { PageHeading } from '../../components/ui/page-heading';
import { mileageCsvPath } from '../../features/mileage/api/queries';
import { MileageTotalsPanel } from '../../features/mileage/components/mileage-totals';
import { TripLog } from '../../features/mileage/components/trip-log';
import { WeekMileage } from '../../features/mileage/components/week-mileage';
import { useSessionUser } from '../../features/session/api/queries';
import { calendarDate } from '../../lib/format';

/** Years a log can be asked for: the IRS rate table starts in 2019; far-future years are typos. */
const FIRST_YEAR = 2019;

/**
 * The van's mileage log: a week, the tax year month by month, the trips, and the CSV for the
 * bookkeeper. The year (`?year=`) and the week (`?week=`, its Monday) are in the address.
 */
export function Component() {
  const { role } = useSessionUser();
  const [search] = useSearchParams();
  // Read once per visit, so "this year" does not move under someone reviewing at midnight.
  const [today] = useState(() => new Date());
  const thisYear = today.getFullYear();
  const year = yearFrom(search.get('year'), thisYear);
  const week = mondayFrom(search.get('week'), today);

  const href = (next: { year?: number; week?: string }) => {
    const params = new URLSearchParams(search);
    if (next.year !== undefined) params.set('year', String(next.year));
    if (next.week !== undefined) params.set('week', next.week);
    return `?${params}`;
  };

  return (
    <>
      <PageHeading title="Mileage">
        Business trips in the van, with the deduction at the IRS standard rate for each trip’s date.
      </PageHeading>
      <div className="grid gap-6">
        <WeekMileage
          start={week}
          canRead={isAllowed(role, 'reports', 'read')}
          weekHref={(start) => href({ week: start })}
        />
        <div className="flex flex-wrap items-center justify-between gap-3">
          <nav aria-label="Tax year" className="flex flex-wrap items-center gap-2">
            {year > FIRST_YEAR ? (
              <Link to={href({ year: year - 1 })} className={buttonClasses('secondary')}>
                ← {year - 1}
              </Link>
            ) : null}
            <span className="px-2 text-2xl font-bold" aria-current="page">
              {year}
            </span>
            {year < thisYear ? (
              <Link to={href({ year: year + 1 })} className={buttonClasses('secondary')}>
                {year + 1} →
              </Link>
            ) : null}
          </nav>
          <a href={mileageCsvPath(year)} download className={buttonClasses()}>
            Export {year} as CSV
          </a>
        </div>
        <MileageTotalsPanel year={year} />
        <TripLog year={year} />
      </div>
    </>
  );
}

function yearFrom(param: string | null, thisYear: number): number {
  const year = Number(param);
  return Number.isInteger(year) && year >= FIRST_YEAR && year <= thisYear ? year : thisYear;
}

/** The Monday of the week a `?week=` day falls in, or of this week when it names no real day. */
function mondayFrom(param: string | null, today: Date): string {
  let day = today;
  if (param && IsoDateSchema.safeParse(param).success) {
    try {
      day = calendarDate(param);
    } catch {
      day = today;
    }
  }
  return format(startOfWeek(day, { weekStartsOn: 1 }), 'yyyy-MM-dd');
}
