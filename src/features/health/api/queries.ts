import { queryOptions, useQuery } from '@tanstack/react-query';
import { HEALTH_PATH, HealthSchema } from '../../../../shared/api/health';
import type { Health } from '../../../../shared/api/health';
import { request } from '../../../lib/api-client';
import { PUBLIC_QUERY_META } from '../../../lib/query-scope';

/** How often the header re-asks the server, so the indicator notices the server stopping or coming back. */
const HEALTH_POLL_MS = 30_000;

export function fetchHealth(signal?: AbortSignal): Promise<Health> {
  return request(HEALTH_PATH, HealthSchema, signal ? { signal } : {});
}

export const healthQueries = {
  all: () => ['health'] as const,
  status: () =>
    queryOptions({
      queryKey: [...healthQueries.all(), 'status'] as const,
      queryFn: ({ signal }) => fetchHealth(signal),
      refetchInterval: HEALTH_POLL_MS,
      // A probe should report what it sees; the poll above is the retry. Retrying here would hold
      // the indicator on "checking" for several seconds while the server is plainly down.
      retry: false,
      // A failed probe is asked again by the poll or the "Check again" button, not by each component
      // that mounts to show the failure: the problem panel mounting on a failure would otherwise
      // re-ask, flip to "checking", unmount, fail again, and loop.
      retryOnMount: false,
      // The same answer signed in or out, so a sign-out keeps it and the header badge stays put.
      meta: PUBLIC_QUERY_META,
    }),
};

export type ServerStatus = 'checking' | 'online' | 'not-ready' | 'unreachable';

export function useServerStatus() {
  const query = useQuery(healthQueries.status());
  return {
    status: serverStatusOf(query),
    error: query.error,
    recheck: () => void query.refetch(),
    isRechecking: query.isFetching,
    /** Some earlier probe failed: a "checking" now is a re-check after a failure, not a first look. */
    failedBefore: query.errorUpdatedAt > 0,
  };
}

/**
 * Checked in this order because a failed re-poll keeps the last good data: an error must win over
 * stale data, or the header would say "online" about a server that just stopped answering.
 */
function serverStatusOf(query: { isError: boolean; data: Health | undefined }): ServerStatus {
  if (query.isError) return 'unreachable';
  if (query.data === undefined) return 'checking';
  return query.data.ok ? 'online' : 'not-ready';
}
