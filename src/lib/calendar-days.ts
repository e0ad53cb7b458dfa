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

/**
 * Today on the business's calendar (its IANA time zone), YYYY-MM-DD: the day the server counts as
 * today, so a form's default day is never "in the future" for it when this device's zone differs.
 */
export function todayIn(timeZone: string, now: Date = new Date()): string {
  // en-CA writes a date as YYYY-MM-DD.
  return new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
  }).format(now);
}

/** Whole calendar days from `fromIso` to `toIso` (negative when `toIso` is earlier). */
export function daysFrom(fromIso: string, toIso: string): number {
  return differenceInCalendarDays(calendarDate(toIso), calendarDate(fromIso));
}
