import { infiniteQueryOptions, useInfiniteQuery } from '@tanstack/react-query';
import { OUTBOX_PATH, OutboxListSchema, type OutboxItem } from '../../../../shared/api/outbox';
import type { MailStatus } from '../../../../shared/api/outbox';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

export const MAIL_PAGE_SIZE = 25;

export const outboxQueries = {
  all: () => ['outbox'] as const,
  /** Every mail Vanbay sent or means to, newest first; `status` narrows it to one state. */
  list: (status: MailStatus | null) =>
    infiniteQueryOptions({
      queryKey: [...outboxQueries.all(), 'list', { status }] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(OUTBOX_PATH, { status, limit: MAIL_PAGE_SIZE, cursor: pageParam }),
          OutboxListSchema,
          {
            signal,
          },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
};

export function useOutbox(status: MailStatus | null) {
  return useInfiniteQuery({ ...outboxQueries.list(status), select: itemsOf<OutboxItem> });
}
