import { QueryCache, QueryClient } from '@tanstack/react-query';
import type { DefaultOptions } from '@tanstack/react-query';
import { sessionQueries } from '../features/session/api/queries';
import { ApiError } from '../lib/api-client';

/**
 * The dashboard's one cache. Any 401 means the session ended under the page (expired, revoked,
 * signed out elsewhere): asking /me again turns that into "signed out", and the frame sends the
 * person to sign in and back to where they were.
 */
export function createQueryClient(queries: DefaultOptions['queries'] = {}): QueryClient {
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (error) => {
        if (error instanceof ApiError && error.status === 401) {
          void queryClient.invalidateQueries({ queryKey: sessionQueries.me().queryKey });
        }
      },
    }),
    defaultOptions: {
      // Data changes mostly from this one person's own actions, which invalidate what they touch.
      queries: { staleTime: 30_000, ...queries },
    },
  });
  return queryClient;
}
