import { Link, Navigate, Outlet, useLocation, useNavigation } from 'react-router';
import type { SessionUser } from '../../../shared/api/auth';
import { ServerProblem } from '../../features/health/components/server-problem';
import { ServerStatusBadge } from '../../features/health/components/server-status-badge';
import { useSignOut } from '../../features/session/api/mutations';
import { useSession } from '../../features/session/api/queries';
import { SessionMenu } from '../../features/session/components/session-menu';
import { paths } from '../paths';
import { signInPathReturningTo } from '../sign-in-return';
import { NotForYourRole } from './not-for-your-role';
import { sectionAt } from './sections';
import { SessionChecking, SessionUnknown } from './session-states';
import { KeyboardShortcuts } from './shortcuts';
import { SkipLink } from './skip-link';
import { SiteNav } from './site-nav';

/**
 * Every page but sign-in lives in this frame, and the frame opens only for someone signed in:
 * anyone else is sent to sign in, with the address they wanted kept for afterwards.
 */
export function AppFrame() {
  const session = useSession();
  const signOut = useSignOut();
  const location = useLocation();

  if (session.data === null) {
    // After a sign-out the next person starts afresh; after a lapsed session the same one comes back.
    const signedOutHere = signOut.isPending || signOut.isSuccess;
    const target = signedOutHere ? paths.signIn : signInPathReturningTo(location.pathname + location.search);
    return <Navigate to={target} replace />;
  }
  if (session.data) {
    return (
      <SignedInFrame
        user={session.data}
        onSignOut={() => signOut.mutate()}
        isSigningOut={signOut.isPending}
        signOutError={signOut.error}
      />
    );
  }
  if (session.isError) return <SessionUnknown error={session.error} onRetry={() => void session.refetch()} />;
  return <SessionChecking />;
}

type SignedInFrameProps = {
  user: SessionUser;
  onSignOut: () => void;
  isSigningOut: boolean;
  signOutError: Error | null;
};

function SignedInFrame({ user, ...signOut }: SignedInFrameProps) {
  const navigation = useNavigation();
  const { pathname } = useLocation();
  const section = sectionAt(pathname);
  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <header className="flex flex-wrap items-center justify-between gap-3 border-b-3 border-ink bg-panel px-4 py-3">
        <div className="flex flex-wrap items-center gap-x-4 gap-y-1">
          <Link to={paths.home} className="flex min-h-touch items-center text-2xl font-bold tracking-tight">
            Vanbay
          </Link>
          <ServerStatusBadge />
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <KeyboardShortcuts role={user.role} />
          <SessionMenu user={user} {...signOut} />
        </div>
      </header>
      <div className="flex flex-1 flex-col lg:flex-row">
        <SiteNav role={user.role} />
        <main
          id="main"
          tabIndex={-1}
          aria-busy={navigation.state === 'loading'}
          className="min-w-0 flex-1 p-4 lg:p-8"
        >
          <ServerProblem />
          {section && !section.roles.includes(user.role) ? (
            <NotForYourRole section={section} role={user.role} />
          ) : (
            <Outlet />
          )}
        </main>
      </div>
    </div>
  );
}
