/**
 * An instant (ISO 8601 with offset) as the day it fell on where the dashboard is being read:
 * the van and the desk are in the business's own zone. Same fixed locale as lib/format.ts.
 */
const dayFormat = new Intl.DateTimeFormat('en-US', { month: 'short', day: 'numeric', year: 'numeric' });

export function formatInstantDay(iso: string): string {
  return dayFormat.format(new Date(iso));
}
