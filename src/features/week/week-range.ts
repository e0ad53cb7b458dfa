import { addDays, addWeeks, format, startOfWeek } from 'date-fns';
import { calendarDate } from '../../lib/format';

const ISO_DATE = 'yyyy-MM-dd';

/** Monday, as ISO 8601 starts the week; the report itself accepts any first day. */
const MONDAY = 1;

/** The Monday on or before `day`, as YYYY-MM-DD on the browser's calendar. */
export function mondayOf(day: Date): string {
  return format(startOfWeek(day, { weekStartsOn: MONDAY }), ISO_DATE);
}

/** `start` moved by whole weeks (negative for earlier ones). @throws RangeError for a bad date. */
export function shiftWeek(start: string, weeks: number): string {
  return format(addWeeks(calendarDate(start), weeks), ISO_DATE);
}

/** The week's seventh day. @throws RangeError for a bad date. */
export function lastDayOf(start: string): string {
  return format(addDays(calendarDate(start), 6), ISO_DATE);
}

export type WeekChoice = {
  /** The Monday of the week to show. */
  start: string;
  /** False when the address asked for a date that does not exist, and this week is shown instead. */
  understood: boolean;
};

/**
 * The week an address's `?start=` asks for. Any day picks the week it falls in, so a link to a
 * Wednesday still opens on that week's Monday; no date means this week.
 */
export function weekFromParam(param: string | null, today: Date): WeekChoice {
  if (param === null || param === '') return { start: mondayOf(today), understood: true };
  const day = parseIsoDate(param);
  return day ? { start: mondayOf(day), understood: true } : { start: mondayOf(today), understood: false };
}

/** A YYYY-MM-DD date that exists, or null. */
function parseIsoDate(text: string): Date | null {
  try {
    return calendarDate(text);
  } catch {
    return null;
  }
}
