import { hashKey, useMutation, useQueryClient } from '@tanstack/react-query';
import type { QueryClient } from '@tanstack/react-query';
import { SIGN_IN_PATH, SIGN_OUT_PATH } from '../../../../shared/api/auth-paths';
import type { SessionUser, SignInInput } from '../../../../shared/api/auth';
import { ApiError, jsonInit, request } from '../../../lib/api-client';
import { holdsPersonalData } from '../../../lib/query-scope';
import { sessionQueries, signOutMutationKey } from './queries';

/**
 * A change of person: drop every answer fetched for the one before (their week, their jobs), then
 * record who is signed in now. The answer already names the user, so /me need not be asked again.
 */
function switchSession(queryClient: QueryClient, user: SessionUser | null) {
  const meKey = sessionQueries.me().queryKey;
  const meHash = hashKey(meKey);
  // The session query itself stays: the frame is watching it, and is about to be told the news.
  queryClient.removeQueries({ predicate: (query) => holdsPersonalData(query) && query.queryHash !== meHash });
  queryClient.setQueryData(meKey, user);
  // A new sign-in ends what the last sign-out said (useSignedOutHere).
  if (user) {
    const mutations = queryClient.getMutationCache();
    for (const done of mutations.findAll({ mutationKey: signOutMutationKey() })) mutations.remove(done);
  }
}

// The frame holds the sign-out, so these load with the first answer rather than with the frame.
const authSchemas = () => import('../../../../shared/api/auth');

export function signIn(input: SignInInput) {
  // The server sets the httpOnly session cookie; the token in the body is for the CLI, not the page.
  return request(
    SIGN_IN_PATH,
    async () => (await authSchemas()).SignInResponseSchema,
    jsonInit('POST', input),
  );
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: ({ user }) => switchSession(queryClient, user),
  });
}

export async function signOut(): Promise<void> {
  try {
    await request(SIGN_OUT_PATH, async () => (await authSchemas()).SignOutResponseSchema, {
      method: 'POST',
    });
  } catch (error) {
    // A 401 means the session had already ended (expired or revoked): signed out all the same.
    if (!(error instanceof ApiError && error.status === 401)) throw error;
  }
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: signOutMutationKey(),
    mutationFn: signOut,
    onSuccess: () => switchSession(queryClient, null),
  });
}
