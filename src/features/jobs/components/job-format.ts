const dateTime = new Intl.DateTimeFormat('en-US', {
  weekday: 'short',
  month: 'short',
  day: 'numeric',
  hour: 'numeric',
  minute: '2-digit',
});

/** "Tue, Nov 17, 9:30 AM" in the browser's zone (the mechanic's own). */
export function formatWhen(iso: string | null): string {
  return iso === null ? 'not scheduled' : dateTime.format(new Date(iso));
}
