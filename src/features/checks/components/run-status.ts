import type { CheckRunSummary } from '../../../../shared/api/checks';

/** A run's status in the words the dashboard uses for it. */
export const RUN_STATUS_WORDS: Record<CheckRunSummary['status'], string> = {
  in_progress: 'Under way',
  paused: 'Paused',
  finished: 'Finished',
  abandoned: 'Abandoned',
};
