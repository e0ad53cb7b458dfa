import { queryOptions, useMutationState, useQuery } from '@tanstack/react-query';
import { ME_PATH } from '../../../../shared/api/auth-paths';
import type { SessionUser } from '../../../../shared/api/auth';
import { ApiError } from '../../../lib/api-client';
import { request } from '../../../lib/api-client';

/** The frame asks this before any page: its schema (and zod) load beside the request, not before it. */
const meResponseSchema = () => import('../../../../shared/api/auth').then((m) => m.MeResponseSchema);

/**
 * Who is signed in, or null. A 401 is the ordinary answer for a browser without a session (the
 * cookie is httpOnly, so asking is the only way to know), so it is data here, not an error.
 */
export async function fetchSessionUser(signal?: AbortSignal): Promise<SessionUser | null> {
  try {
    const { user } = await request(ME_PATH, meResponseSchema, signal ? { signal } : {});
    return user;
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null;
    throw error;
  }
}

export const sessionQueries = {
  all: () => ['session'] as const,
  me: () =>
    queryOptions({
      queryKey: [...sessionQueries.all(), 'me'] as const,
      queryFn: ({ signal }) => fetchSessionUser(signal),
    }),
};

/** The session as the frame needs it: still asking, signed out (null), signed in, or unknown (error). */
export function useSession() {
  return useQuery(sessionQueries.me());
}

/**
 * The signed-in person, for pages inside the signed-in frame, which renders them only once the
 * session is known.
 * @throws Error when used where nobody is signed in: a page mounted outside the frame.
 */
export function useSessionUser(): SessionUser {
  const { data } = useSession();
  if (!data) throw new Error('useSessionUser is for pages inside the signed-in frame');
  return data;
}

/** The sign-out's mutation key: the frame reads its state without holding the mutation itself. */
export const signOutMutationKey = () => [...sessionQueries.all(), 'sign-out'] as const;

/**
 * True while a sign-out started in this tab is under way or done, until the next sign-in: a
 * session gone for that reason sends the next person to sign in afresh, not back to this page.
 */
export function useSignedOutHere(): boolean {
  const statuses = useMutationState({
    filters: { mutationKey: signOutMutationKey() },
    select: (mutation) => mutation.state.status,
  });
  return statuses.some((status) => status === 'pending' || status === 'success');
}
