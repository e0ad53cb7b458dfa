import { differenceInCalendarDays, format } from 'date-fns';
import { calendarDate } from './format';

/** The calendar day an instant falls on for this device, YYYY-MM-DD. */
export function localDay(instant: Date | string): string {
  return format(typeof instant === 'string' ? new Date(instant) : instant, 'yyyy-MM-dd');
}

/** Today on this device's calendar (for the van's laptop, the business's own). */
export function todayIso(): string {
  return localDay(new Date());
}

/** Whole calendar days from `fromIso` to `toIso` (negative when `toIso` is earlier). */
export function daysFrom(fromIso: string, toIso: string): number {
  return differenceInCalendarDays(calendarDate(toIso), calendarDate(fromIso));
}
