import { Navigate, Outlet, useLocation } from 'react-router';
import { useSession, useSignedOutHere } from '../../features/session/api/queries';
import { paths } from '../paths';
import { signInPathReturningTo } from '../sign-in-return';
import { SessionChecking, SessionUnknown } from './session-states';

/**
 * Every page but sign-in lives in this frame, and the frame opens only for someone signed in:
 * anyone else is sent to sign in, with the address they wanted kept for afterwards. This part is
 * only the session check, in the first load so /me is asked at once; the header and navigation
 * (`signed-in-frame.tsx`, the child route) load beside it and the page, and render in the outlet.
 */
export function AppFrame() {
  const session = useSession();
  const signedOutHere = useSignedOutHere();
  const location = useLocation();

  if (session.data === null) {
    // After a sign-out the next person starts afresh; after a lapsed session the same one comes back.
    const target = signedOutHere ? paths.signIn : signInPathReturningTo(location.pathname + location.search);
    return <Navigate to={target} replace />;
  }
  if (session.data) return <Outlet />;
  if (session.isError) return <SessionUnknown error={session.error} onRetry={() => void session.refetch()} />;
  return <SessionChecking />;
}
