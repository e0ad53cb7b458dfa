/**
 * Numbers and calendar dates as the dashboard shows them. One fixed locale: the business is a US
 * one (dollars, miles, IRS rates), and a fixed locale keeps the desk and the phone in agreement.
 */
const LOCALE = 'en-US';

const decimalFormats = new Map<number, Intl.NumberFormat>();

/** 1234.5 → "1,234.5" with at most `places` decimals, none shown when the value is whole. */
export function formatDecimal(value: number, places: number): string {
  let format = decimalFormats.get(places);
  if (!format) {
    format = new Intl.NumberFormat(LOCALE, { maximumFractionDigits: places });
    decimalFormats.set(places, format);
  }
  return format.format(value);
}

/** "1 invoice", "8 invoices". */
export function countOf(count: number, singular: string, pluralForm = `${singular}s`): string {
  return `${formatDecimal(count, 0)} ${count === 1 ? singular : pluralForm}`;
}

/**
 * A YYYY-MM-DD calendar date read as that day wherever the browser is: built from its parts, so
 * no time zone can move it to the day before.
 * @throws RangeError for text that is not a YYYY-MM-DD date.
 */
export function calendarDate(isoDate: string): Date {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) throw new RangeError(`not a YYYY-MM-DD date: ${isoDate}`);
  const [, year, month, day] = match;
  const date = new Date(2000, 0, 1);
  // setFullYear, not the constructor, which reads years 0–99 as 1900–1999.
  date.setFullYear(Number(year), Number(month) - 1, Number(day));
  // Date rolls an impossible day or month over (Feb 30 → Mar 2); a roll-over means no such day.
  if (date.getMonth() !== Number(month) - 1 || date.getDate() !== Number(day)) {
    throw new RangeError(`no such day: ${isoDate}`);
  }
  return date;
}

const dateFormats = {
  /** "Oct 10, 2026" */
  medium: new Intl.DateTimeFormat(LOCALE, { month: 'short', day: 'numeric', year: 'numeric' }),
  /** "Mon, Nov 16" */
  weekday: new Intl.DateTimeFormat(LOCALE, { weekday: 'short', month: 'short', day: 'numeric' }),
  /** "Mon" */
  dayName: new Intl.DateTimeFormat(LOCALE, { weekday: 'short' }),
} as const;

export type DateStyle = keyof typeof dateFormats;

export function formatCalendarDate(isoDate: string, style: DateStyle = 'medium'): string {
  return dateFormats[style].format(calendarDate(isoDate));
}

/** "Nov 16 – 22, 2026", or across months and years as the locale writes it. */
export function formatDateRange(startIso: string, endIso: string): string {
  return dateFormats.medium.formatRange(calendarDate(startIso), calendarDate(endIso));
}

const instantFormats = {
  /** "Oct 10, 2026" */
  day: new Intl.DateTimeFormat(LOCALE, { month: 'short', day: 'numeric', year: 'numeric' }),
  /** "Oct 10, 2026, 9:30 AM" */
  dayTime: new Intl.DateTimeFormat(LOCALE, {
    month: 'short',
    day: 'numeric',
    year: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
  }),
  /** "Tue, Nov 17, 9:30 AM" */
  weekdayTime: new Intl.DateTimeFormat(LOCALE, {
    weekday: 'short',
    month: 'short',
    day: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
  }),
} as const;

export type InstantStyle = keyof typeof instantFormats;

/**
 * An instant (ISO 8601 with offset) as it fell where the dashboard is being read: the van and the
 * desk are in the business's own zone.
 */
export function formatInstant(iso: string, style: InstantStyle = 'day'): string {
  return instantFormats[style].format(new Date(iso));
}
