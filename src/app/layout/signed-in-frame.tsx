import { Link, Outlet, useLocation, useNavigation } from 'react-router';
import { ServerProblem } from '../../features/health/components/server-problem';
import { ServerStatusBadge } from '../../features/health/components/server-status-badge';
import { useSignOut } from '../../features/session/api/mutations';
import { useSessionUser } from '../../features/session/api/queries';
import { SessionMenu } from '../../features/session/components/session-menu';
import { paths } from '../paths';
import { NotForYourRole } from './not-for-your-role';
import { sectionAt } from './sections';
import { KeyboardShortcuts } from './shortcuts';
import { SkipLink } from './skip-link';
import { SiteNav } from './site-nav';

/**
 * The header, navigation and page of someone signed in, and the way out (a route module: the
 * session check in `app-frame.tsx` renders it once /me has named the person).
 */
export function Component() {
  const user = useSessionUser();
  const signOut = useSignOut();
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
          <SessionMenu
            user={user}
            onSignOut={() => signOut.mutate()}
            isSigningOut={signOut.isPending}
            signOutError={signOut.error}
          />
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
