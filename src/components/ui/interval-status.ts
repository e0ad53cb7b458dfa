import type { IntervalStatus } from '../../../shared/api/reminders';
import type { Tone } from './tone';

/** How a service interval's standing is shown wherever it appears: its tone and its word. */
export const intervalStatusShown: Record<IntervalStatus, { tone: Tone; word: string }> = {
  overdue: { tone: 'fail', word: 'Overdue' },
  due: { tone: 'warn', word: 'Due' },
  due_soon: { tone: 'quiet', word: 'Due soon' },
  ok: { tone: 'pass', word: 'Not due' },
};
