import { formatInstant } from '../../../lib/format';

/** "Tue, Nov 17, 9:30 AM" in the browser's zone (the mechanic's own). */
export function formatWhen(iso: string | null): string {
  return iso === null ? 'not scheduled' : formatInstant(iso, 'weekdayTime');
}
