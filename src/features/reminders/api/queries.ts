import { infiniteQueryOptions, useInfiniteQuery } from '@tanstack/react-query';
import { DueListSchema, REMINDERS_PATH } from '../../../../shared/api/reminders';
import type { DueItem, IntervalStatus } from '../../../../shared/api/reminders';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

export const DUE_PAGE_SIZE = 50;

export type DueFilter = {
  /** Which interval statuses to list; the server judges each interval on its own today. */
  statuses: readonly IntervalStatus[];
};

export const reminderQueries = {
  all: () => ['reminders'] as const,
  lists: () => [...reminderQueries.all(), 'due'] as const,
  list: (filter: DueFilter) =>
    infiniteQueryOptions({
      queryKey: [...reminderQueries.lists(), { statuses: [...filter.statuses].sort() }] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(REMINDERS_PATH, {
            status: filter.statuses.join(','),
            limit: DUE_PAGE_SIZE,
            cursor: pageParam,
          }),
          DueListSchema,
          { signal },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
};

export function useDueList(filter: DueFilter) {
  return useInfiniteQuery({ ...reminderQueries.list(filter), select: itemsOf<DueItem> });
}
