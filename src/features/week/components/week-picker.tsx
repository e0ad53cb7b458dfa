import { Link } from 'react-router';
import { buttonClasses } from '../../../components/ui/button';
import { shiftWeek } from '../week-range';

type WeekPickerProps = {
  /** The Monday being shown. */
  start: string;
  /** This week's Monday, on the browser's calendar. */
  thisWeek: string;
  /** A day typed or picked in the date field; the page turns it into its week. */
  onPickDay: (day: string) => void;
};

const weekLink = (start: string) => `?${new URLSearchParams({ start })}`;

/**
 * Previous, this and next week as links, so the browser's back button walks the weeks too; and a
 * date field to jump to the week of any day (the bookkeeper's quarter end, say).
 */
export function WeekPicker({ start, thisWeek, onPickDay }: WeekPickerProps) {
  const isThisWeek = start === thisWeek;
  return (
    <nav aria-label="Choose the week" className="flex flex-wrap items-end gap-3">
      <Link to={weekLink(shiftWeek(start, -1))} className={buttonClasses('secondary')}>
        <span aria-hidden="true">←</span> Previous week
      </Link>
      <Link
        to={weekLink(thisWeek)}
        aria-current={isThisWeek ? 'date' : undefined}
        className={buttonClasses(isThisWeek ? 'primary' : 'secondary')}
      >
        This week
      </Link>
      <Link to={weekLink(shiftWeek(start, 1))} className={buttonClasses('secondary')}>
        Next week <span aria-hidden="true">→</span>
      </Link>
      <label className="grid gap-1 text-base font-bold">
        Go to the week of
        <input
          type="date"
          value={start}
          onChange={(event) => {
            if (event.target.value) onPickDay(event.target.value);
          }}
          className="min-h-touch rounded-plate border-2 border-ink bg-panel px-3 text-lg font-medium text-ink"
        />
      </label>
    </nav>
  );
}
